// `npm run bench:upload` (second part): a 1,000,000-row × 12-column CSV uploaded END TO END the way the
// browser does it — the real `POST /api/datasets` route handler (Bearer token, raw text/csv body with its
// Content-Length) streams the body into PostgreSQL staging and queues a dataset.ingest job; a real worker
// process (server/jobs/worker.ts, pg-boss) follows the staged chunks while they arrive, parses, validates
// and COPYs them in one transaction. The clock stops when the job run is "succeeded" (the dataset
// committed). In the same run: a raw `COPY … FROM STDIN (FORMAT csv)` of the same file into a plain table.
// Prints both rates and their ratio per round, then the medians; also when the route answered (202), the
// job's own span, the CPU of the web process and of the worker, and the web process's event-loop delay
// while the worker ingested (the web server keeps answering: parsing is not done there).
//
// The route handler is imported as Next runs it, so this runs without the react-server condition, with
// `server-only` mapped to an empty module (bench/tsconfig.route.json):
//   tsx --tsconfig bench/tsconfig.route.json bench/upload-route.ts
// Needs PostgreSQL: DATABASE_URL when set (migrated here), else a throwaway cluster (scripts/pg.sh) in a
// temporary folder, stopped and deleted at the end. Environment: BENCH_ROWS (default 1000000),
// BENCH_ROUNDS (default 3), BENCH_WARMUP (rounds run first and not counted, default 1), BENCH_PG_PORT, BENCH_PG_DATA (the data folder of DATABASE_URL's cluster, to count
// its CPU), BENCH_KEEP_FILE=1, BENCH_WORKER_CPU_PROF=<folder> (the worker writes a V8 .cpuprofile there
// when it stops). `--json` adds one machine-readable line.
import { spawn, type ChildProcess } from "node:child_process";
import { once } from "node:events";
import { createReadStream, mkdtempSync, rmSync, statSync } from "node:fs";
import { loadavg, tmpdir } from "node:os";
import { join } from "node:path";
import { monitorEventLoopDelay } from "node:perf_hooks";
import { Readable, type Writable } from "node:stream";
import { drizzle } from "drizzle-orm/postgres-js";
import { migrate } from "drizzle-orm/postgres-js/migrator";
import postgres from "postgres";
import { WORKER_NODE_FLAGS } from "../scripts/worker-flags";
import { busiestBetween, clusterCpu, cpuBetween, fmt, freePort, generate, HEADER, median, processCpu, ROOT, ROUNDS, ROWS, SPEND, startThrowawayCluster } from "./lib/upload-common";



/** The real worker process, as `npm start` runs it; resolves once it takes jobs. */
async function startWorker(url: string): Promise<ChildProcess> {
  const child = spawn(process.execPath, [...(process.env.BENCH_WORKER_CPU_PROF ? ["--cpu-prof", `--cpu-prof-dir=${process.env.BENCH_WORKER_CPU_PROF}`] : []), ...WORKER_NODE_FLAGS, "--conditions=react-server", "--import", "tsx", "server/jobs/worker.ts"], {
    cwd: ROOT,
    env: { ...process.env, DATABASE_URL: url },
    stdio: ["ignore", "pipe", "pipe"],
  });
  let output = "";
  await new Promise<void>((resolve, reject) => {
    const timer = setTimeout(() => reject(new Error(`the worker did not start:\n${output}`)), 120_000);
    const onData = (chunk: Buffer) => {
      output += chunk.toString();
      if (output.includes("[worker] taking")) {
        clearTimeout(timer);
        resolve();
      }
    };
    child.stdout!.on("data", onData);
    child.stderr!.on("data", onData);
    child.once("exit", (code) => reject(new Error(`the worker exited (${code}):\n${output}`)));
  });
  child.stdout!.on("data", (chunk: Buffer) => process.env.BENCH_VERBOSE && process.stdout.write(chunk));
  child.stderr!.on("data", (chunk: Buffer) => process.stderr.write(chunk));
  return child;
}

const sleep = (ms: number) => new Promise((resolve) => setTimeout(resolve, ms));
const WARMUP_ROUNDS = Number(process.env.BENCH_WARMUP ?? 1);

