import "server-only";
import { and, desc, eq, inArray, or, sql } from "drizzle-orm";
import { db } from "@/db/client";
import { signoffs, users } from "@/db/schema";
import type { SignoffDecision } from "@/db/schema/reviews";
import type { Actor } from "@/server/authz";
import { recordAudit } from "@/server/data/audit";
import { AppError } from "@/server/errors";
import { getScenarioOwnerId, requireVersion, versionReviewPath, versionTitle } from "@/server/comparisons/versions";
import { createNotifications, type NewNotification } from "@/server/notifications/store";
import { getCachedFit } from "@/server/predict/fit-cache";
import type { SignoffDto, VersionSignoffStatusDto } from "./types";

const columns = {
  id: signoffs.id,
  scenarioId: signoffs.scenarioId,
  version: signoffs.versionNumber,
  decision: signoffs.decision,
  reason: signoffs.reason,
  decidedById: signoffs.decidedBy,
  decidedByName: users.name,
  decidedAt: signoffs.decidedAt,
};

type Row = { [K in keyof typeof columns]: unknown } & { decidedAt: Date; decision: SignoffDecision };

const toDto = (row: Row): SignoffDto => ({ ...(row as Omit<SignoffDto, "decidedAt">), decidedAt: row.decidedAt.toISOString() });

const versionKey = (scenarioId: string, version: number) => `${scenarioId}#${version}`;

/**
 * Records a finance decision on exactly one version: `signed_off`, or `declined` with a reason
 * (422 without one). Signing off needs the version's fit still approved (409 when it was retired);
 * declining is always possible. The decision, its audit entry and the notifications of the scenario's
 * owner and the version's author commit together. A later version starts with no decision.
 */
export async function decideSignoff(
  actor: Actor,
  input: { scenarioId: string; version: number; decision: SignoffDecision; reason?: string | null },
): Promise<SignoffDto> {
  const { head, version } = await requireVersion(actor, input.scenarioId, input.version);
  const reason = (input.reason ?? "").trim();
  if (input.decision === "declined" && reason === "") {
    throw new AppError("invalid:signoff", `Say why you decline version ${input.version}.`, { details: [{ path: "reason", message: "A decline needs a reason." }] });
  }
  if (input.decision === "signed_off") {
    const fit = await getCachedFit(head.fitId, { fresh: true });
    if (!fit || fit.status !== "approved") {
      throw new AppError(
        "conflict:fit_not_approved",
        `The fit “${fit?.name ?? "?"}” is ${fit?.status.replace("_", " ") ?? "gone"}: its predictions no longer stand, so this version cannot be signed off. Decline it instead, with a reason.`,
        { details: [{ path: "decision", message: `fit status is ${fit?.status ?? "missing"}` }] },
      );
    }
  }
  const ownerId = await getScenarioOwnerId(head.id);
  const id = await db.transaction(async (tx) => {
    const [row] = await tx
      .insert(signoffs)
      .values({
        workspaceId: actor.workspaceId,
        scenarioId: head.id,
        versionNumber: version.number,
        decision: input.decision,
        reason,
        decidedBy: actor.userId,
      })
      .returning({ id: signoffs.id });
    await recordAudit(
      {
        workspaceId: actor.workspaceId,
        actorUserId: actor.userId,
        action: input.decision === "signed_off" ? "signoff.signed_off" : "signoff.declined",
        objectType: "scenario",
        objectId: head.id,
        details: { version: version.number, name: head.name, reason: reason || null, signoffId: row.id },
      },
      tx,
    );
    const who = actor.name ?? actor.email;
    const title =
      input.decision === "signed_off"
        ? `${who} signed off ${versionTitle(head.name, version.number)}.`
        : `${who} declined ${versionTitle(head.name, version.number)}: ${reason}`;
    const recipients = new Set([ownerId, version.authorId].filter((user): user is string => !!user && user !== actor.userId));
    const items: NewNotification[] = [...recipients].map((userId) => ({
      workspaceId: actor.workspaceId,
      userId,
      kind: input.decision === "signed_off" ? "signoff" : "decline",
      title,
      link: versionReviewPath(head.id, version.number),
      actorId: actor.userId,
    }));
    await createNotifications(items, tx);
    return row.id;
  });
  const [saved] = await db.select(columns).from(signoffs).leftJoin(users, eq(users.id, signoffs.decidedBy)).where(eq(signoffs.id, id));
  return toDto(saved as Row);
}

