// POST /api/datasets and the reads around it, against real PostgreSQL, route handlers called as Next
// calls them: raw CSV and multipart bodies, 201 with id, row count and per-column summary, every
// malformed file of the shared fixture list answered 422 (413 over the limit) with row and column and
// nothing stored, roles assigned afterwards, rows pages, correlations, the original file and the
// formula-escaped export, role checks and other workspaces.
import { createHash } from "node:crypto";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { GET as getCorrelations } from "@/app/api/datasets/[id]/correlations/route";
import { GET as getExport } from "@/app/api/datasets/[id]/export/route";
import { GET as getFile } from "@/app/api/datasets/[id]/file/route";
import { PUT as putRoles } from "@/app/api/datasets/[id]/roles/route";
import { GET as getRows } from "@/app/api/datasets/[id]/rows/route";
import { GET as getDataset } from "@/app/api/datasets/[id]/route";
import { GET as listDatasets, POST as upload } from "@/app/api/datasets/route";
import { getDatabase } from "@/db/client";
import { demoHistoryCsv } from "@/seed/history";
import { getQueue } from "@/server/jobs/queue";
import { csv, malformedCases, ROLES } from "@/tests/fixtures/csv/cases";
import { apiRequest, csvUpload, makeTeam, multipartUpload, routeContext, streamingRequest, uploadFootprint } from "./support";

type Team = Awaited<ReturnType<typeof makeTeam<{ analyst: ["analyst"]; reviewer: ["reviewer"]; planner: ["planner"] }>>>;
let team: Team;
let other: Awaited<ReturnType<typeof makeTeam<{ analyst: ["analyst"] }>>>;

beforeAll(async () => {
  team = await makeTeam({ analyst: ["analyst"], reviewer: ["reviewer"], planner: ["planner"] });
  other = await makeTeam({ analyst: ["analyst"] });
});

afterAll(async () => {
  await (await getQueue()).stop({ graceful: false, wait: true }).catch(() => {});
});

const demoRoles = {
  week_start: { role: "period" },
  sales_eur: { role: "outcome", unit: "EUR" },
  search_eur: { role: "spend", unit: "EUR" },
  social_eur: { role: "spend", unit: "EUR" },
  video_eur: { role: "spend", unit: "EUR" },
  display_eur: { role: "spend", unit: "EUR" },
  podcast_eur: { role: "spend", unit: "EUR" },
  email_eur: { role: "spend", unit: "EUR" },
  promo_week: { role: "control", unit: "weeks" },
} as const;

async function post(request: Request) {
  const response = await upload(request, routeContext());
  return { status: response.status, headers: response.headers, body: await response.json() };
}