async function main() {
  const dir = mkdtempSync(join(tmpdir(), "tributary-bench-route-"));
  let cluster: { url: string; stop: () => void; dataDir: string } | null = null;
  let worker: ChildProcess | null = null;
  try {
    if (!process.env.DATABASE_URL) {
      console.log("DATABASE_URL not set: starting a throwaway PostgreSQL with scripts/pg.sh");
      cluster = startThrowawayCluster(dir, await freePort());
      process.env.DATABASE_URL = cluster.url;
    }
    const url = process.env.DATABASE_URL!;
    // PostgreSQL's CPU is measured when its data folder is known (a throwaway cluster, or BENCH_PG_DATA)
    const pgData = cluster?.dataDir ?? process.env.BENCH_PG_DATA ?? null;
    const pgCpu = () => (pgData ? clusterCpu(pgData) : new Map<number, number>());
    const admin = postgres(url, { max: 2, onnotice: () => {} });
    await migrate(drizzle(admin), { migrationsFolder: join(ROOT, "db/migrations") });

    // imported after DATABASE_URL is known (the pools read it)
    const { POST } = await import("@/app/api/datasets/route");
    const { createApiToken } = await import("@/server/data/api-tokens");
    const { deleteDataset } = await import("@/server/datasets/store");
    const { getDatabase } = await import("@/db/client");
    const { getQueue } = await import("@/server/jobs/queue");

    const file = join(dir, "history.csv");
    let t = performance.now();
    await generate(file, ROWS);
    const bytes = statSync(file).size;
    console.log(`generated ${fmt(ROWS)} rows × ${HEADER.length} columns, ${(bytes / 1048576).toFixed(1)} MB in ${((performance.now() - t) / 1000).toFixed(1)} s`);

    const [workspace] = await admin<{ id: string }[]>`
      insert into workspaces (name, slug) values ('Upload route benchmark', ${`bench-route-${Date.now()}`}) returning id`;
    const [user] = await admin<{ id: string }[]>`
      insert into "user" (id, email, name) values (${crypto.randomUUID()}, ${`bench-${Date.now()}@bench.example`}, 'Bench Analyst') returning id`;
    await admin`insert into memberships (workspace_id, user_id, roles) values (${workspace.id}, ${user.id}, ${["analyst"]})`;
    const { token } = await createApiToken({ workspaceId: workspace.id, userId: user.id, name: "bench:upload route", expiresAt: null });
    const roles = Object.fromEntries([
      ["date", { role: "period" }],
      ["sales", { role: "outcome", unit: "EUR" }],
      ...SPEND.map((s) => [s, { role: "spend", unit: "EUR" }]),
      ["price", { role: "control", unit: "EUR" }],
      ["temperature", { role: "control", unit: "°C" }],
    ]);
    const query = new URLSearchParams({ filename: "history.csv", options: JSON.stringify({ roles }) });

    worker = await startWorker(url);
    console.log(`worker started (pid ${worker.pid}); load average: ${loadavg().map((x) => x.toFixed(2)).join(" ")} (other work on this machine slows both measurements)`);

    type Measured = { seconds: number; note: string; cleanup: () => Promise<void> };

    async function endToEnd(): Promise<Measured> {
      await admin`checkpoint`;
      // the other snapshots first: reading /proc is not the web process's work
      const worker0 = processCpu(worker!.pid!);
      const pg0 = pgCpu();
      const web0 = process.cpuUsage();
      const start = performance.now();
      const request = new Request(`http://localhost/api/datasets?${query}`, {
        method: "POST",
        headers: { authorization: `Bearer ${token}`, "content-type": "text/csv", "content-length": String(bytes) },
        body: Readable.toWeb(createReadStream(file, { highWaterMark: 1 << 20 })) as unknown as ReadableStream<Uint8Array>,
        duplex: "half",
      } as RequestInit);
      const response = await POST(request, { params: Promise.resolve({}) });
      const answered = (performance.now() - start) / 1000;
      const body = (await response.json()) as { job?: { id: string }; error?: string };
      if (response.status !== 202 || !body.job) throw new Error(`the route answered ${response.status}: ${JSON.stringify(body).slice(0, 500)}`);
      // the web process from here on only waits: how late do its timers fire while the worker ingests?
      const delay = monitorEventLoopDelay({ resolution: 10 });
      delay.enable();
      let run: { status: string; result: { datasetId: string; rowCount: number } | null; error: unknown; started_at: string; finished_at: string } | undefined;
      for (;;) {
        [run] = await admin`select status, result, error, started_at::text, finished_at::text from job_runs where id = ${body.job.id}`;
        if (run && (run.status === "succeeded" || run.status === "failed")) break;
        await sleep(20);
      }
      const seconds = (performance.now() - start) / 1000;
      delay.disable();
      if (run.status !== "succeeded" || !run.result) throw new Error(`the job failed: ${JSON.stringify(run.error).slice(0, 500)}`);
      if (run.result.rowCount !== ROWS) throw new Error(`stored ${run.result.rowCount} rows`);
      const web = process.cpuUsage(web0);
      const workerCpu = processCpu(worker!.pid!) - worker0;
      const pg1 = pgCpu();
      const pg = cpuBetween(pg0, pg1);
      const pgBusiest = busiestBetween(pg0, pg1);
      const jobSpan = (Date.parse(run.finished_at) - Date.parse(run.started_at)) / 1000;
      const datasetId = run.result.datasetId;
      return {
        seconds,
        note:
          `202 after ${answered.toFixed(2)} s, job ran ${jobSpan.toFixed(2)} s; CPU web ${((web.user + web.system) / 1e6).toFixed(1)} s, worker ${workerCpu.toFixed(1)} s, PostgreSQL ${Number.isNaN(pg) ? "?" : `${pg.toFixed(1)} s (busiest backend ${pgBusiest.toFixed(1)} s)`}; ` +
          `web event-loop delay after the 202: p99 ${(delay.percentile(99) / 1e6).toFixed(0)} ms, max ${(delay.max / 1e6).toFixed(0)} ms`,
        cleanup: async () => {
          await deleteDataset({ workspaceId: workspace.id, datasetId });
          await admin`vacuum dataset_rows`;
          await admin`vacuum dataset_files`;
        },
      };
    }

    async function rawCopy(): Promise<Measured> {
      await admin`drop table if exists bench_raw_copy`;
      await admin.unsafe(`create table bench_raw_copy (date text, ${HEADER.slice(1).map((h) => `${h} float8`).join(", ")})`);
      await admin`checkpoint`;
      const pg0 = pgCpu();
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
      const pg1 = pgCpu();
      const pg = cpuBetween(pg0, pg1);
      return {
        seconds,
        note: Number.isNaN(pg) ? "" : `raw COPY: CPU PostgreSQL ${pg.toFixed(1)} s (busiest backend ${busiestBetween(pg0, pg1).toFixed(1)} s)`,
        cleanup: async () => {
          const [{ n }] = await admin<{ n: number }[]>`select count(*)::int as n from bench_raw_copy`;
          if (n !== ROWS) throw new Error(`raw COPY stored ${n} rows`);
          await admin`drop table bench_raw_copy`;
        },
      };
    }

    // A round first that is not counted (both paths): the route's, the worker's and the COPY encoder's
    // code runs for the first time there and the JIT compiles it, which a server that has been up for
    // a while has long done; the first round was 3-5 points lower than the rest.
    for (let round = 1; round <= WARMUP_ROUNDS; round++) {
      const warm = await endToEnd();
      await warm.cleanup();
      const cold = await rawCopy();
      await cold.cleanup();
      console.log(`warm-up round (not counted): ratio ${((100 * cold.seconds) / warm.seconds).toFixed(0)}%`);
    }

    const ours: number[] = [];
    const raw: number[] = [];
    for (let round = 1; round <= ROUNDS; round++) {
      // alternate the order so neither always runs on a warmer (or busier) machine
      const order = round % 2 === 1 ? (["raw", "ours"] as const) : (["ours", "raw"] as const);
      const notes: string[] = [];
      for (const which of order) {
        const measured = which === "raw" ? await rawCopy() : await endToEnd();
        (which === "raw" ? raw : ours).push(measured.seconds);
        if (measured.note) notes.push(measured.note);
        await measured.cleanup();
      }
      const note = notes.join("\n  ");
      const o = ROWS / ours[ours.length - 1];
      const r = ROWS / raw[raw.length - 1];
      console.log(
        `round ${round}: route → staging → worker → COPY ${fmt(o)} rows/s (${ours[ours.length - 1].toFixed(2)} s), raw COPY ${fmt(r)} rows/s (${raw[raw.length - 1].toFixed(2)} s), ratio ${((100 * o) / r).toFixed(0)}%\n  ${note}`,
      );
    }
    const o = ROWS / median(ours);
    const r = ROWS / median(raw);
    console.log(`median of ${ROUNDS}: end to end through the route ${fmt(o)} rows/s, raw COPY ${fmt(r)} rows/s, ratio ${((100 * o) / r).toFixed(0)}% (target ≥ 60%)`);
    console.log(`load average after: ${loadavg().map((x) => x.toFixed(2)).join(" ")}`);
    if (process.argv.includes("--json")) console.log(JSON.stringify({ rows: ROWS, rounds: ROUNDS, routeEndToEndRowsPerSecond: o, rawCopyRowsPerSecond: r, ratio: o / r }));

    await admin`delete from workspaces where id = ${workspace.id}`;
    await admin`delete from "user" where id = ${user.id}`;
    await (await getQueue()).stop({ graceful: false, wait: true }).catch(() => {});
    await admin.end();
    await getDatabase().sql.end();
  } finally {
    if (worker && worker.exitCode === null) {
      worker.kill("SIGTERM");
      await Promise.race([once(worker, "exit"), sleep(15_000)]);
    }
    if (cluster) cluster.stop();
    if (!process.env.BENCH_KEEP_FILE) rmSync(dir, { recursive: true, force: true });
    else console.log(`kept ${dir}`);
  }
}

main()
  .then(() => process.exit(0))
  .catch((error) => {
    console.error(error);
    process.exit(1);
  });
