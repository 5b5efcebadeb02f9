import { and, eq } from "drizzle-orm";
import type { Database } from "@/db/client";
import { memberships, users, workspaces } from "@/db/schema";
import { hashPassword } from "@/server/auth/password";
import { recordAudit } from "@/server/data/audit";
import { demoAccounts, demoWorkspaces } from "./demo-accounts";

type Db = Database["db"];

/**
 * Creates the demo workspaces, people and memberships that are missing. Idempotent: existing rows
 * (a changed password, changed roles) are left as they are, nothing is duplicated or deleted.
 * Returns the workspace ids by slug for later seed steps.
 */
export async function seedUsers(db: Db): Promise<Record<string, string>> {
  const workspaceIds: Record<string, string> = {};
  const created: string[] = [];
  for (const workspace of demoWorkspaces) {
    const inserted = await db.insert(workspaces).values(workspace).onConflictDoNothing({ target: workspaces.slug }).returning({ id: workspaces.id });
    if (inserted.length) created.push(workspace.slug);
    const [row] = await db.select({ id: workspaces.id }).from(workspaces).where(eq(workspaces.slug, workspace.slug));
    workspaceIds[workspace.slug] = row.id;
  }

  let newPeople = 0;
  let newMemberships = 0;
  for (const account of demoAccounts) {
    let [user] = await db.select({ id: users.id }).from(users).where(eq(users.email, account.email));
    if (!user) {
      await db
        .insert(users)
        .values({ email: account.email, name: account.name, passwordHash: await hashPassword(account.password) })
        .onConflictDoNothing({ target: users.email });
      [user] = await db.select({ id: users.id }).from(users).where(eq(users.email, account.email));
      newPeople++;
    }
    const workspaceId = workspaceIds[account.workspace];
    const [existing] = await db
      .select({ id: memberships.id })
      .from(memberships)
      .where(and(eq(memberships.workspaceId, workspaceId), eq(memberships.userId, user.id)));
    if (!existing) {
      await db.insert(memberships).values({ workspaceId, userId: user.id, roles: [...account.roles] }).onConflictDoNothing();
      newMemberships++;
    }
  }

  for (const slug of created) {
    const owner = demoAccounts.find((account) => account.workspace === slug && (account.roles as readonly string[]).includes("admin"));
    const [ownerRow] = owner ? await db.select({ id: users.id }).from(users).where(eq(users.email, owner.email)) : [];
    await recordAudit(
      { workspaceId: workspaceIds[slug], actorUserId: ownerRow?.id ?? null, action: "workspace.created", objectType: "workspace", objectId: workspaceIds[slug] },
      db,
    );
  }
  console.log(`users: ${created.length} new workspaces, ${newPeople} new people, ${newMemberships} new memberships`);
  return workspaceIds;
}
