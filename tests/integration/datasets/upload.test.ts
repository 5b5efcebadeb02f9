// Uploads against a real PostgreSQL: what a valid upload stores (byte-identical original, rows, columns,
// roles), roles given later, the read functions, and that nothing at all is stored when an upload fails.
import { createHash } from "node:crypto";
import { Readable } from "node:stream";
import { afterAll, describe, expect, it } from "vitest";
import { getDatabase } from "@/db/client";
import { checkCsv } from "@/server/datasets/pipeline";
import type { UploadProgress } from "@/server/datasets/pipeline";
import {
  assignDatasetRoles,
  createDataset,
  deleteDataset,
  getCorrelationMatrix,
  getDatasetById,
  getDatasetRowsPage,
  listDatasetsByWorkspace,
  loadDatasetColumns,
  loadDatasetFrame,
  readDatasetFile,
} from "@/server/datasets/store";
import { OPTIONS, ROWS, csv, malformedCases } from "@/tests/fixtures/csv/cases";
import { idleInTransaction, makeUploader, snapshotAllTables } from "./helpers";

const stream = (content: string | Uint8Array, chunk = 1000) => {
  const bytes = typeof content === "string" ? Buffer.from(content) : Buffer.from(content);
  const parts: Buffer[] = [];
  for (let i = 0; i < bytes.length; i += chunk) parts.push(bytes.subarray(i, i + chunk));
  return Readable.from(parts);
};

async function collect(chunks: AsyncIterable<Buffer>): Promise<Buffer> {
  const out: Buffer[] = [];
  for await (const c of chunks) out.push(c);
  return Buffer.concat(out);
}

/** Row i (0-based) of `weekly`: week, sales, tv, search, price, comment. */
function weeklyRow(i: number): [string, number, number, number, number, string | null] {
  const week = new Date(Date.UTC(2015, 0, 5) + i * 7 * 86_400_000).toISOString().slice(0, 10);
  const tv = 200 + ((i * 37) % 101);
  const search = 100 + ((i * 53) % 67);
  const price = 9 + ((i * 7) % 5) / 4;
  const sales = Number((1000 + 2.5 * tv + 1.5 * search - 40 * price + (i % 13)).toFixed(2));
  return [week, sales, tv, search, price, i % 50 === 0 ? 'promo, "big"' : null];
}

/** A bigger valid file: `n` weekly rows, with an ignored comment column holding text with quotes. */
function weekly(n: number): string {
  const lines = ["week,sales,tv,search,price,comment"];
  for (let i = 0; i < n; i++) {
    const [week, sales, tv, search, price, comment] = weeklyRow(i);
    lines.push(`${week},${sales.toFixed(2)},${tv},${search},${price},${comment === null ? "" : `"${comment.replace(/"/g, '""')}"`}`);
  }
  return lines.join("\r\n") + "\r\n";
}

afterAll(async () => {
  expect(await idleInTransaction()).toBe(0);
});

