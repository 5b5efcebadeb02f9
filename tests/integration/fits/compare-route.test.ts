// GET /api/fits/compare against real PostgreSQL: two fits of the demo history side by side (the
// numbers are the stored reports'), ids comma-separated or repeated, 422 for too few or malformed,
// 404 when any fit belongs to another workspace.
import { describe, expect, it } from "vitest";
import { GET as compare } from "@/app/api/fits/compare/route";
import { POST as createFit } from "@/app/api/fits/route";
import { apiRequest, demoRequest, makeTeam, routeContext, uploadDemoDataset } from "./helpers";

describe("GET /api/fits/compare", () => {
  it("puts two fits of the same rows side by side, and refuses what it cannot compare", async () => {
    const { workspace, members, tokens } = await makeTeam({ analyst: ["analyst"] });
    const datasetId = await uploadDemoDataset(workspace.id, members.analyst.id);
    const create = async (json: unknown) => (await createFit(apiRequest("/api/fits", { method: "POST", token: tokens.analyst, json }), routeContext())).json();
    const full = await create(demoRequest(datasetId, { name: "All channels" }));
    const request = demoRequest(datasetId, { name: "Without video" }) as { terms: string[] };
    const withoutVideo = await create({ ...request, terms: request.terms.filter((term) => term !== "video_eur") });
    const get = async (query: string, token = tokens.analyst) => {
      const response = await compare(apiRequest(`/api/fits/compare?${query}`, { token }), routeContext());
      return { status: response.status, body: await response.json() };
    };

    const { status, body } = await get(`ids=${full.id},${withoutVideo.id}`);
    expect(status).toBe(200);
    expect(body.sameRows).toBe(true);
    expect(body.fits.map((fit: { name: string }) => fit.name)).toEqual(["All channels", "Without video"]);
    const aic = body.summary.find((row: { key: string }) => row.key === "aic");
    expect(aic.values).toEqual([full.aic, withoutVideo.aic]);
    expect(aic.best).toBe(full.aic < withoutVideo.aic ? 0 : 1);
    const video = body.terms.find((row: { term: string }) => row.term === "video_eur");
    expect(video.cells[1]).toBeNull();
    expect(video.cells[0].estimate).toBe(full.coefficients.find((c: { term: string }) => c.term === "video_eur").estimate);
    expect(body.shiftingTerms).toContain("display_eur");

    // Repeated ids work the same; duplicates collapse.
    expect((await get(`ids=${withoutVideo.id}&ids=${full.id}&ids=${full.id}`)).body.fits.map((fit: { name: string }) => fit.name)).toEqual(["Without video", "All channels"]);
    expect(await get(`ids=${full.id}`)).toMatchObject({ status: 422, body: { details: [{ path: "query.ids", message: "Give at least two different fits." }] } });
    expect((await get(`ids=${full.id},not-a-fit`)).status).toBe(422);
    expect((await get("")).status).toBe(422);
    // Someone else's workspace: the fits do not exist there.
    const outsider = await makeTeam({ analyst: ["analyst"] });
    expect((await get(`ids=${full.id},${withoutVideo.id}`, outsider.tokens.analyst)).status).toBe(404);
  });
});