describe("POST /api/datasets", () => {
  it("stores a raw CSV body inline: 201 with id, row count and every column's summary; roles follow", async () => {
    const before = await uploadFootprint(team.workspace.id);
    const { status, body, headers } = await post(csvUpload(team.tokens.analyst, demoHistoryCsv(), "filename=larkspur.csv&name=Larkspur%20weekly"));
    expect(status, JSON.stringify(body)).toBe(201);
    expect(headers.get("location")).toBe(`/api/datasets/${body.id}`);
    expect(body).toMatchObject({
      id: expect.any(String),
      name: "Larkspur weekly",
      originalFilename: "larkspur.csv",
      rowCount: 156,
      columnCount: 9,
      status: "needs-roles",
      sha256: createHash("sha256").update(demoHistoryCsv()).digest("hex"),
      uploadedBy: team.members.analyst.id,
      links: { self: `/api/datasets/${body.id}`, page: `/datasets/${body.id}` },
    });
    const sales = body.columns.find((c: { name: string }) => c.name === "sales_eur");
    expect(sales).toMatchObject({ position: 9, kind: "numeric", role: null, missingCount: 0, numericCount: 156 });
    expect(sales.min).toBeLessThan(sales.mean);
    expect(sales.mean).toBeLessThan(sales.max);
    expect(body.columns[0]).toMatchObject({ name: "week_start", kind: "period", firstPeriod: "2023-01-02" });

    const after = await uploadFootprint(team.workspace.id);
    expect(after).toMatchObject({ datasets: before.datasets + 1, rows: before.rows + 156, columns: before.columns + 9, uploads: 0, audit: before.audit + 1 });

    // the analyst then assigns the roles (the second step of the upload page)
    const assigned = await putRoles(
      apiRequest(`/api/datasets/${body.id}/roles`, { method: "PUT", token: team.tokens.analyst, json: { roles: demoRoles } }),
      routeContext({ id: body.id }),
    );
    const ready = await assigned.json();
    expect(assigned.status, JSON.stringify(ready)).toBe(200);
    expect(ready).toMatchObject({ status: "ready", rolesAssignedBy: team.members.analyst.id });
    expect(ready.columns.find((c: { name: string }) => c.name === "promo_week")).toMatchObject({ role: "control", unit: "weeks" });

    const { sql } = getDatabase();
    const audit = await sql<{ action: string; details: Record<string, unknown> }[]>`
      select action, details from audit_log where object_type = 'dataset' and object_id = ${body.id} order by id`;
    expect(audit.map((a) => a.action)).toEqual(["dataset.uploaded", "dataset.roles_assigned"]);
    expect(audit[0].details).toMatchObject({ rows: 156, filename: "larkspur.csv", via: "inline" });
    expect(audit[1].details).toMatchObject({ outcome: "sales_eur", period: "week_start", controls: ["promo_week"] });

    // GET: reviewers read it, with who uploaded it
    const read = await getDataset(apiRequest(`/api/datasets/${body.id}`, { token: team.tokens.reviewer }), routeContext({ id: body.id }));
    expect(read.status).toBe(200);
    expect(await read.json()).toMatchObject({ id: body.id, status: "ready", uploadedByName: "analyst", fits: [] });
  });

  it("takes multipart/form-data with the options before the file, roles included (ready at once)", async () => {
    const form = new FormData();
    form.set("name", "Multipart history");
    form.set("options", JSON.stringify({ roles: ROLES }));
    form.set("file", new Blob([csv()], { type: "text/csv" }), "weekly.csv");
    const { status, body } = await post(await multipartUpload(team.tokens.analyst, form));
    expect(status, JSON.stringify(body)).toBe(201);
    expect(body).toMatchObject({ name: "Multipart history", originalFilename: "weekly.csv", rowCount: 8, status: "ready" });
    expect(body.columns.map((c: { role: string }) => c.role)).toEqual(["period", "outcome", "spend", "spend", "control"]);
  });

  it("refuses options sent after the file in a form, and stores nothing", async () => {
    const before = await uploadFootprint(team.workspace.id);
    const form = new FormData();
    form.set("file", new Blob([csv()], { type: "text/csv" }), "weekly.csv");
    form.set("options", JSON.stringify({ roles: ROLES }));
    const { status, body } = await post(await multipartUpload(team.tokens.analyst, form));
    expect(status).toBe(422);
    expect(body).toEqual({ error: "Send the form field “options” before the file.", details: [{ path: "options", message: expect.any(String) }] });
    expect(await uploadFootprint(team.workspace.id)).toEqual(before);
  });

  it("answers 422 for a form without a file, malformed options, or another content type", async () => {
    const form = new FormData();
    form.set("name", "No file");
    expect((await post(await multipartUpload(team.tokens.analyst, form))).body).toMatchObject({ error: expect.stringContaining("no file"), details: [{ path: "file" }] });
    const badOptions = await post(csvUpload(team.tokens.analyst, csv(), `options=${encodeURIComponent('{"missingPolicy":"sometimes"}')}`));
    expect(badOptions.status).toBe(422);
    expect(badOptions.body.details[0].path).toBe("query.options.missingPolicy");
    const json = await post(apiRequest("/api/datasets", { method: "POST", token: team.tokens.analyst, json: { csv: "a,b" } }));
    expect(json.status).toBe(422);
    expect(json.body.details[0].path).toBe("content-type");
  });

  it("answers 413 before reading a body whose Content-Length is over the limit", async () => {
    process.env.DATASET_MAX_BYTES = "1000";
    try {
      const before = await uploadFootprint(team.workspace.id);
      const { status, body } = await post(csvUpload(team.tokens.analyst, "week,sales\n" + "2024-01-01,1\n".repeat(200)));
      expect(status).toBe(413);
      expect(body).toMatchObject({ error: expect.stringContaining("larger than the limit"), details: [{ path: "file", kind: "file-too-large" }] });
      expect(await uploadFootprint(team.workspace.id)).toEqual(before);
    } finally {
      delete process.env.DATASET_MAX_BYTES;
    }
  });

  it("stores nothing when the connection ends before the declared Content-Length (a client that went away)", async () => {
    const before = await uploadFootprint(team.workspace.id);
    const content = Buffer.from(csv());
    // complete lines, so a server that took the early end for the end of the file would store 5 rows
    const cut = content.subarray(0, content.indexOf("2024-02-05"));
    const response = await upload(
      streamingRequest(team.tokens.analyst, [new Uint8Array(cut)], { "content-type": "text/csv", "content-length": String(content.length) }, "filename=cut.csv"),
      routeContext(),
    );
    expect(response.status).toBe(422);
    expect((await response.json()).error).toMatch(/^The upload ended after \d+ of \d+ bytes; nothing was stored\.$/);
    expect(await uploadFootprint(team.workspace.id)).toEqual(before);
  });

  it("refuses callers without dataset:upload (403) and without credentials (401)", async () => {
    expect((await post(csvUpload(team.tokens.reviewer, csv()))).status).toBe(403);
    expect((await post(csvUpload(team.tokens.planner, csv()))).status).toBe(403);
    const anonymous = await upload(new Request("http://localhost:3100/api/datasets", { method: "POST", headers: { authorization: "Bearer trib_nope" }, body: csv() }), routeContext());
    expect(anonymous.status).toBe(401);
  });
});