describe("a valid upload", () => {
  it("stores the original byte for byte, the rows, the columns with roles, and who uploaded it", async () => {
    const { workspaceId, userId } = await makeUploader();
    const content = "\uFEFF" + weekly(1200);
    const bytes = Buffer.from(content);
    const progress: UploadProgress[] = [];
    const before = Date.now();
    const result = await createDataset({
      workspaceId,
      userId,
      originalFilename: "history 2015-2037.csv",
      stream: stream(bytes, 4096),
      totalBytes: bytes.length,
      options: OPTIONS,
      onProgress: (p) => progress.push(p),
    });
    if (!result.ok) throw new Error(result.report.summary);
    const { dataset } = result;
    expect(dataset).toMatchObject({
      workspaceId,
      name: "history 2015-2037",
      originalFilename: "history 2015-2037.csv",
      byteSize: bytes.length,
      sha256: createHash("sha256").update(bytes).digest("hex"),
      rowCount: 1200,
      columnCount: 6,
      delimiter: ",",
      hasBom: true,
      lineEnding: "crlf",
      status: "ready",
      missingPolicy: "reject",
      droppedRowCount: 0,
      uploadedBy: userId,
      rolesAssignedBy: userId,
    });
    expect(Date.parse(dataset.uploadedAt)).toBeGreaterThanOrEqual(before - 5000);
    expect(dataset.columns.map((c) => [c.name, c.kind, c.role, c.unit])).toEqual([
      ["week", "period", "period", null],
      ["sales", "numeric", "outcome", "EUR"],
      ["tv", "numeric", "spend", "EUR"],
      ["search", "numeric", "spend", "EUR"],
      ["price", "numeric", "control", "EUR"],
      ["comment", "text", "ignored", null],
    ]);
    expect(dataset.columns[2]).toMatchObject({ min: 200, max: 300, numericCount: 1200, missingCount: 0 });
    expect(dataset.columns[5]).toMatchObject({ textCount: 24, missingCount: 1176 });

    // the original, byte for byte
    const file = await readDatasetFile({ workspaceId, datasetId: dataset.id });
    const stored = await collect(file!.chunks);
    expect(stored.equals(bytes)).toBe(true);
    expect(createHash("sha256").update(stored).digest("hex")).toBe(file!.sha256);

    // rows, paged on the server
    const page = await getDatasetRowsPage({ workspaceId, datasetId: dataset.id, offset: 49, limit: 3 });
    expect(page).toMatchObject({ total: 1200, offset: 49, limit: 3 });
    expect(page!.rows.map((r) => r.rowNumber)).toEqual([50, 51, 52]);
    expect(page!.rows[1].line).toBe(52);
    expect(page!.rows.map((r) => r.cells)).toEqual([weeklyRow(49), weeklyRow(50), weeklyRow(51)]);
    expect(page!.rows[1].cells[5]).toBe('promo, "big"');
    expect(page!.rows[0].cells[5]).toBeNull();

    // numbers for fitting
    const columns = await loadDatasetColumns(dataset.id, { workspaceId });
    expect(Object.keys(columns!)).toEqual(["sales", "tv", "search", "price"]);
    expect(columns!.tv).toBeInstanceOf(Float64Array);
    expect(columns!.tv.length).toBe(1200);
    expect(columns!.tv[50]).toBe(weeklyRow(50)[2]);
    const frame = await loadDatasetFrame(dataset.id);
    expect(frame!.periods!.slice(0, 2)).toEqual(["2015-01-05", "2015-01-12"]);
    expect(frame!.rowNumbers[1199]).toBe(1200);

    // correlations of the candidate predictors
    const corr = await getCorrelationMatrix({ workspaceId, datasetId: dataset.id });
    expect(corr!.columns.map((c) => c.name)).toEqual(["tv", "search", "price"]);
    expect(corr!.n).toBe(1200);
    expect(corr!.matrix[0][0]).toBe(1);
    expect(corr!.matrix[0][1]).toBeCloseTo(pearson(columns!.tv, columns!.search), 12);
    expect(corr!.matrix[1][0]).toBe(corr!.matrix[0][1]);

    // progress: bytes and rows only grow, and it ends with everything stored
    expect(progress.length).toBeGreaterThan(3);
    for (let i = 1; i < progress.length; i++) {
      expect(progress[i].bytesRead).toBeGreaterThanOrEqual(progress[i - 1].bytesRead);
      expect(progress[i].rowsStored).toBeGreaterThanOrEqual(progress[i - 1].rowsStored);
    }
    expect(progress.at(-1)).toEqual({ phase: "done", bytesRead: bytes.length, totalBytes: bytes.length, rowsParsed: 1200, rowsStored: 1200 });

    // listed in its workspace, invisible from another
    expect((await listDatasetsByWorkspace(workspaceId)).map((d) => d.id)).toEqual([dataset.id]);
    const other = await makeUploader();
    expect(await getDatasetById({ workspaceId: other.workspaceId, datasetId: dataset.id })).toBeNull();
    expect(await getDatasetRowsPage({ workspaceId: other.workspaceId, datasetId: dataset.id, offset: 0, limit: 10 })).toBeNull();
    expect(await readDatasetFile({ workspaceId: other.workspaceId, datasetId: dataset.id })).toBeNull();
    expect(await getCorrelationMatrix({ workspaceId: other.workspaceId, datasetId: dataset.id })).toBeNull();
    expect(await loadDatasetColumns(dataset.id, { workspaceId: other.workspaceId })).toBeNull();
    expect(await getDatasetById({ workspaceId, datasetId: "not-a-uuid" })).toBeNull();
  });

  it("says when the same file was uploaded before", async () => {
    const { workspaceId, userId } = await makeUploader();
    const first = await createDataset({ workspaceId, userId, originalFilename: "a.csv", stream: stream(csv()), options: OPTIONS });
    const second = await createDataset({ workspaceId, userId, originalFilename: "b.csv", stream: stream(csv()), options: OPTIONS });
    expect(first.ok && second.ok).toBe(true);
    expect(first.report.notes).toEqual([]);
    expect(second.report.notes.map((n) => n.kind)).toEqual(["same-file-uploaded-before"]);
  });

  it("drops incomplete rows when asked, says how many, and fits see the rows in period order", async () => {
    const { workspaceId, userId } = await makeUploader();
    const content = csv((rows) => {
      rows.reverse();
      rows.push(["2024-02-26", "1650", "", "175", "10.49"], ["2024-03-04", "1700", "395", "180", "10.99"]);
    });
    const result = await createDataset({
      workspaceId,
      userId,
      originalFilename: "newest-first.csv",
      stream: stream(content),
      options: { ...OPTIONS, missingPolicy: "drop-incomplete-rows" },
    });
    if (!result.ok) throw new Error(result.report.summary);
    expect(result.dataset).toMatchObject({ rowCount: 10, droppedRowCount: 1, missingPolicy: "drop-incomplete-rows" });
    expect(result.report.notes.map((n) => n.kind).sort()).toEqual(["dropped-incomplete-rows", "periods-not-ascending"]);
    expect(result.report.notes.find((n) => n.kind === "dropped-incomplete-rows")).toMatchObject({ count: 1, rows: [9] });
    const frame = await loadDatasetFrame(result.dataset.id, { workspaceId });
    expect(frame!.n).toBe(9);
    expect(frame!.periods).toEqual([...ROWS.map((r) => r[0]), "2024-03-04"]);
    expect(Array.from(frame!.columns.tv)).toEqual([...ROWS.map((r) => Number(r[2])), 395]);
    expect(Array.from(frame!.rowNumbers)).toEqual([8, 7, 6, 5, 4, 3, 2, 1, 10]);
  });

  it("deletes a dataset with its file, columns and rows", async () => {
    const { workspaceId, userId } = await makeUploader();
    const result = await createDataset({ workspaceId, userId, originalFilename: "x.csv", stream: stream(weekly(300)), options: OPTIONS });
    if (!result.ok) throw new Error(result.report.summary);
    const { sql } = getDatabase();
    const count = async (table: string) =>
      (await sql.unsafe<{ n: number }[]>(`select count(*)::int as n from ${table} where dataset_id = $1`, [result.dataset.id]))[0].n;
    expect(await count("dataset_rows")).toBe(300);
    expect(await deleteDataset({ workspaceId: (await makeUploader()).workspaceId, datasetId: result.dataset.id })).toBe(false);
    expect(await deleteDataset({ workspaceId, datasetId: result.dataset.id })).toBe(true);
    for (const table of ["dataset_rows", "dataset_files", "dataset_columns"]) expect(await count(table)).toBe(0);
  });
});

