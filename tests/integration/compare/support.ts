// Fixtures for the side-by-side tests: a planning workspace (one member per role, tokens, an
// approved demo fit) and scenarios with saved versions, all made through the route handlers.
import { POST as startScenario } from "@/app/api/scenarios/route";
import { POST as saveVersion } from "@/app/api/scenarios/[id]/versions/route";
import type { Role } from "@/db/schema";
import { amountToCents } from "@/server/planning/allocation";
import { apiRequest, makePlanningWorkspace, routeContext } from "../scenarios/support/workspace";

export { apiRequest, routeContext };

// Route-handler responses are plain JSON; tests read them loosely.
export type Json = Record<string, any>;

type Handler = (request: Request, context: ReturnType<typeof routeContext>) => Promise<Response>;

export type Workspace = Awaited<ReturnType<typeof makePlanningWorkspace>>;

/** A workspace with analyst, reviewer, planner, finance, and a second finance member. */
export function makeReviewWorkspace(people: Record<string, Role[]> = {}) {
  return makePlanningWorkspace({ finance2: ["finance"], ...people });
}

/** Calls a route handler like the app would, with the member's token. */
export async function call(
  handler: Handler,
  path: string,
  params: Record<string, string>,
  init: { method?: string; json?: unknown; token: string },
): Promise<{ status: number; body: Json; response: Response }> {
  const response = await handler(apiRequest(path, { method: init.method ?? "GET", json: init.json, token: init.token }), routeContext(params));
  const type = response.headers.get("content-type") ?? "";
  const body = type.includes("json") ? ((await response.clone().json()) as Json) : {};
  return { status: response.status, body, response };
}

/** A fixed-total plan moving `amount` from display to search relative to the scenario's starting plan. */
export function movedPlan(baseline: Json, amount: number, extra: Json = {}) {
  const allocation = { ...baseline.allocation, search_eur: baseline.allocation.search_eur + amount, display_eur: baseline.allocation.display_eur - amount };
  const total = Object.values(allocation as Record<string, number>).reduce((sum, value) => sum + amountToCents(value), 0) / 100;
  return { mode: "fixed", allocation, total, horizon: baseline.horizon, controls: baseline.controls, ...extra };
}

/**
 * Starts a scenario on the workspace's fit (or `fitId`) and saves one version per plan change
 * (`amounts[i]` moved from display to search; `extra[i]` overrides fields of that version's plan).
 */
export async function scenarioWithVersions(
  setup: Workspace,
  name: string,
  amounts: number[],
  options: { fitId?: string; extra?: (Json | undefined)[] } = {},
): Promise<{ id: string; baseline: Json; versions: Json[] }> {
  const token = setup.members.planner.token;
  const started = await call(startScenario, "/api/scenarios", {}, { method: "POST", json: { fitId: options.fitId ?? setup.fit.fitId, name }, token });
  if (started.status !== 201) throw new Error(`start: ${started.status} ${JSON.stringify(started.body)}`);
  const id = started.body.id as string;
  const versions: Json[] = [];
  for (const [index, amount] of amounts.entries()) {
    const saved = await call(saveVersion, `/api/scenarios/${id}/versions`, { id }, {
      method: "POST",
      json: { baseVersion: index, note: `version ${index + 1}`, ...movedPlan(started.body.baseline, amount, options.extra?.[index]) },
      token,
    });
    if (saved.status !== 201) throw new Error(`save: ${saved.status} ${JSON.stringify(saved.body)}`);
    versions.push(saved.body);
  }
  return { id, baseline: started.body.baseline, versions };
}

/** Saves one more version of a scenario (next number). */
export async function saveNextVersion(setup: Workspace, scenario: { id: string; baseline: Json; versions: Json[] }, amount: number) {
  const id = scenario.id;
  const saved = await call(saveVersion, `/api/scenarios/${id}/versions`, { id }, {
    method: "POST",
    json: { baseVersion: scenario.versions.length, ...movedPlan(scenario.baseline, amount) },
    token: setup.members.planner.token,
  });
  if (saved.status !== 201) throw new Error(`save: ${saved.status} ${JSON.stringify(saved.body)}`);
  scenario.versions.push(saved.body);
  return saved.body;
}
