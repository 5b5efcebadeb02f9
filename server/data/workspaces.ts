import "server-only";
import { eq, sql } from "drizzle-orm";
import { db } from "@/db/client";
import { workspaces } from "@/db/schema";
import { recordAudit } from "@/server/data/audit";
import { invalidateActorCache } from "@/server/authz/actor-cache";

export type WorkspaceDto = { id: string; name: string; slug: string; currency: string; locale: string };

const workspaceColumns = {
  id: workspaces.id,
  name: workspaces.name,
  slug: workspaces.slug,
  currency: workspaces.currency,
  locale: workspaces.locale,
};

export async function getWorkspaceById(id: string): Promise<WorkspaceDto | null> {
  const [row] = await db.select(workspaceColumns).from(workspaces).where(eq(workspaces.id, id));
  return row ?? null;
}

export async function getWorkspaceBySlug(slug: string): Promise<WorkspaceDto | null> {
  const [row] = await db.select(workspaceColumns).from(workspaces).where(eq(workspaces.slug, slug));
  return row ?? null;
}

/** Creates the workspace unless its slug exists (seed); an existing one is returned unchanged. */
export async function ensureWorkspace(input: Omit<WorkspaceDto, "id">): Promise<WorkspaceDto> {
  await db.insert(workspaces).values(input).onConflictDoNothing({ target: workspaces.slug });
  return (await getWorkspaceBySlug(input.slug))!;
}

export async function updateWorkspaceSettings(input: {
  workspaceId: string;
  actorUserId: string;
  name?: string;
  currency?: string;
  locale?: string;
}): Promise<WorkspaceDto> {
  const updated = await db.transaction(async (tx) => {
    const [before] = await tx.select(workspaceColumns).from(workspaces).where(eq(workspaces.id, input.workspaceId)).for("update");
    const changes = {
      ...(input.name !== undefined && { name: input.name }),
      ...(input.currency !== undefined && { currency: input.currency }),
      ...(input.locale !== undefined && { locale: input.locale }),
    };
    const [after] = await tx
      .update(workspaces)
      .set(Object.keys(changes).length ? changes : { name: sql`${workspaces.name}` })
      .where(eq(workspaces.id, input.workspaceId))
      .returning(workspaceColumns);
    await recordAudit(
      {
        workspaceId: input.workspaceId,
        actorUserId: input.actorUserId,
        action: "workspace.settings_changed",
        objectType: "workspace",
        objectId: input.workspaceId,
        details: { before: { name: before.name, currency: before.currency, locale: before.locale }, after: changes },
      },
      tx,
    );
    return after;
  });
  invalidateActorCache(); // actors carry the currency and locale
  return updated;
}
