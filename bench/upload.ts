// `npm run bench:upload`: rows per second of a 1,000,000-row × 12-column CSV upload, end to end
// (a route handler's Request body → Readable.fromWeb → createDataset: read, parse, validate, binary COPY,
// original file, columns, COMMIT), and in the same run a raw `COPY … FROM STDIN (FORMAT csv)` of the same
// file into a plain 12-column table. Prints both rates and their ratio for each round, then the medians.
//
// Needs PostgreSQL: DATABASE_URL when set (migrated with db/migrations first), otherwise a throwaway
// cluster started with scripts/pg.sh in a temporary folder (port BENCH_PG_PORT, default a free one), stopped
// and deleted at the end. Default server settings (fsync on) in both cases. Environment: BENCH_ROWS
// (default 1000000), BENCH_ROUNDS (default 3), BENCH_KEEP_FILE=1 keeps the generated CSV.
import { execFileSync } from "node:child_process";
import { createReadStream, createWriteStream, mkdtempSync, readdirSync, readFileSync, rmSync, statSync } from "node:fs";
import { loadavg, tmpdir } from "node:os";
import { join } from "node:path";
import { Readable, type Writable } from "node:stream";
import { once } from "node:events";
import { drizzle } from "drizzle-orm/postgres-js";
import { migrate } from "drizzle-orm/postgres-js/migrator";
import postgres from "postgres";
import { freePort as freePortOutsideReserved } from "../scripts/free-port";

const ROWS = Number(process.env.BENCH_ROWS ?? 1_000_000);
const ROUNDS = Number(process.env.BENCH_ROUNDS ?? 3);
const ROOT = new URL("..", import.meta.url).pathname;
const SPEND = ["tv", "radio", "search", "social", "display", "video", "print", "ooh"];
const HEADER = ["date", "sales", ...SPEND, "price", "temperature"];

/** mulberry32: a small seeded generator, so every run writes the same file. */
function random(seed: number) {
  return () => {
    seed = (seed + 0x6d2b79f5) | 0;
    let t = Math.imul(seed ^ (seed >>> 15), 1 | seed);
    t = (t + Math.imul(t ^ (t >>> 7), 61 | t)) ^ t;
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };
}

async function generate(path: string, rows: number): Promise<void> {
  const out = createWriteStream(path);
  const next = random(20261201);
  const day0 = Date.UTC(1990, 0, 1);
  let text = HEADER.join(",") + "\n";
  for (let i = 0; i < rows; i++) {
    const date = new Date(day0 + i * 86_400_000).toISOString().slice(0, 10);
    let sales = 5000;
    let line = "";
    for (let s = 0; s < SPEND.length; s++) {
      const spend = next() * 10_000 * (1 + s / 4);
      sales += spend * (0.2 + s / 20);
      line += "," + spend.toFixed(2);
    }
    const price = 8 + next() * 4;
    const temperature = -10 + next() * 40;
    sales += -300 * price + 20 * temperature + next() * 1000;
    text += `${date},${sales.toFixed(2)}${line},${price.toFixed(3)},${temperature.toFixed(1)}\n`;
    if (text.length > 1 << 20) {
      if (!out.write(text)) await once(out, "drain");
      text = "";
    }
  }
  out.end(text);
  await once(out, "finish");
}

const freePort = () => freePortOutsideReserved(process.env.BENCH_PG_PORT);

/** CPU seconds used so far by each process of a PostgreSQL cluster: its postmaster and every child. */
function clusterCpu(dataDir: string): Map<number, number> {
  const postmaster = Number(readFileSync(join(dataDir, "postmaster.pid"), "utf8").split("\n")[0]);
  const ticks = Number(execFileSync("getconf", ["CLK_TCK"]).toString().trim()) || 100;
  const out = new Map<number, number>();
  for (const entry of readdirSync("/proc")) {
    if (!/^\d+$/.test(entry)) continue;
    let stat: string;
    try {
      stat = readFileSync(`/proc/${entry}/stat`, "utf8");
    } catch {
      continue;
    }
    const fields = stat.slice(stat.lastIndexOf(")") + 2).split(" ");
    const ppid = Number(fields[1]);
    if (Number(entry) === postmaster || ppid === postmaster) out.set(Number(entry), (Number(fields[11]) + Number(fields[12])) / ticks);
  }
  return out;
}

/** CPU used between two snapshots by the processes alive at the second (exited ones were idle connections). */
function cpuBetween(before: Map<number, number>, after: Map<number, number>): number {
  let total = 0;
  for (const [pid, cpu] of after) total += cpu - (before.get(pid) ?? 0);
  return total;
}

function startThrowawayCluster(dir: string, port: string): { url: string; stop: () => void; dataDir: string } {
  const env = { ...process.env, PGDATA_DIR: join(dir, "pg"), PGPORT: port, PGSOCK_DIR: join(dir, "sock"), PGLOG: join(dir, "pg.log") };
  const pg = (...args: string[]) => execFileSync("bash", [join(ROOT, "scripts/pg.sh"), ...args], { env, stdio: ["ignore", "ignore", "inherit"] });
  pg("start");
  pg("createdb", "bench");
  return { url: `postgres://postgres@127.0.0.1:${port}/bench`, stop: () => pg("stop"), dataDir: join(dir, "pg") };
}

const median = (xs: number[]) => {
  const sorted = [...xs].sort((a, b) => a - b);
  const mid = Math.floor(sorted.length / 2);
  return sorted.length % 2 ? sorted[mid] : (sorted[mid - 1] + sorted[mid]) / 2;
};
const fmt = (n: number) => Math.round(n).toLocaleString("en-US");

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