describe("roles given after the upload", () => {
  it("stores the inspected file first, refuses bad roles without changing anything, then accepts good ones", async () => {
    const { workspaceId, userId } = await makeUploader();
    const content = csv((rows, header) => {
      header.push("radio");
      rows.forEach((r, i) => r.push(i === 4 ? "-20" : String(40 + i)));
    });
    const uploaded = await createDataset({ workspaceId, userId, originalFilename: "later.csv", stream: stream(content) });
    if (!uploaded.ok) throw new Error(uploaded.report.summary);
    expect(uploaded.dataset.status).toBe("needs-roles");
    expect(uploaded.dataset.columns.every((c) => c.role === null)).toBe(true);

    const before = await snapshotAllTables();
    const refused = await assignDatasetRoles({
      workspaceId,
      datasetId: uploaded.dataset.id,
      userId,
      roles: { ...OPTIONS.roles, radio: { role: "spend" } },
    });
    expect(refused).toMatchObject({ ok: false });
    expect(refused!.ok ? [] : refused!.report.problems.map((p) => [p.kind, p.row, p.line, p.column])).toEqual([["negative-spend", 5, 6, 6]]);
    expect(await snapshotAllTables()).toEqual(before);

    const accepted = await assignDatasetRoles({ workspaceId, datasetId: uploaded.dataset.id, userId, roles: OPTIONS.roles! });
    if (!accepted?.ok) throw new Error("roles refused");
    expect(accepted.dataset.status).toBe("ready");
    expect(accepted.dataset.columns.map((c) => c.role)).toEqual(["period", "outcome", "spend", "spend", "control", "ignored"]);
    expect(accepted.dataset.rolesAssignedBy).toBe(userId);
    expect(await assignDatasetRoles({ workspaceId: (await makeUploader()).workspaceId, datasetId: uploaded.dataset.id, userId, roles: OPTIONS.roles! })).toBeNull();
  });
});

