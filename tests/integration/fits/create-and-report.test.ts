// POST /api/fits end to end on the demo history: the report's numbers are the engine's, the engine's
// refusals come back as 422 with what to fix, and datasets of other workspaces do not exist.
import { describe, expect, it } from "vitest";
import { GET as getFit } from "@/app/api/fits/[id]/route";
import { GET as listFits, POST as createFit } from "@/app/api/fits/route";
import { generateDemoHistory } from "@/seed/history";
import { computeFit } from "@/server/fits/compute";
import { buildDesign, createFitRecord, fitLeastSquares } from "@/server/stats";
import { apiRequest, demoColumns, demoRequest, makeTeam, routeContext, uploadDataset, uploadDemoDataset } from "./helpers";

const post = (token: string, json: unknown) => createFit(apiRequest("/api/fits", { method: "POST", token, json }), routeContext());

describe("POST /api/fits", () => {
  it("fits the demo history and returns the whole report, equal to the engine's numbers", async () => {
    const { workspace, members, tokens } = await makeTeam({ analyst: ["analyst"] });
    const datasetId = await uploadDemoDataset(workspace.id, members.analyst.id);
    const response = await post(tokens.analyst, demoRequest(datasetId, { level: 0.9 }));
    expect(response.status).toBe(201);
    expect(response.headers.get("location")).toMatch(/^\/api\/fits\/[0-9a-f-]{36}$/);
    const body = await response.json();
    expect(body).toMatchObject({ status: "draft", datasetId, outcome: "sales_eur", n: 156, level: 0.9, authorId: members.analyst.id });

    const engine = fitLeastSquares(
      buildDesign(
        {
          outcome: "sales_eur",
          intercept: true,
          terms: [
            ...["search_eur", "social_eur", "video_eur", "display_eur", "podcast_eur", "email_eur"].map((column) => ({ kind: "linear" as const, column })),
            { kind: "control" as const, column: "promo_week" },
          ],
        },
        demoColumns(),
      ),
      { confidenceLevel: 0.9 },
    );
    // The same computation on the same numbers: equal to the last bit, not merely close.
    expect(body.coefficients.map((c: { term: string }) => c.term)).toEqual(engine.termNames);
    body.coefficients.forEach((row: Record<string, number>, index: number) => {
      const expected = engine.coefficients[index];
      expect(row.estimate).toBe(expected.estimate);
      expect(row.stdError).toBe(expected.standardError);
      expect(row.tStatistic).toBe(expected.tStatistic);
      expect(row.pValue).toBe(expected.pValue);
      expect(row.ciLow).toBe(expected.lowerBound);
      expect(row.ciHigh).toBe(expected.upperBound);
    });
    expect(body.rSquared).toBe(engine.rSquared);
    expect(body.adjRSquared).toBe(engine.adjustedRSquared);
    expect(body.sigma).toBe(engine.residualStandardError);
    expect(body.dfResidual).toBe(engine.residualDegreesOfFreedom);
    expect(body.fStatistic).toBe(engine.fStatistic);
    expect(body.fPValue).toBe(engine.fPValue);
    expect(body.durbinWatson).toBe(engine.durbinWatson);
    const { heteroskedasticity, normality } = engine.residualTests;
    expect(body.residualTests).toEqual({
      heteroskedasticity: { statistic: heteroskedasticity!.statistic, df: 7, pValue: heteroskedasticity!.pValue },
      normality: { statistic: normality!.statistic, pValue: normality!.pValue, skewness: normality!.skewness, kurtosis: normality!.kurtosis },
    });
    expect(body.aic).toBe(engine.akaikeInformationCriterion);
    expect(body.periodCoverage).toEqual({ step: 7, unit: "days", gaps: [], missing: 0 });
    // The held-out check: the latest 13 weeks, by date, predicted by a refit on the 143 before them.
    expect(body.holdout).toMatchObject({ status: "done", periods: 13, trainedOn: 143, level: 0.9 });
    expect(body.holdout.rows.map((row: { label: string }) => row.label)).toEqual(generateDemoHistory().slice(143).map((week) => week.week_start));
    expect(body.holdout.rows.map((row: { actual: number }) => row.actual)).toEqual(Array.from(demoColumns().sales_eur.slice(143)));
    expect(body.conditionNumber).toBe(engine.conditionNumber);
    expect(body.recordChecksum).toBe(createFitRecord(engine).checksum);
    expect(body.rSquaredUncentred).toBe(false);

    // VIFs: intercept none; video and display collinear by construction of the demo data.
    const vif = Object.fromEntries(body.coefficients.map((c: { term: string; vif: number | null }) => [c.term, c.vif]));
    expect(vif["(Intercept)"]).toBeNull();
    expect(vif.video_eur).toBeGreaterThan(10);
    expect(vif.display_eur).toBeGreaterThan(10);
    expect(vif.search_eur).toBeLessThan(5);
    engine.collinearity.terms.forEach((term, index) => expect(vif[term]).toBe(engine.collinearity.varianceInflationFactors[index]));

    // Plot data: every row (n is small), periods as labels, Q–Q sorted.
    expect(body.diagnostics.sampled).toBe(false);
    expect(body.diagnostics.points.row).toHaveLength(156);
    expect(body.diagnostics.series.label[0]).toBe("2023-01-02");
    expect(body.units).toMatchObject({ sales_eur: "EUR", video_eur: "EUR", promo_week: "weeks" });
    const sample = body.diagnostics.qq.sample as number[];
    expect([...sample].sort((a, b) => a - b)).toEqual(sample);

    // GET returns the same report with the trail; the list shows it as a draft.
    const fetched = await getFit(apiRequest(`/api/fits/${body.id}`, { token: tokens.analyst }), routeContext({ id: body.id }));
    expect(fetched.status).toBe(200);
    const again = await fetched.json();
    expect(again.coefficients).toEqual(body.coefficients);
    expect(again.trail.map((e: { action: string }) => e.action)).toEqual(["fit.created"]);
    const list = await (await listFits(apiRequest("/api/fits?status=draft", { token: tokens.analyst }), routeContext())).json();
    expect(list.fits.map((f: { id: string }) => f.id)).toEqual([body.id]);
  });

  it("accepts transforms, interactions, no intercept and robust covariances", async () => {
    const { workspace, members, tokens } = await makeTeam({ analyst: ["analyst"] });
    const datasetId = await uploadDemoDataset(workspace.id, members.analyst.id);
    const response = await post(tokens.analyst, {
      datasetId,
      outcome: "sales_eur",
      terms: [{ column: "search_eur", transform: "log1p" }, "social_eur", "video_eur"],
      interactions: [["social_eur", "video_eur"]],
      intercept: false,
      covariance: { type: "newey-west", lag: 3 },
    });
    expect(response.status).toBe(201);
    const body = await response.json();
    expect(body.coefficients.map((c: { term: string }) => c.term)).toEqual(["log1p(search_eur)", "social_eur", "video_eur", "social_eur:video_eur"]);
    expect(body.covariance).toEqual({ type: "newey-west", lag: 3 });
    expect(body.rSquaredUncentred).toBe(true);
    expect(body.fTestKind).toBe("wald");

    const hc3 = await post(tokens.analyst, demoRequest(datasetId, { covariance: "hc3" }));
    expect(hc3.status).toBe(201);
    expect((await hc3.json()).covariance).toEqual({ type: "hc3", lag: null });
  });

  it("refuses what the engine refuses with 422 and a clear reason", async () => {
    const { workspace, members, tokens } = await makeTeam({ analyst: ["analyst"] });
    // Seven weeks; display is exactly twice video (aliased). The datasets engine already refuses
    // constant columns and fewer rows than its columns + 2, so n ≤ terms needs interactions.
    const csv = [
      "week,video,display,search,sales,promo",
      "2024-01-01,10,20,5,100,0",
      "2024-01-08,12,24,3,110,1",
      "2024-01-15,9,18,8,104,0",
      "2024-01-22,15,30,2,120,0",
      "2024-01-29,11,22,6,108,1",
      "2024-02-05,13,26,4,115,0",
      "2024-02-12,8,16,7,101,1",
    ].join("\n");
    const datasetId = await uploadDataset({
      workspaceId: workspace.id,
      userId: members.analyst.id,
      csv,
      roles: {
        week: { role: "period" },
        video: { role: "spend", unit: "EUR" },
        display: { role: "spend", unit: "EUR" },
        search: { role: "spend", unit: "EUR" },
        sales: { role: "outcome", unit: "EUR" },
        promo: { role: "control" },
      },
    });

    const aliased = await post(tokens.analyst, { datasetId, outcome: "sales", terms: ["video", "display"] });
    expect(aliased.status).toBe(422);
    const aliasedBody = await aliased.json();
    expect(aliasedBody.error).toMatch(/'display'.*aliased/);
    expect(aliasedBody.details[0]).toMatchObject({ term: "display", message: expect.stringContaining("linear combination") });

    const tooMany = await post(tokens.analyst, {
      datasetId,
      outcome: "sales",
      terms: ["video", "search"],
      controls: ["promo"],
      interactions: [["video", "search"], ["video", "promo"], ["search", "promo"]],
    });
    expect(tooMany.status).toBe(422);
    expect((await tooMany.json()).error).toMatch(/more rows than terms: .* 7 usable rows and the model has 7 terms/);

    const unknown = await post(tokens.analyst, { datasetId, outcome: "sales", terms: ["radio", { column: "promo", transform: "log1p", role: "control" }] });
    expect(unknown.status).toBe(422);
    expect((await unknown.json()).details.map((d: { path: string; message: string }) => [d.path, d.message])).toEqual([
      ["terms.0.column", "The dataset has no column 'radio'."],
      ["terms.1.transform", "Controls enter the model as they are; 'promo' cannot take log(1 + x)."],
    ]);

    const invalid = await post(tokens.analyst, { datasetId, outcome: "sales", terms: ["video"], level: 1.5, covariance: "sandwich" });
    expect(invalid.status).toBe(422);
    expect((await invalid.json()).details.map((d: { path: string }) => d.path).sort()).toEqual(["covariance", "level"]);
  });

  it("refuses a constant outcome (the engine's check; the datasets engine refuses constant columns before it)", () => {
    const columns = { sales: [5, 5, 5, 5], tv: [1, 2, 3, 4] };
    expect(() =>
      computeFit({
        specification: { outcome: "sales", intercept: true, terms: [{ kind: "linear", column: "tv" }] },
        columns,
        level: 0.95,
        covariance: { type: "classical" },
        periodColumn: null,
        periodLabels: null,
        units: {},
      }),
    ).toThrow(expect.objectContaining({ status: 422, details: [expect.objectContaining({ message: expect.stringMatching(/outcome that varies \(all 4 values of 'sales' equal 5\)/) })] }));
  });

  it("treats another workspace's dataset as missing and refuses roles without fit:create", async () => {
    const ours = await makeTeam({ analyst: ["analyst"], planner: ["planner"] });
    const theirs = await makeTeam({ analyst: ["analyst"] });
    const foreignDataset = await uploadDemoDataset(theirs.workspace.id, theirs.members.analyst.id);
    const response = await post(ours.tokens.analyst, demoRequest(foreignDataset));
    expect(response.status).toBe(422);
    expect(await response.json()).toMatchObject({ error: "No such spend history in this workspace.", details: [{ path: "datasetId" }] });

    const planner = await post(ours.tokens.planner, demoRequest(foreignDataset));
    expect(planner.status).toBe(403);
  });
});
