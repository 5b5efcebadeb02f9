import "server-only";
import { and, asc, eq } from "drizzle-orm";
import { db } from "@/db/client";
import { memberships, users, workspaces, type Role } from "@/db/schema";
import { AppError } from "@/server/errors";
import { recordAudit, type DbExecutor } from "@/server/data/audit";
import { invalidateActorCache } from "@/server/authz/actor-cache";

export type MemberDto = { userId: string; name: string | null; email: string; roles: Role[]; joinedAt: Date };

/** One workspace a user belongs to, with what the authorization helper needs. */
export type UserMembershipDto = {
  workspaceId: string;
  workspaceSlug: string;
  workspaceName: string;
  currency: string;
  locale: string;
  roles: Role[];
  userEmail: string;
  userName: string | null;
};

/** Every workspace of a user, oldest membership first (the default workspace). */
export async function listMembershipsByUserId(userId: string): Promise<UserMembershipDto[]> {
  return db
    .select({
      workspaceId: workspaces.id,
      workspaceSlug: workspaces.slug,
      workspaceName: workspaces.name,
      currency: workspaces.currency,
      locale: workspaces.locale,
      roles: memberships.roles,
      userEmail: users.email,
      userName: users.name,
    })
    .from(memberships)
    .innerJoin(workspaces, eq(workspaces.id, memberships.workspaceId))
    .innerJoin(users, eq(users.id, memberships.userId))
    .where(eq(memberships.userId, userId))
    .orderBy(asc(memberships.createdAt), asc(workspaces.slug));
}

export async function listMembersByWorkspaceId(workspaceId: string): Promise<MemberDto[]> {
  return db
    .select({ userId: users.id, name: users.name, email: users.email, roles: memberships.roles, joinedAt: memberships.createdAt })
    .from(memberships)
    .innerJoin(users, eq(users.id, memberships.userId))
    .where(eq(memberships.workspaceId, workspaceId))
    .orderBy(asc(users.name), asc(users.email));
}

/** Adds a member, or widens an existing member's roles to include `roles` (invitations, seed). */
export async function addMember(
  input: { workspaceId: string; userId: string; roles: Role[] },
  tx: DbExecutor = db,
): Promise<{ roles: Role[]; created: boolean }> {
  const [existing] = await tx
    .select({ roles: memberships.roles })
    .from(memberships)
    .where(and(eq(memberships.workspaceId, input.workspaceId), eq(memberships.userId, input.userId)))
    .for("update");
  if (existing) {
    const merged = sortRoles([...new Set([...existing.roles, ...input.roles])]);
    if (merged.length !== existing.roles.length) {
      await tx
        .update(memberships)
        .set({ roles: merged })
        .where(and(eq(memberships.workspaceId, input.workspaceId), eq(memberships.userId, input.userId)));
    }
    invalidateActorCache();
    return { roles: merged, created: false };
  }
  const roles = sortRoles(input.roles);
  await tx.insert(memberships).values({ workspaceId: input.workspaceId, userId: input.userId, roles });
  invalidateActorCache();
  return { roles, created: true };
}

const roleOrder: Role[] = ["admin", "analyst", "reviewer", "planner", "finance"];
const sortRoles = (roles: Role[]) => roleOrder.filter((role) => roles.includes(role));

/**
 * Locks every membership of the workspace, so two admins demoting or removing each other at the same
 * moment are serialised and the last-admin rule cannot be raced.
 */
async function lockMemberships(tx: DbExecutor, workspaceId: string) {
  return tx
    .select({ userId: memberships.userId, roles: memberships.roles })
    .from(memberships)
    .where(eq(memberships.workspaceId, workspaceId))
    .for("update");
}

function assertAdminRemains(all: { userId: string; roles: Role[] }[], change: { userId: string; roles: Role[] | null }) {
  const adminsAfter = all.filter((member) =>
    member.userId === change.userId ? (change.roles ?? []).includes("admin") : member.roles.includes("admin"),
  );
  if (adminsAfter.length === 0) {
    throw new AppError(
      "conflict:last_admin",
      change.roles === null
        ? "This is the workspace's last admin and cannot be removed; make another member admin first."
        : "This is the workspace's last admin and must keep the admin role; make another member admin first.",
    );
  }
}

export async function changeMemberRoles(input: {
  workspaceId: string;
  userId: string;
  roles: Role[];
  actorUserId: string;
}): Promise<MemberDto> {
  if (input.roles.length === 0) {
    throw new AppError("invalid:roles", "A member needs at least one role; remove the member instead.", {
      details: [{ path: "roles", message: "Choose at least one role." }],
    });
  }
  const roles = sortRoles(input.roles);
  await db.transaction(async (tx) => {
    const all = await lockMemberships(tx, input.workspaceId);
    const target = all.find((member) => member.userId === input.userId);
    if (!target) throw new AppError("not_found:member", "This person is not a member of the workspace.");
    assertAdminRemains(all, { userId: input.userId, roles });
    await tx
      .update(memberships)
      .set({ roles })
      .where(and(eq(memberships.workspaceId, input.workspaceId), eq(memberships.userId, input.userId)));
    await recordAudit(
      {
        workspaceId: input.workspaceId,
        actorUserId: input.actorUserId,
        action: "member.roles_changed",
        objectType: "user",
        objectId: input.userId,
        details: { before: target.roles, after: roles },
      },
      tx,
    );
  });
  invalidateActorCache();
  const members = await listMembersByWorkspaceId(input.workspaceId);
  return members.find((member) => member.userId === input.userId)!;
}

/** Removes a member (their API tokens for this workspace go with the membership). */
export async function removeMember(input: { workspaceId: string; userId: string; actorUserId: string }): Promise<void> {
  await db.transaction(async (tx) => {
    const all = await lockMemberships(tx, input.workspaceId);
    const target = all.find((member) => member.userId === input.userId);
    if (!target) throw new AppError("not_found:member", "This person is not a member of the workspace.");
    assertAdminRemains(all, { userId: input.userId, roles: null });
    await tx.delete(memberships).where(and(eq(memberships.workspaceId, input.workspaceId), eq(memberships.userId, input.userId)));
    await recordAudit(
      {
        workspaceId: input.workspaceId,
        actorUserId: input.actorUserId,
        action: "member.removed",
        objectType: "user",
        objectId: input.userId,
        details: { roles: target.roles },
      },
      tx,
    );
  });
  invalidateActorCache();
}
