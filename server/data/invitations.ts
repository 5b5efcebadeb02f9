import "server-only";
import { createHash, randomBytes } from "node:crypto";
import { and, desc, eq, gt, isNull, sql } from "drizzle-orm";
import { db } from "@/db/client";
import { invitations, memberships, users, workspaces, type Role } from "@/db/schema";
import { AppError } from "@/server/errors";
import { hashPassword } from "@/server/auth/password";
import { recordAudit } from "@/server/data/audit";
import { addMember } from "@/server/data/members";
import { normalizeEmail, type UserDto } from "@/server/data/users";
import { invalidateActorCache } from "@/server/authz/actor-cache";

export const INVITATION_DAYS = 7;

export type InvitationDto = {
  id: string;
  email: string;
  roles: Role[];
  createdAt: Date;
  expiresAt: Date;
  invitedByName: string | null;
};

/** What the invitation page shows to whoever holds the link. */
export type InvitationViewDto = {
  id: string;
  email: string;
  roles: Role[];
  workspaceName: string;
  expiresAt: Date;
  status: "pending" | "expired" | "accepted" | "revoked";
  /** An account with this e-mail exists: the invitee signs in instead of choosing a password. */
  accountExists: boolean;
};

const hashInvitationToken = (token: string) => createHash("sha256").update(token, "utf8").digest("hex");

/**
 * Creates an invitation and returns its one-time link token (only its hash is stored). A pending
 * invitation to the same address is replaced, so "invite again" resends with a fresh link.
 */
export async function createInvitation(input: {
  workspaceId: string;
  email: string;
  roles: Role[];
  invitedBy: string;
}): Promise<{ token: string; invitation: InvitationDto }> {
  const email = normalizeEmail(input.email);
  const token = randomBytes(32).toString("base64url");
  const invitation = await db.transaction(async (tx) => {
    const [member] = await tx
      .select({ userId: memberships.userId })
      .from(memberships)
      .innerJoin(users, eq(users.id, memberships.userId))
      .where(and(eq(memberships.workspaceId, input.workspaceId), eq(users.email, email)));
    if (member) {
      throw new AppError("conflict:member_exists", `${email} is already a member of this workspace; change their roles instead.`);
    }
    await tx
      .update(invitations)
      .set({ revokedAt: sql`now()` })
      .where(and(eq(invitations.workspaceId, input.workspaceId), eq(invitations.email, email), isNull(invitations.acceptedAt), isNull(invitations.revokedAt)));
    const [row] = await tx
      .insert(invitations)
      .values({
        workspaceId: input.workspaceId,
        email,
        roles: input.roles,
        tokenHash: hashInvitationToken(token),
        invitedBy: input.invitedBy,
        expiresAt: sql`now() + make_interval(days => ${INVITATION_DAYS})`,
      })
      .returning({ id: invitations.id, email: invitations.email, roles: invitations.roles, createdAt: invitations.createdAt, expiresAt: invitations.expiresAt });
    await recordAudit(
      {
        workspaceId: input.workspaceId,
        actorUserId: input.invitedBy,
        action: "member.invited",
        objectType: "invitation",
        objectId: row.id,
        details: { email, roles: input.roles },
      },
      tx,
    );
    return row;
  });
  const [inviter] = await db.select({ name: users.name }).from(users).where(eq(users.id, input.invitedBy));
  return { token, invitation: { ...invitation, invitedByName: inviter?.name ?? null } };
}

/** Invitations not yet accepted, revoked or expired. */
export async function listPendingInvitations(workspaceId: string): Promise<InvitationDto[]> {
  return db
    .select({
      id: invitations.id,
      email: invitations.email,
      roles: invitations.roles,
      createdAt: invitations.createdAt,
      expiresAt: invitations.expiresAt,
      invitedByName: users.name,
    })
    .from(invitations)
    .leftJoin(users, eq(users.id, invitations.invitedBy))
    .where(
      and(
        eq(invitations.workspaceId, workspaceId),
        isNull(invitations.acceptedAt),
        isNull(invitations.revokedAt),
        gt(invitations.expiresAt, sql`now()`),
      ),
    )
    .orderBy(desc(invitations.createdAt));
}

export async function revokeInvitation(input: { workspaceId: string; invitationId: string; actorUserId: string }): Promise<void> {
  await db.transaction(async (tx) => {
    const [row] = await tx
      .update(invitations)
      .set({ revokedAt: sql`now()` })
      .where(
        and(
          eq(invitations.id, input.invitationId),
          eq(invitations.workspaceId, input.workspaceId),
          isNull(invitations.acceptedAt),
          isNull(invitations.revokedAt),
        ),
      )
      .returning({ id: invitations.id, email: invitations.email });
    if (!row) throw new AppError("not_found:invitation", "No pending invitation with this id.");
    await recordAudit(
      {
        workspaceId: input.workspaceId,
        actorUserId: input.actorUserId,
        action: "invitation.revoked",
        objectType: "invitation",
        objectId: row.id,
        details: { email: row.email },
      },
      tx,
    );
  });
}

