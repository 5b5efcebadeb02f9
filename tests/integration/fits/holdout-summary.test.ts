// The held-out check's summary as the scenario room reads it: straight out of the stored report
// (equal to what the fit's report says), scoped to the workspace, and absent for older reports.
import { describe, expect, it } from "vitest";
import { POST as createFit } from "@/app/api/fits/route";
import { getDatabase } from "@/db/client";
import { getFitHoldoutSummary } from "@/server/fits/store";
import { apiRequest, demoRequest, makeTeam, routeContext, uploadDemoDataset } from "./helpers";

describe("getFitHoldoutSummary", () => {
  it("reads the stored check, only in the fit's own workspace, and nothing for a report without one", async () => {
    const { workspace, members, tokens } = await makeTeam({ analyst: ["analyst"] });
    const other = await makeTeam({ analyst: ["analyst"] });
    const datasetId = await uploadDemoDataset(workspace.id, members.analyst.id);
    const response = await createFit(apiRequest("/api/fits", { method: "POST", token: tokens.analyst, json: demoRequest(datasetId) }), routeContext());
    expect(response.status).toBe(201);
    const fit = await response.json();
    expect(fit.holdout.status).toBe("done");

    expect(await getFitHoldoutSummary({ workspaceId: workspace.id, id: fit.id })).toEqual({
      inside: fit.holdout.inside,
      periods: 13,
      level: 0.95,
      fewerInsideThanExpected: fit.holdout.fewerInsideThanExpected,
    });
    expect(await getFitHoldoutSummary({ workspaceId: other.workspace.id, id: fit.id })).toBeNull();

    const { sql } = getDatabase();
    await sql`update fits set report = jsonb_set(report, '{holdout,fewerInsideThanExpected}', 'true') where id = ${fit.id}`;
    expect((await getFitHoldoutSummary({ workspaceId: workspace.id, id: fit.id }))?.fewerInsideThanExpected).toBe(true);
    await sql`update fits set report = report - 'holdout' where id = ${fit.id}`;
    expect(await getFitHoldoutSummary({ workspaceId: workspace.id, id: fit.id })).toBeNull();
  });
});
