// Large datasets are fitted by the worker: POST answers 202 with a job, the job's handler stores the
// draft, GET /api/jobs/{id} reports it (workspace-scoped). Plot data of large fits is sampled while
// every statistic stays exact.
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { GET as getJob } from "@/app/api/jobs/[id]/route";
import { GET as getFit } from "@/app/api/fits/[id]/route";
import { POST as createFit } from "@/app/api/fits/route";
import { computeFit } from "@/server/fits/compute";
import { maxQqPoints, maxScatterPoints, maxSeriesPoints } from "@/server/fits/plot-data";
import runFit from "@/server/jobs/handlers/fit-run";
import { getQueue } from "@/server/jobs/queue";
import { loadJobRunForWorker } from "@/server/jobs/runs";
import { apiRequest, demoRequest, makeTeam, routeContext, uploadDemoDataset } from "./helpers";

beforeAll(() => {
  process.env.FIT_INLINE_ROW_LIMIT = "100"; // the 156-week demo history now counts as large
});
afterAll(async () => {
  delete process.env.FIT_INLINE_ROW_LIMIT;
  await (await getQueue()).stop({ graceful: false, wait: true }).catch(() => {});
});

async function runJob(jobId: string) {
  const run = await loadJobRunForWorker(jobId);
  if (!run) throw new Error("job run missing");
  const steps: { phase: string; done: number; total: number | null; message?: string }[] = [];
  const result = await runFit({ run, progress: async (phase, done, total, message) => void steps.push({ phase, done, total, message }) });
  return { result, phases: [...new Set(steps.map((step) => step.phase))], steps };
}

describe("fits of large datasets run as jobs", () => {
  it("answers 202 with a job to poll, and the job stores the draft", async () => {
    const team = await makeTeam({ analyst: ["analyst"], stranger: ["analyst"] });
    const other = await makeTeam({ analyst: ["analyst"] });
    const datasetId = await uploadDemoDataset(team.workspace.id, team.members.analyst.id);
    const response = await createFit(apiRequest("/api/fits", { method: "POST", token: team.tokens.analyst, json: demoRequest(datasetId) }), routeContext());
    expect(response.status).toBe(202);
    const { job } = await response.json();
    expect(job).toMatchObject({ kind: "fit.run", status: "queued", links: { self: `/api/jobs/${job.id}` } });
    expect(response.headers.get("location")).toBe(`/api/jobs/${job.id}`);

    const poll = (token: string) => getJob(apiRequest(`/api/jobs/${job.id}`, { token }), routeContext({ id: job.id }));
    expect((await (await poll(team.tokens.analyst)).json()).status).toBe("queued");
    expect((await poll(other.tokens.analyst)).status).toBe(404);

    const { result, phases, steps } = await runJob(job.id);
    // stage progress, so the browser's bar moves during a long fit: every stage, in order, on one scale
    expect(phases).toEqual(["Checking the request", "Reading rows", "Solving", "Diagnostics", "Storing", "Stored"]);
    expect(steps.every((step) => step.total === 100)).toBe(true);
    for (let i = 1; i < steps.length; i++) expect(steps[i].done).toBeGreaterThanOrEqual(steps[i - 1].done);
    expect(new Set(steps.map((step) => step.done)).size).toBeGreaterThanOrEqual(6);
    expect(steps.at(-1)).toMatchObject({ phase: "Stored", done: 100 });
    // reading reports the rows and each column as it arrives
    const reading = steps.filter((step) => step.phase === "Reading rows");
    expect(reading.length).toBeGreaterThan(2);
    expect(reading.at(-1)!.message).toMatch(/^156 rows: (\d+) of \1 columns read$/);
    // The worker (server/jobs/worker.ts) records the handler's result; do the same here.
    const { completeJobRun } = await import("@/server/jobs/runs");
    await completeJobRun(job.id, result);
    const done = await (await poll(team.tokens.analyst)).json();
    expect(done).toMatchObject({ status: "succeeded", result: { fitId: expect.any(String), n: 156 } });
    expect(done.links).toEqual({ self: `/api/jobs/${job.id}`, fit: `/api/fits/${done.result.fitId}`, page: `/fits/${done.result.fitId}` });

    const fit = await (await getFit(apiRequest(done.links.fit, { token: team.tokens.stranger }), routeContext({ id: done.result.fitId }))).json();
    expect(fit).toMatchObject({ status: "draft", authorId: team.members.analyst.id, n: 156 });
    expect(fit.trail.map((e: { action: string }) => e.action)).toEqual(["fit.created"]);
  });

  it("fails the job with the API's message and details when the request is refused", async () => {
    const team = await makeTeam({ analyst: ["analyst"] });
    const datasetId = await uploadDemoDataset(team.workspace.id, team.members.analyst.id);
    const response = await createFit(
      apiRequest("/api/fits", {
        method: "POST",
        token: team.tokens.analyst,
        json: demoRequest(datasetId, { terms: ["video_eur", "display_eur"], interactions: [["video_eur", "display_eur"]], controls: [] }),
      }),
      routeContext(),
    );
    expect(response.status).toBe(202);
    const { job } = await response.json();
    // The worker checks the request again (the dataset may have changed since it was queued): a
    // queued input that is no longer valid fails the run with the same error the API gives.
    const run = await loadJobRunForWorker(job.id);
    const input = run!.input as { fitInput: { terms: unknown[]; interactions: unknown[] } };
    input.fitInput.interactions = [["video_eur", "display_eur"], ["display_eur", "video_eur"]];
    await expect(runFit({ run: { ...run!, input: input as never }, progress: async () => {} })).rejects.toMatchObject({
      status: 422,
      message: "The fit cannot be built as asked.",
      details: [{ path: "interactions.1", message: "The interaction of 'display_eur' and 'video_eur' appears twice." }],
    });
  });
});

describe("plot data of a large fit", () => {
  it("samples the plots (extremes kept) and keeps every statistic exact", () => {
    const n = 30_000;
    let seed = 7;
    const random = () => ((seed = (seed * 16807) % 2147483647) / 2147483647);
    const x = Float64Array.from({ length: n }, () => random() * 100);
    const z = Float64Array.from({ length: n }, () => random() * 50);
    const y = Float64Array.from(x, (value, i) => 3 + 2 * value - z[i] + (random() - 0.5) * 20);
    y[12_345] += 5_000; // one wild week
    const { report } = computeFit({
      specification: { outcome: "y", intercept: true, terms: [{ kind: "linear", column: "x" }, { kind: "linear", column: "z" }] },
      columns: { x, z, y },
      level: 0.95,
      covariance: { type: "classical" },
      periodColumn: null,
      periodLabels: null,
      units: { y: "EUR" },
    });
    expect(report.n).toBe(n);
    expect(report.diagnostics.sampled).toBe(true);
    expect(report.diagnostics.points.row.length).toBeLessThanOrEqual(maxScatterPoints);
    expect(report.diagnostics.points.row).toContain(12_346); // 1-based row number of the wild week
    expect(report.diagnostics.qq.sample.length).toBeLessThanOrEqual(maxQqPoints);
    expect(report.diagnostics.qq.sample.at(-1)).toBe(Math.max(...report.diagnostics.points.standardized.map((v) => v ?? -Infinity)));
    expect(report.diagnostics.series.label.length).toBeLessThanOrEqual(maxSeriesPoints);
    expect(report.diagnostics.series.rowsPerPoint).toBe(30);
    expect(report.diagnostics.maxCooks).toBeGreaterThan(0.01);
    expect(report.dfResidual).toBe(n - 3);
    expect(report.coefficients[1].estimate).toBeCloseTo(2, 1);
  });
});