const viewColumns = {
  id: invitations.id,
  email: invitations.email,
  roles: invitations.roles,
  workspaceId: invitations.workspaceId,
  workspaceName: workspaces.name,
  expiresAt: invitations.expiresAt,
  acceptedAt: invitations.acceptedAt,
  revokedAt: invitations.revokedAt,
  expired: sql<boolean>`${invitations.expiresAt} <= now()`,
};

function statusOf(row: { acceptedAt: Date | null; revokedAt: Date | null; expired: boolean }): InvitationViewDto["status"] {
  if (row.acceptedAt) return "accepted";
  if (row.revokedAt) return "revoked";
  if (row.expired) return "expired";
  return "pending";
}

/** The invitation behind a link token, or null when the token matches none. */
export async function getInvitationByToken(token: string): Promise<InvitationViewDto | null> {
  if (!/^[A-Za-z0-9_-]{20,100}$/.test(token)) return null;
  const [row] = await db
    .select(viewColumns)
    .from(invitations)
    .innerJoin(workspaces, eq(workspaces.id, invitations.workspaceId))
    .where(eq(invitations.tokenHash, hashInvitationToken(token)));
  if (!row) return null;
  const [account] = await db.select({ id: users.id }).from(users).where(eq(users.email, row.email));
  return {
    id: row.id,
    email: row.email,
    roles: row.roles,
    workspaceName: row.workspaceName,
    expiresAt: row.expiresAt,
    status: statusOf(row),
    accountExists: Boolean(account),
  };
}

const notUsable: Record<Exclude<InvitationViewDto["status"], "pending">, string> = {
  accepted: "This invitation has already been used. Sign in instead.",
  revoked: "This invitation was withdrawn. Ask an admin of the workspace for a new one.",
  expired: `This invitation has expired (links are valid for ${INVITATION_DAYS} days). Ask an admin of the workspace for a new one.`,
};

/**
 * Accepts an invitation, once. A new person sets name and password (`newAccount`); someone who
 * already has an account must be signed in as the invited address (`signedInUserId`).
 * Returns the user and the workspace they joined.
 */
export async function acceptInvitation(input: {
  token: string;
  newAccount?: { name: string; password: string };
  signedInUserId?: string;
}): Promise<{ user: UserDto; workspaceId: string; roles: Role[] }> {
  if (!/^[A-Za-z0-9_-]{20,100}$/.test(input.token)) throw new AppError("not_found:invitation", "This invitation link is not valid.");
  // Hash outside the transaction: argon2 takes tens of milliseconds and the row lock should not wait on it.
  const passwordHash = input.newAccount ? await hashPassword(input.newAccount.password) : null;
  const result = await db.transaction(async (tx) => {
    const [row] = await tx
      .select(viewColumns)
      .from(invitations)
      .innerJoin(workspaces, eq(workspaces.id, invitations.workspaceId))
      .where(eq(invitations.tokenHash, hashInvitationToken(input.token)))
      .for("update", { of: invitations });
    if (!row) throw new AppError("not_found:invitation", "This invitation link is not valid.");
    const status = statusOf(row);
    if (status !== "pending") throw new AppError("conflict:invitation", notUsable[status]);

    const [existing] = await tx.select({ id: users.id, email: users.email, name: users.name }).from(users).where(eq(users.email, row.email));
    let user: UserDto;
    if (existing) {
      if (input.signedInUserId !== existing.id) {
        throw new AppError(
          "forbidden:invitation",
          `An account for ${row.email} already exists. Sign in as ${row.email}, then open the invitation link again.`,
        );
      }
      user = existing;
    } else {
      if (!input.newAccount || !passwordHash) {
        throw new AppError("invalid:invitation", "Choose your name and a password to join.");
      }
      [user] = await tx
        .insert(users)
        .values({ email: row.email, name: input.newAccount.name.trim(), passwordHash })
        .returning({ id: users.id, email: users.email, name: users.name });
    }
    const { roles } = await addMember({ workspaceId: row.workspaceId, userId: user.id, roles: row.roles }, tx);
    await tx.update(invitations).set({ acceptedAt: sql`now()`, acceptedBy: user.id }).where(eq(invitations.id, row.id));
    await recordAudit(
      {
        workspaceId: row.workspaceId,
        actorUserId: user.id,
        action: "member.joined",
        objectType: "user",
        objectId: user.id,
        details: { invitationId: row.id, roles },
      },
      tx,
    );
    return { user, workspaceId: row.workspaceId, roles };
  });
  invalidateActorCache();
  return result;
}
