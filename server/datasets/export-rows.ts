import "server-only";
import { getDatabase } from "@/db/client";
import { csvLines, type CsvCell } from "./csv-export";
import { getDatasetById } from "./store";

/**
 * The stored rows as CSV (header, then every row in file order), streamed from a cursor so a
 * 1,000,000-row dataset never sits in memory. Cells go through the shared CSV escaping: text that a
 * spreadsheet would read as a formula (=, +, -, @ …) is written as text, never as a formula.
 */
export async function datasetRowsCsv(params: { workspaceId: string; datasetId: string }): Promise<{ filename: string; body: ReadableStream<Uint8Array> } | null> {
  const dataset = await getDatasetById(params);
  if (!dataset) return null;
  const { sql } = getDatabase();
  const n = dataset.columns.length;
  const delimiter = dataset.delimiter === "\t" ? "\t" : dataset.delimiter === ";" ? ";" : ",";
  const encoder = new TextEncoder();
  const header = dataset.columns.map((c) => c.name);
  let cursor: AsyncIterator<{ numbers: (number | null)[]; texts: (string | null)[] | null }[]> | null = null;
  let headerSent = false;

  const body = new ReadableStream<Uint8Array>({
    async pull(controller) {
      if (!headerSent) {
        headerSent = true;
        controller.enqueue(encoder.encode([...csvLines([header], { delimiter })].join("")));
        cursor = sql<{ numbers: (number | null)[]; texts: (string | null)[] | null }[]>`
          select numbers, texts from dataset_rows where dataset_id = ${dataset.id} order by row_number`
          .cursor(2000)
          [Symbol.asyncIterator]();
        return;
      }
      const next = await cursor!.next();
      if (next.done) {
        controller.close();
        return;
      }
      const rows: CsvCell[][] = next.value.map((r) => {
        const cells: CsvCell[] = new Array(n);
        for (let k = 0; k < n; k++) {
          // postgres.js reads a NULL element of a float8[] as NaN (or null)
          const x = r.numbers[k];
          cells[k] = x !== null && x !== undefined && !Number.isNaN(Number(x)) ? Number(x) : (r.texts?.[k] ?? null);
        }
        return cells;
      });
      controller.enqueue(encoder.encode([...csvLines(rows, { delimiter })].join("")));
    },
    async cancel() {
      await cursor?.return?.();
    },
  });
  const base = dataset.originalFilename.replace(/\.(csv|tsv|txt)$/i, "") || "spend-history";
  return { filename: `${base}-rows.csv`, body };
}