describe("every malformed file of the shared list, through the route", () => {
  const allowedOptionKeys = new Set(["roles", "missingPolicy", "minRows", "dateOrder"]);
  const cellKinds = new Set(["non-numeric", "non-finite", "thousands-separator", "decimal-comma", "negative-spend", "missing-value", "unparseable-period", "duplicate-period"]);
  const cases = malformedCases.filter((c) => !c.limits && Object.keys(c.options ?? {}).every((key) => allowedOptionKeys.has(key)));

  it(`covers at least 30 cases (${cases.length} here)`, () => {
    expect(cases.length).toBeGreaterThanOrEqual(30);
  });

  it.each(cases.map((c) => [c.name, c] as const))("%s → 422 with row and column, nothing stored", async (_name, testCase) => {
    const before = await uploadFootprint(team.workspace.id);
    const bytes = typeof testCase.content === "string" ? Buffer.from(testCase.content, "utf8") : Buffer.from(testCase.content);
    const query = `filename=bad.csv${testCase.options ? `&options=${encodeURIComponent(JSON.stringify(testCase.options))}` : ""}`;
    const { status, body } = await post(csvUpload(team.tokens.analyst, bytes, query));
    expect(status, JSON.stringify(body)).toBe(422);
    expect(body.error).toMatch(/^The file was not stored: /);
    const details = body.details.filter((d: { kind: string }) => d.kind !== "omitted");
    const expected = testCase.expect.map((p) => ({
      kind: p.kind,
      ...(p.row !== undefined ? { row: p.row } : {}),
      ...(p.line !== undefined ? { line: p.line } : {}),
      ...(p.column !== undefined ? { columnNumber: p.column } : {}),
      ...(p.byteOffset !== undefined ? { byteOffset: p.byteOffset } : {}),
    }));
    if (testCase.atLeast) expect(details.slice(0, expected.length)).toMatchObject(expected);
    else expect(details).toMatchObject(expected);
    for (const detail of details) expect(detail).toMatchObject({ message: expect.any(String), path: expect.any(String) });
    // a problem in a cell names its row and its column (by name as well as number)
    for (const detail of details.filter((d: { kind: string; row?: number }) => cellKinds.has(d.kind) && d.row !== undefined)) {
      expect(detail).toMatchObject({ row: expect.any(Number), column: expect.any(String), columnNumber: expect.any(Number) });
    }
    expect(await uploadFootprint(team.workspace.id)).toEqual(before);
  });
});

