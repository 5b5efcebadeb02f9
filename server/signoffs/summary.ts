import "server-only";
import { sql } from "drizzle-orm";
import { db } from "@/db/client";
import { latestSignoffsFor, signoffKey } from "./store";
import type { ScenarioSignoffState, ScenarioSignoffSummaryDto, SignoffDto } from "./types";

type Row = { scenario_id: string; latest_version: number | null; earlier_signed_off: number | null; shared: boolean };

/** The state of the latest version: its decision, else whether finance has it to look at. */
export function signoffState(input: { latestVersion: number | null; latestDecision: Pick<SignoffDto, "decision"> | null; shared: boolean }): ScenarioSignoffState {
  if (input.latestVersion === null) return "no_version";
  if (input.latestDecision) return input.latestDecision.decision;
  return input.shared ? "awaiting" : "not_shared";
}

/**
 * The sign-off summary of every scenario of a workspace (or of one of them), keyed by scenario id:
 * the latest version's decision (a sign-off belongs to one version, so a newer version starts
 * undecided), whether that version was shared with finance, and the newest earlier version that is
 * signed off. Callers have checked the workspace; `scenarioId` only narrows inside it.
 */
export async function listScenarioSignoffSummaries(workspaceId: string, scenarioId?: string): Promise<Map<string, ScenarioSignoffSummaryDto>> {
  const rows = [
    ...(await db.execute<Row>(sql`
      with latest as (
        select s.id as scenario_id, (select max(v.number) from scenario_versions v where v.scenario_id = s.id) as latest_version
        from scenarios s
        where s.workspace_id = ${workspaceId} ${scenarioId ? sql`and s.id = ${scenarioId}` : sql``}
      ),
      current_decisions as (
        select distinct on (so.scenario_id, so.version_number) so.scenario_id, so.version_number, so.decision
        from signoffs so join latest l on l.scenario_id = so.scenario_id
        order by so.scenario_id, so.version_number, so.decided_at desc, so.id desc
      )
      select l.scenario_id, l.latest_version,
        (select max(d.version_number) from current_decisions d
          where d.scenario_id = l.scenario_id and d.decision = 'signed_off' and d.version_number < l.latest_version) as earlier_signed_off,
        (exists (select 1 from shares sh where sh.scenario_id = l.scenario_id and sh.version_number = l.latest_version)
          or exists (select 1 from comparison_versions cv join shares sh on sh.comparison_id = cv.comparison_id
                     where cv.scenario_id = l.scenario_id and cv.version_number = l.latest_version)) as shared
      from latest l`)),
  ].map((row) => ({
    ...row,
    latest_version: row.latest_version === null ? null : Number(row.latest_version),
    earlier_signed_off: row.earlier_signed_off === null ? null : Number(row.earlier_signed_off),
  }));
  const refs = rows.flatMap((row) => [
    ...(row.latest_version === null ? [] : [{ scenarioId: row.scenario_id, version: row.latest_version }]),
    ...(row.earlier_signed_off === null ? [] : [{ scenarioId: row.scenario_id, version: row.earlier_signed_off }]),
  ]);
  const decisions = await latestSignoffsFor(refs);
  const result = new Map<string, ScenarioSignoffSummaryDto>();
  for (const row of rows) {
    const latestDecision = row.latest_version === null ? null : (decisions.get(signoffKey(row.scenario_id, row.latest_version)) ?? null);
    const state = signoffState({ latestVersion: row.latest_version, latestDecision, shared: row.shared });
    const earlier = row.earlier_signed_off === null ? null : (decisions.get(signoffKey(row.scenario_id, row.earlier_signed_off)) ?? null);
    result.set(row.scenario_id, {
      scenarioId: row.scenario_id,
      latestVersion: row.latest_version,
      state,
      latestDecision,
      earlierSignedOff: state === "signed_off" ? null : earlier,
    });
  }
  return result;
}

/** One scenario's summary (the scenario header); null when it is not in the workspace. */
export async function getScenarioSignoffSummary(workspaceId: string, scenarioId: string): Promise<ScenarioSignoffSummaryDto | null> {
  return (await listScenarioSignoffSummaries(workspaceId, scenarioId)).get(scenarioId) ?? null;
}