/** Every decision on one version, newest first; `current` is the newest (null: not signed off). */
export async function getVersionSignoffStatus(scenarioId: string, version: number): Promise<VersionSignoffStatusDto> {
  const rows = await db
    .select(columns)
    .from(signoffs)
    .leftJoin(users, eq(users.id, signoffs.decidedBy))
    .where(and(eq(signoffs.scenarioId, scenarioId), eq(signoffs.versionNumber, version)))
    .orderBy(desc(signoffs.decidedAt), desc(signoffs.id));
  const history = rows.map((row) => toDto(row as Row));
  return { scenarioId, version, current: history[0] ?? null, history };
}

/** Every decision on a scenario's versions, newest first. */
export async function listSignoffsByScenario(scenarioId: string): Promise<SignoffDto[]> {
  const rows = await db
    .select(columns)
    .from(signoffs)
    .leftJoin(users, eq(users.id, signoffs.decidedBy))
    .where(eq(signoffs.scenarioId, scenarioId))
    .orderBy(desc(signoffs.decidedAt), desc(signoffs.id));
  return rows.map((row) => toDto(row as Row));
}

/** The latest decision of each given version (absent: not signed off), keyed `scenarioId#number`. */
export async function latestSignoffsFor(refs: { scenarioId: string; version: number }[]): Promise<Map<string, SignoffDto>> {
  const result = new Map<string, SignoffDto>();
  if (refs.length === 0) return result;
  const rows = await db
    .select(columns)
    .from(signoffs)
    .leftJoin(users, eq(users.id, signoffs.decidedBy))
    .where(
      or(...refs.map((ref) => and(eq(signoffs.scenarioId, ref.scenarioId), eq(signoffs.versionNumber, ref.version)))),
    )
    .orderBy(desc(signoffs.decidedAt), desc(signoffs.id));
  for (const row of rows) {
    const key = versionKey(row.scenarioId, row.version);
    if (!result.has(key)) result.set(key, toDto(row as Row));
  }
  return result;
}

export const signoffKey = versionKey;

export type ScenarioSignoffOverview = {
  scenarioId: string;
  scenarioName: string;
  ownerName: string | null;
  latestVersion: number | null;
  /** The latest version's decision (null: not signed off). */
  latestDecision: SignoffDto | null;
  /** The newest version that is currently signed off, if any (may be older than the latest). */
  signedOffVersion: number | null;
};

/** Sign-off status of every scenario of a workspace (the lists on /compare). */
export async function listScenarioSignoffOverview(workspaceId: string): Promise<ScenarioSignoffOverview[]> {
  const rows = await db.execute<{
    scenario_id: string;
    scenario_name: string;
    owner_name: string | null;
    latest_version: number | null;
    signed_off_version: number | null;
  }>(sql`
    select s.id as scenario_id, s.name as scenario_name, u.name as owner_name,
           (select max(v.number) from scenario_versions v where v.scenario_id = s.id) as latest_version,
           (select max(d.version_number) from (
              select distinct on (so.version_number) so.version_number, so.decision
              from signoffs so where so.scenario_id = s.id
              order by so.version_number, so.decided_at desc, so.id desc) d
            where d.decision = 'signed_off') as signed_off_version
    from scenarios s left join "user" u on u.id = s.owner_id
    where s.workspace_id = ${workspaceId}
    order by s.created_at desc
    limit 500`);
  const list = [...rows];
  const latest = await latestSignoffsFor(
    list.filter((row) => row.latest_version !== null).map((row) => ({ scenarioId: row.scenario_id, version: Number(row.latest_version) })),
  );
  return list.map((row) => ({
    scenarioId: row.scenario_id,
    scenarioName: row.scenario_name,
    ownerName: row.owner_name,
    latestVersion: row.latest_version === null ? null : Number(row.latest_version),
    latestDecision: row.latest_version === null ? null : (latest.get(versionKey(row.scenario_id, Number(row.latest_version))) ?? null),
    signedOffVersion: row.signed_off_version === null ? null : Number(row.signed_off_version),
  }));
}

/** Decisions on the given scenarios (for lists), newest first. */
export async function listSignoffsByScenarios(scenarioIds: string[]): Promise<SignoffDto[]> {
  if (scenarioIds.length === 0) return [];
  const rows = await db
    .select(columns)
    .from(signoffs)
    .leftJoin(users, eq(users.id, signoffs.decidedBy))
    .where(inArray(signoffs.scenarioId, scenarioIds))
    .orderBy(desc(signoffs.decidedAt), desc(signoffs.id));
  return rows.map((row) => toDto(row as Row));
}