describe("a failed upload stores nothing", () => {
  for (const c of malformedCases.filter((m) => !m.limits)) {
    it(c.name, async () => {
      const { workspaceId, userId } = await makeUploader();
      const expected = await checkCsv(stream(c.content), c.options ?? {});
      const before = await snapshotAllTables();
      const result = await createDataset({ workspaceId, userId, originalFilename: "bad.csv", stream: stream(c.content, 37), options: c.options });
      expect(result.ok).toBe(false);
      expect(result.report.problems).toEqual(expected.report.problems);
      expect(await snapshotAllTables()).toEqual(before);
    });
  }

  it("an upload whose stream breaks mid-way (rows already sent to COPY)", async () => {
    const { workspaceId, userId } = await makeUploader();
    const before = await snapshotAllTables();
    const body = Buffer.from(weekly(100_000));
    async function* breaking() {
      for (let i = 0; i < body.length / 2; i += 64 * 1024) yield body.subarray(i, i + 64 * 1024);
      throw new Error("client went away");
    }
    let rowsStored = 0;
    await expect(
      createDataset({ workspaceId, userId, originalFilename: "cut.csv", stream: breaking(), options: OPTIONS, onProgress: (p) => (rowsStored = p.rowsStored) }),
    ).rejects.toThrow("client went away");
    expect(rowsStored).toBeGreaterThan(1000);
    expect(await snapshotAllTables()).toEqual(before);
    expect(await idleInTransaction()).toBe(0);
    // the pool is healthy afterwards
    const after = await createDataset({ workspaceId, userId, originalFilename: "ok.csv", stream: stream(csv()), options: OPTIONS });
    expect(after.ok).toBe(true);
  });

  it("an upload the database refuses at the end (unknown workspace)", async () => {
    const { userId } = await makeUploader();
    const before = await snapshotAllTables();
    await expect(
      createDataset({ workspaceId: "00000000-0000-4000-8000-000000000000", userId, originalFilename: "x.csv", stream: stream(weekly(500)), options: OPTIONS }),
    ).rejects.toMatchObject({ code: "23503" });
    expect(await snapshotAllTables()).toEqual(before);
  });

  it("malformed options are refused before reading", async () => {
    const { workspaceId, userId } = await makeUploader();
    await expect(
      createDataset({ workspaceId, userId, originalFilename: "x.csv", stream: stream(csv()), options: { missingPolicy: "ignore" } as never }),
    ).rejects.toThrow();
  });
});

function pearson(x: Float64Array, y: Float64Array): number {
  const n = x.length;
  const mx = x.reduce((a, b) => a + b, 0) / n;
  const my = y.reduce((a, b) => a + b, 0) / n;
  let sxy = 0;
  let sxx = 0;
  let syy = 0;
  for (let i = 0; i < n; i++) {
    sxy += (x[i] - mx) * (y[i] - my);
    sxx += (x[i] - mx) ** 2;
    syy += (y[i] - my) ** 2;
  }
  return sxy / Math.sqrt(sxx * syy);
}
