import "server-only";
import { eq } from "drizzle-orm";
import { db } from "@/db/client";
import { scenarios } from "@/db/schema";
import type { Actor } from "@/server/authz/actor";
import { assertInWorkspace } from "@/server/authz/scope";
import { AppError } from "@/server/errors";
import { getScenarioHead, getScenarioVersion } from "@/server/scenarios/store";
import type { VersionDto } from "@/server/scenarios/types";

export type ScenarioHead = NonNullable<Awaited<ReturnType<typeof getScenarioHead>>>;

/**
 * A scenario version of the actor's workspace: 404 when the scenario is missing or another
 * workspace's, 404 when it has no such version (as GET /api/scenarios/{id}/versions/{n}).
 */
export async function requireVersion(actor: Pick<Actor, "workspaceId">, scenarioId: string, number: number): Promise<{ head: ScenarioHead; version: VersionDto }> {
  const head = await getScenarioHead(scenarioId);
  assertInWorkspace(actor, head, "scenario");
  const version = await getScenarioVersion(scenarioId, number);
  if (!version) throw new AppError("not_found:version", `This scenario has no version ${number}.`);
  return { head, version };
}

/** Where a version is reviewed: the scenario page's review section, opened on that version. */
export const versionReviewPath = (scenarioId: string, number: number) => `/scenarios/${scenarioId}?version=${number}#review`;

export const comparisonPath = (comparisonId: string) => `/compare/${comparisonId}`;

/** "“Q3 plan” version 2" */
export const versionTitle = (scenarioName: string, number: number) => `“${scenarioName}” version ${number}`;

/** The scenario's owner (who started it), for notifications. */
export async function getScenarioOwnerId(scenarioId: string): Promise<string | null> {
  const [row] = await db.select({ ownerId: scenarios.ownerId }).from(scenarios).where(eq(scenarios.id, scenarioId));
  return row?.ownerId ?? null;
}
