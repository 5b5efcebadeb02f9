// `npm run bench:upload`: rows per second of a 1,000,000-row × 12-column CSV upload, end to end
// (a route handler's Request body → Readable.fromWeb → createDataset: read, parse, validate, binary COPY,
// original file, columns, COMMIT), and in the same run a raw `COPY … FROM STDIN (FORMAT csv)` of the same
// file into a plain 12-column table. Prints both rates and their ratio for each round, then the medians.
//
// Needs PostgreSQL: DATABASE_URL when set (migrated with db/migrations first), otherwise a throwaway
// cluster started with scripts/pg.sh in a temporary folder (port BENCH_PG_PORT, default a free one), stopped
// and deleted at the end. Default server settings (fsync on) in both cases. Environment: BENCH_ROWS
// (default 1000000), BENCH_ROUNDS (default 3), BENCH_KEEP_FILE=1 keeps the generated CSV.
import { createReadStream, mkdtempSync, rmSync, statSync } from "node:fs";
import { loadavg, tmpdir } from "node:os";
import { join } from "node:path";
import { Readable, type Writable } from "node:stream";
import { once } from "node:events";
import { drizzle } from "drizzle-orm/postgres-js";
import { migrate } from "drizzle-orm/postgres-js/migrator";
import postgres from "postgres";
import { clusterCpu, cpuBetween, fmt, freePort, generate, HEADER, median, ROOT, ROUNDS, ROWS, SPEND, startThrowawayCluster } from "./lib/upload-common";



