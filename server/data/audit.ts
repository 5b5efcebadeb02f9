import "server-only";
import { and, desc, eq, notInArray, sql } from "drizzle-orm";
import { alias } from "drizzle-orm/pg-core";
import { db, type Database } from "@/db/client";
import { auditLog, users } from "@/db/schema";

/** The pool or an open transaction: data functions that must join a caller's transaction take one. */
export type DbExecutor = Database["db"] | Parameters<Parameters<Database["db"]["transaction"]>[0]>[0];

export type AuditEntry = {
  workspaceId: string | null;
  actorUserId: string | null;
  /** A dotted verb: "member.invited", "member.roles_changed", "fit.approved", "scenario.version_saved". */
  action: string;
  objectType: string;
  objectId?: string | null;
  /** Small, non-secret facts worth keeping (old and new roles, a comment); never tokens or passwords. */
  details?: Record<string, unknown>;
};

export type AuditEventDto = {
  id: number;
  at: Date;
  action: string;
  objectType: string;
  objectId: string | null;
  actorName: string | null;
  actorEmail: string | null;
  /** For entries about a person (objectType "user"): their name or e-mail, read now rather than stored. */
  subjectName: string | null;
  details: Record<string, unknown>;
};

const subject = alias(users, "subject");

/** Appends one entry; pass the transaction so the entry commits (or not) with the change it records. */
export async function recordAudit(entry: AuditEntry, tx: DbExecutor = db): Promise<void> {
  await tx.insert(auditLog).values({
    workspaceId: entry.workspaceId,
    actorUserId: entry.actorUserId,
    action: entry.action,
    objectType: entry.objectType,
    objectId: entry.objectId ?? null,
    details: entry.details ?? {},
  });
}

/** Newest first; `excludeObjectTypes` leaves out personal entries (e.g. "api_token") from shared views. */
export async function listAuditEventsByWorkspaceId(input: {
  workspaceId: string;
  limit?: number;
  excludeObjectTypes?: string[];
}): Promise<AuditEventDto[]> {
  return db
    .select({
      id: auditLog.id,
      at: auditLog.at,
      action: auditLog.action,
      objectType: auditLog.objectType,
      objectId: auditLog.objectId,
      actorName: users.name,
      actorEmail: users.email,
      subjectName: sql<string | null>`coalesce(${subject.name}, ${subject.email})`,
      details: auditLog.details,
    })
    .from(auditLog)
    .leftJoin(users, eq(users.id, auditLog.actorUserId))
    .leftJoin(subject, and(eq(auditLog.objectType, "user"), sql`${subject.id}::text = ${auditLog.objectId}`))
    .where(
      input.excludeObjectTypes?.length
        ? and(eq(auditLog.workspaceId, input.workspaceId), notInArray(auditLog.objectType, input.excludeObjectTypes))
        : eq(auditLog.workspaceId, input.workspaceId),
    )
    .orderBy(desc(auditLog.at), desc(auditLog.id))
    .limit(Math.min(input.limit ?? 20, 200));
}