describe("reading a spend history", () => {
  let id: string;
  beforeAll(async () => {
    const content = csv((rows) => {
      rows[1][4] = "9.99";
    }).replace("week,sales,tv,search,price", "week,sales,tv,search,price") // unchanged header
      .trimEnd() + "\n";
    // an extra text column whose cells look like formulas
    const lines = content.trimEnd().split("\n");
    const withNote = lines.map((line, i) => `${line},${i === 0 ? "note" : i === 1 ? "=HYPERLINK(\"http://x\")" : i === 2 ? "@SUM(A1)" : i === 3 ? "-12" : "ok"}`).join("\n") + "\n";
    const { status, body } = await post(csvUpload(team.tokens.analyst, withNote, `filename=notes.csv&options=${encodeURIComponent(JSON.stringify({ roles: ROLES }))}`));
    expect(status, JSON.stringify(body)).toBe(201);
    id = body.id;
  });

  it("pages rows on the server", async () => {
    const response = await getRows(apiRequest(`/api/datasets/${id}/rows?offset=2&limit=3`, { token: team.tokens.reviewer }), routeContext({ id }));
    const page = await response.json();
    expect(page).toMatchObject({ total: 8, offset: 2, limit: 3 });
    expect(page.rows.map((r: { rowNumber: number }) => r.rowNumber)).toEqual([3, 4, 5]);
    expect(page.rows[0].cells).toEqual(["2024-01-15", 1250.25, 310, 125, 10.49, -12]);
    const bad = await getRows(apiRequest(`/api/datasets/${id}/rows?limit=5000`, { token: team.tokens.reviewer }), routeContext({ id }));
    expect(bad.status).toBe(422);
  });

  it("lists the workspace's histories (and not another workspace's)", async () => {
    const mine = await (await listDatasets(apiRequest("/api/datasets", { token: team.tokens.reviewer }), routeContext())).json();
    expect(mine.datasets.some((d: { id: string }) => d.id === id)).toBe(true);
    const theirs = await (await listDatasets(apiRequest("/api/datasets", { token: other.tokens.analyst }), routeContext())).json();
    expect(theirs.datasets).toEqual([]);
  });

  it("gives the correlations of the candidate predictors", async () => {
    const matrix = await (await getCorrelations(apiRequest(`/api/datasets/${id}/correlations`, { token: team.tokens.analyst }), routeContext({ id }))).json();
    expect(matrix.columns.map((c: { name: string }) => c.name)).toEqual(["tv", "search", "price"]);
    expect(matrix.n).toBe(8);
    expect(matrix.matrix[0][0]).toBe(1);
    expect(matrix.matrix[0][1]).toBeCloseTo(matrix.matrix[1][0], 12);
  });

  it("returns the original file byte for byte, with its sha256", async () => {
    const dataset = await (await getDataset(apiRequest(`/api/datasets/${id}`, { token: team.tokens.analyst }), routeContext({ id }))).json();
    const response = await getFile(apiRequest(`/api/datasets/${id}/file`, { token: team.tokens.reviewer }), routeContext({ id }));
    expect(response.status).toBe(200);
    const bytes = Buffer.from(await response.arrayBuffer());
    expect(createHash("sha256").update(bytes).digest("hex")).toBe(dataset.sha256);
    expect(response.headers.get("x-content-sha256")).toBe(dataset.sha256);
    expect(response.headers.get("content-disposition")).toContain('filename="notes.csv"');
  });

  it("exports the rows as CSV with formula-looking cells escaped", async () => {
    const response = await getExport(apiRequest(`/api/datasets/${id}/export`, { token: team.tokens.reviewer }), routeContext({ id }));
    expect(response.status).toBe(200);
    const text = await response.text();
    const lines = text.trimEnd().split("\r\n");
    expect(lines[0]).toBe("week,sales,tv,search,price,note");
    expect(lines).toHaveLength(9);
    expect(lines[1]).toBe(`2024-01-01,1200.5,300,120,9.99,"'=HYPERLINK(""http://x"")"`);
    expect(lines[2]).toBe("2024-01-08,1310,280,130,9.99,'@SUM(A1)");
    expect(lines[3]).toBe("2024-01-15,1250.25,310,125,10.49,-12"); // a negative number stays a number
  });

  it("treats another workspace's history as missing (404) on every read", async () => {
    const token = other.tokens.analyst;
    const ctx = routeContext({ id });
    expect((await getDataset(apiRequest(`/api/datasets/${id}`, { token }), ctx)).status).toBe(404);
    expect((await getRows(apiRequest(`/api/datasets/${id}/rows`, { token }), ctx)).status).toBe(404);
    expect((await getCorrelations(apiRequest(`/api/datasets/${id}/correlations`, { token }), ctx)).status).toBe(404);
    expect((await getFile(apiRequest(`/api/datasets/${id}/file`, { token }), ctx)).status).toBe(404);
    expect((await getExport(apiRequest(`/api/datasets/${id}/export`, { token }), ctx)).status).toBe(404);
    const roles = await putRoles(apiRequest(`/api/datasets/${id}/roles`, { method: "PUT", token, json: { roles: ROLES } }), ctx);
    expect(roles.status).toBe(404);
  });

  it("answers 422 with row and column when the roles do not pass, and changes nothing", async () => {
    const form = await post(csvUpload(team.tokens.analyst, csv((rows) => {
      rows[3][2] = "-5";
    }), "filename=neg.csv"));
    expect(form.status).toBe(201);
    const ctx = routeContext({ id: form.body.id });
    const response = await putRoles(apiRequest(`/api/datasets/${form.body.id}/roles`, { method: "PUT", token: team.tokens.analyst, json: { roles: ROLES } }), ctx);
    expect(response.status).toBe(422);
    const body = await response.json();
    expect(body.details).toEqual([expect.objectContaining({ kind: "negative-spend", row: 4, column: "tv", columnNumber: 3 })]);
    const after = await (await getDataset(apiRequest(`/api/datasets/${form.body.id}`, { token: team.tokens.analyst }), ctx)).json();
    expect(after.status).toBe("needs-roles");
    // reviewers read but do not assign roles
    const reviewer = await putRoles(apiRequest(`/api/datasets/${form.body.id}/roles`, { method: "PUT", token: team.tokens.reviewer, json: { roles: ROLES } }), ctx);
    expect(reviewer.status).toBe(403);
  });
});