async function main() {
  const dir = mkdtempSync(join(tmpdir(), "tributary-bench-"));
  let cluster: { url: string; stop: () => void; dataDir: string } | null = null;
  try {
    if (!process.env.DATABASE_URL) {
      console.log("DATABASE_URL not set: starting a throwaway PostgreSQL with scripts/pg.sh");
      cluster = startThrowawayCluster(dir, await freePort());
      process.env.DATABASE_URL = cluster.url;
    }
    const url = process.env.DATABASE_URL!;
    const admin = postgres(url, { max: 1, onnotice: () => {} });
    await migrate(drizzle(admin), { migrationsFolder: join(ROOT, "db/migrations") });

    // imported after DATABASE_URL is known (the pool reads it)
    const { createDataset, deleteDataset } = await import("@/server/datasets/store");
    const { getDatabase } = await import("@/db/client");

    const file = join(dir, "history.csv");
    let t = performance.now();
    await generate(file, ROWS);
    const bytes = statSync(file).size;
    console.log(`generated ${fmt(ROWS)} rows × ${HEADER.length} columns, ${(bytes / 1048576).toFixed(1)} MB in ${((performance.now() - t) / 1000).toFixed(1)} s`);
    console.log(`load average before: ${loadavg().map((x) => x.toFixed(2)).join(" ")} (other work on this machine slows both measurements)`);

    const [workspace] = await admin<{ id: string }[]>`
      insert into workspaces (name, slug) values ('Upload benchmark', ${`bench-${Date.now()}`}) returning id`;
    const roles = Object.fromEntries([
      ["date", { role: "period" as const }],
      ["sales", { role: "outcome" as const, unit: "EUR" }],
      ...SPEND.map((s) => [s, { role: "spend" as const, unit: "EUR" }]),
      ["price", { role: "control" as const, unit: "EUR" }],
      ["temperature", { role: "control" as const, unit: "°C" }],
    ]);

    /** What a route handler does with the request body (multipart parsing aside). */
    async function handler(request: Request) {
      return createDataset({
        workspaceId: workspace.id,
        userId: null,
        originalFilename: "history.csv",
        stream: Readable.fromWeb(request.body as import("node:stream/web").ReadableStream<Uint8Array>),
        totalBytes: Number(request.headers.get("content-length")),
        options: { roles },
      });
    }

    async function endToEnd(): Promise<number> {
      await admin`checkpoint`;
      const start = performance.now();
      const request = new Request("http://127.0.0.1/api/datasets", {
        method: "POST",
        headers: { "content-length": String(bytes), "content-type": "text/csv" },
        body: Readable.toWeb(createReadStream(file, { highWaterMark: 1 << 20 })) as unknown as ReadableStream<Uint8Array>,
        duplex: "half",
      } as RequestInit);
      const result = await handler(request);
      const seconds = (performance.now() - start) / 1000;
      if (!result.ok) throw new Error(`the benchmark file was refused: ${result.report.summary}`);
      if (result.dataset.rowCount !== ROWS) throw new Error(`stored ${result.dataset.rowCount} rows`);
      cleanup = async () => {
        await deleteDataset({ workspaceId: workspace.id, datasetId: result.dataset.id });
        await admin`vacuum dataset_rows`;
        await admin`vacuum dataset_files`;
      };
      return seconds;
    }
    let cleanup = async () => {};

    async function rawCopy(): Promise<number> {
      await admin`drop table if exists bench_raw_copy`;
      await admin.unsafe(
        `create table bench_raw_copy (date text, ${HEADER.slice(1)
          .map((h) => `${h} float8`)
          .join(", ")})`,
      );
      await admin`checkpoint`;
      const start = performance.now();
      await admin.begin(async (tx) => {
        const copy = (await tx`copy bench_raw_copy from stdin (format csv, header true)`.writable()) as Writable;
        for await (const chunk of createReadStream(file, { highWaterMark: 1 << 20 })) {
          if (!copy.write(chunk)) await once(copy, "drain");
        }
        copy.end();
        await once(copy, "finish");
      });
      const seconds = (performance.now() - start) / 1000;
      cleanup = async () => {
        const [{ n }] = await admin<{ n: number }[]>`select count(*)::int as n from bench_raw_copy`;
        if (n !== ROWS) throw new Error(`raw COPY stored ${n} rows`);
        await admin`drop table bench_raw_copy`;
      };
      return seconds;
    }

    const ours: number[] = [];
    const raw: number[] = [];
    const cpu = { ours: [] as string[], raw: [] as string[] };
    /** Runs a measurement and notes the CPU seconds it took in this process and in PostgreSQL. */
    const withCpu = async (which: "ours" | "raw", run: () => Promise<number>) => {
      const node0 = process.cpuUsage();
      const pg0 = cluster ? clusterCpu(cluster.dataDir) : null;
      const seconds = await run();
      const node = process.cpuUsage(node0);
      const pg = cluster && pg0 ? cpuBetween(pg0, clusterCpu(cluster.dataDir)) : Number.NaN;
      await cleanup();
      cleanup = async () => {};
      cpu[which].push(`CPU node ${((node.user + node.system) / 1e6).toFixed(1)} s + PostgreSQL ${Number.isNaN(pg) ? "?" : pg.toFixed(1)} s`);
      return seconds;
    };
    for (let round = 1; round <= ROUNDS; round++) {
      // alternate the order so neither always runs on a warmer (or busier) machine
      const first = round % 2 === 1 ? "raw" : "ours";
      for (const which of first === "raw" ? ["raw", "ours"] : ["ours", "raw"]) {
        if (which === "raw") raw.push(await withCpu("raw", rawCopy));
        else ours.push(await withCpu("ours", endToEnd));
      }
      const r = ROWS / raw[raw.length - 1];
      const o = ROWS / ours[ours.length - 1];
      console.log(
        `round ${round}: end to end ${fmt(o)} rows/s (${ours[ours.length - 1].toFixed(2)} s; ${cpu.ours.at(-1)}), ` +
          `raw COPY ${fmt(r)} rows/s (${raw[raw.length - 1].toFixed(2)} s; ${cpu.raw.at(-1)}), ratio ${((100 * o) / r).toFixed(0)}%`,
      );
    }
    const o = ROWS / median(ours);
    const r = ROWS / median(raw);
    console.log(`median of ${ROUNDS}: end to end ${fmt(o)} rows/s, raw COPY ${fmt(r)} rows/s, ratio ${((100 * o) / r).toFixed(0)}% (target ≥ 60%)`);
    console.log(`load average after: ${loadavg().map((x) => x.toFixed(2)).join(" ")}`);
    // `--json`: one machine-readable line for `npm run bench` (bench/index.ts).
    if (process.argv.includes("--json")) console.log(JSON.stringify({ rows: ROWS, rounds: ROUNDS, endToEndRowsPerSecond: o, rawCopyRowsPerSecond: r, ratio: o / r }));

    await admin`delete from workspaces where id = ${workspace.id}`;
    await admin.end();
    await getDatabase().sql.end();
  } finally {
    if (cluster) cluster.stop();
    if (!process.env.BENCH_KEEP_FILE) rmSync(dir, { recursive: true, force: true });
    else console.log(`kept ${dir}`);
  }
}

main().catch((error) => {
  console.error(error);
  process.exit(1);
});
