// `npm run bench`: every benchmark, one table. Starts its own throwaway Tributary (bench/lib/stack.ts:
// PostgreSQL on a free port in .data-bench, build in .data-bench/next, app on a free port, seeded) — it
// needs no running `npm start` — and stops it at the end. Benchmarks are scripts: they print what they
// measure and assert nothing (the machine is shared; the load average is printed with the table).
//
//   npm run bench [-- --only=fit,upload,predict,slider,bundle,memory] [-- --quick] [-- --serve]
//
// Rows (targets from the issues; budgets marked "budget" are ours, see the scripts):
//   fit      bench/fit.ts child processes: 1,000,000 × 20 solve / full inference / peak memory vs ml-matrix QR
//   upload   bench/upload.ts --json: 1,000,000-row CSV end to end vs raw COPY (a database of the same cluster)
//   predict  bench/predict.ts --json: predict route req/s, p50, p99 vs GET /api/ping, 10 connections
//   slider   bench/slider-latency.ts: Playwright marks allocation-input → interval-redrawn, p95 over ≥ 100 moves
//   bundle   bench/bundle-size.ts: first-load JS per page from the build's manifests
//   memory   bench/memory.ts: web server RSS under a mixed load vs idle
// --quick: smaller runs for trying the harness (100,000-row fit and upload, 5 s load); not the figures to quote.
import { loadavg } from "node:os";
import { pgEnv } from "../scripts/stack";
import { bundleRows } from "./bundle-size";
import { runChild, tail } from "./lib/child";
import { type BenchRow, fmt, formatTable, lastJsonLine, notMeasured } from "./lib/result";
import { slowFloorNote, PREDICT_P99_TARGET_MS } from "./lib/floor-note";
import { startBenchStack, type BenchStack } from "./lib/stack";
import { memoryUnderLoad } from "./memory";
import { sliderLatency } from "./slider-latency";

const all = ["bundle", "fit", "upload", "predict", "slider", "memory"] as const;
type Bench = (typeof all)[number];

const args = process.argv.slice(2);
const quick = args.includes("--quick");
const onlyArg = args.find((arg) => arg.startsWith("--only="));
const selected = new Set<Bench>(onlyArg ? (onlyArg.slice("--only=".length).split(",") as Bench[]) : all);
for (const name of selected) if (!all.includes(name)) throw new Error(`unknown benchmark ${name}; choose from ${all.join(", ")}`);

const TSX = ["--import", "tsx"];
const SERVER = ["--conditions=react-server", ...TSX];

// --- fit ------------------------------------------------------------------------------------------------

interface EngineResult {
  solveSeconds: number;
  solveCpuSeconds: number;
  fullSeconds: number;
  fullCpuSeconds: number;
  solvePeakMegabytes: number;
  fullPeakMegabytes: number;
}
interface BaselineResult {
  seconds: number;
  cpuSeconds: number;
  peakMegabytes: number;
}

async function fitRows(): Promise<BenchRow[]> {
  const rows = quick ? 100_000 : 1_000_000;
  const p = 20;
  const label = `fit ${fmt.int(rows)} × ${p}`;
  const child = (mode: string, repetitions: number) =>
    runChild("fit", ["--expose-gc", ...TSX, "bench/fit.ts", "--child", mode, String(rows), String(p), String(repetitions)]);
  const engineRun = await child("engine", 3);
  const engine = lastJsonLine<EngineResult>(engineRun.output);
  if (engineRun.code !== 0 || !engine) return [notMeasured(`${label}: solve`, "≤ 0.7 s", `bench/fit.ts failed: ${tail(engineRun.output)}`)];
  const baselineRun = await child("ml-matrix", 1);
  const baseline = baselineRun.code === 0 ? lastJsonLine<BaselineResult>(baselineRun.output) : null;
  const dataMegabytes = (rows * (p + 1) * 8) / (1024 * 1024);
  const speedUp = baseline ? baseline.seconds / engine.solveSeconds : NaN;
  const baselineText = baseline ? `ml-matrix QR ${fmt.seconds(baseline.seconds)}` : "ml-matrix failed";
  return [
    {
      name: `${label}: solve (best of 3)`,
      measured: fmt.seconds(engine.solveSeconds),
      target: "≤ 0.7 s and ≥ 20× baseline",
      baseline: baselineText,
      ratio: baseline ? `${speedUp.toFixed(1)}× faster` : "",
      met: baseline ? engine.solveSeconds <= 0.7 && speedUp >= 20 : null,
      note: `CPU ${fmt.seconds(engine.solveCpuSeconds)}${baseline ? `; ml-matrix CPU ${fmt.seconds(baseline.cpuSeconds)}` : ""}`,
    },
    {
      name: `${label}: full inference + diagnostics`,
      measured: fmt.seconds(engine.fullSeconds),
      target: "≤ 1.5 s",
      baseline: baselineText,
      ratio: baseline ? `${(baseline.seconds / engine.fullSeconds).toFixed(1)}× faster` : "",
      met: engine.fullSeconds <= 1.5,
      note: `CPU ${fmt.seconds(engine.fullCpuSeconds)}`,
    },
    {
      name: `${label}: peak memory of the solve`,
      measured: `${fmt.int(engine.solvePeakMegabytes)} MB over the data`,
      target: "≤ 1.2× data",
      baseline: `data ${fmt.int(dataMegabytes)} MB${baseline ? `; ml-matrix +${fmt.int(baseline.peakMegabytes)} MB` : ""}`,
      ratio: `${((dataMegabytes + engine.solvePeakMegabytes) / dataMegabytes).toFixed(2)}× data`,
      met: (dataMegabytes + engine.solvePeakMegabytes) / dataMegabytes <= 1.2,
      note: `full inference: +${fmt.int(engine.fullPeakMegabytes)} MB (its six n-length diagnostic arrays included)`,
    },
  ];
}

// --- upload ---------------------------------------------------------------------------------------------

async function uploadRows(stack: BenchStack): Promise<BenchRow[]> {
  const rows = quick ? 100_000 : 1_000_000;
  const name = `upload ${fmt.int(rows)} rows × 12 columns`;
  const created = await stack.supervisor.run({ name: "createdb-upload", command: "bash", args: ["scripts/pg.sh", "createdb", "bench_upload"], env: pgEnv(stack.stack) });
  if (created !== 0) return [notMeasured(name, "≥ 60% of raw COPY", "could not create database bench_upload")];
  const url = stack.databaseUrl.replace(/\/tributary$/, "/bench_upload");
  const run = await runChild("upload", [...SERVER, "bench/upload.ts", "--json"], { DATABASE_URL: url, BENCH_ROWS: String(rows), BENCH_ROUNDS: quick ? "1" : "3" });
  const result = lastJsonLine<{ endToEndRowsPerSecond: number; rawCopyRowsPerSecond: number; ratio: number; rounds: number }>(run.output);
  if (run.code !== 0 || !result) return [notMeasured(name, "≥ 60% of raw COPY", `bench/upload.ts failed: ${tail(run.output)}`)];
  return [
    {
      name: `${name} (median of ${result.rounds})`,
      measured: `${fmt.int(result.endToEndRowsPerSecond)} rows/s`,
      target: "≥ 60% of raw COPY",
      baseline: `raw COPY ${fmt.int(result.rawCopyRowsPerSecond)} rows/s`,
      ratio: fmt.percent(result.ratio),
      met: result.ratio >= 0.6,
    },
  ];
}

// --- predict --------------------------------------------------------------------------------------------

type Summary = { requestsPerSecond: number; p50: number; p99: number; non2xx: number; requests: number };

async function predictRows(stack: BenchStack): Promise<BenchRow[]> {
  const run = await runChild("predict", [...SERVER, "bench/predict.ts", "--json"], {
    BASE_URL: stack.baseUrl,
    DATABASE_URL: stack.databaseUrl,
    ...(quick ? { DURATION: "5", ROUNDS: "1" } : {}),
  });
  const result = lastJsonLine<{ connections: number; ping: Summary; predict: Summary; ratio: number }>(run.output);
  if (run.code !== 0 || !result) return [notMeasured("predict route", `≥ 90% of GET /api/ping; p99 ≤ ${PREDICT_P99_TARGET_MS} ms`, `bench/predict.ts failed: ${tail(run.output)}`)];
  const { ping, predict } = result;
  const failures = predict.non2xx > 0 ? `${predict.non2xx} of ${fmt.int(predict.requests)} predict answers not 2xx` : undefined;
  return [
    {
      name: `predict route throughput (${result.connections} connections)`,
      measured: `${fmt.int(predict.requestsPerSecond)} req/s`,
      target: "≥ 90% of baseline",
      baseline: `GET /api/ping ${fmt.int(ping.requestsPerSecond)} req/s`,
      ratio: fmt.percent(result.ratio),
      met: result.ratio >= 0.9 && predict.non2xx === 0,
      note: failures,
    },
    {
      name: "predict route p50",
      measured: fmt.ms(predict.p50),
      target: "",
      baseline: `GET /api/ping ${fmt.ms(ping.p50)}`,
      ratio: fmt.times(predict.p50 / Math.max(ping.p50, 0.001)),
      met: null,
    },
    {
      name: "predict route p99",
      measured: fmt.ms(predict.p99),
      target: `≤ ${PREDICT_P99_TARGET_MS} ms`,
      baseline: `GET /api/ping ${fmt.ms(ping.p99)}`,
      ratio: fmt.times(predict.p99 / Math.max(ping.p99, 0.001)),
      met: predict.p99 <= PREDICT_P99_TARGET_MS,
      note: slowFloorNote(ping),
    },
  ];
}

// --- the run --------------------------------------------------------------------------------------------

async function guarded(name: string, run: () => Promise<BenchRow[]>, target = ""): Promise<BenchRow[]> {
  const started = Date.now();
  console.log(`[bench] ${name}…`);
  try {
    const rows = await run();
    console.log(`[bench] ${name} done in ${Math.round((Date.now() - started) / 1000)} s`);
    return rows;
  } catch (error) {
    console.log(`[bench] ${name} failed: ${error instanceof Error ? error.message : String(error)}`);
    return [notMeasured(name, target, error instanceof Error ? error.message.split("\n")[0] : String(error))];
  }
}

/** `--serve`: start the throwaway stack and keep it running (for trying a benchmark by hand); Ctrl-C stops it. */
async function serve(): Promise<number> {
  const stack = await startBenchStack();
  console.log(`[bench] serving: BASE_URL=${stack.browserUrl} DATABASE_URL=${stack.databaseUrl} WEB_PID=${stack.webPid()} (Ctrl-C stops it)`);
  return new Promise<number>(() => {});
}

async function main(): Promise<number> {
  if (args.includes("--serve")) return serve();
  const startedAt = Date.now();
  const loadBefore = loadavg();
  const rows: BenchRow[] = [];
  let stack: BenchStack | null = null;
  const needsStack = [...selected].some((name) => name !== "fit");
  try {
    if (needsStack) stack = await startBenchStack();
    // The fit runs first, while the app idles: it is pure CPU and memory.
    if (selected.has("fit")) rows.push(...(await guarded("fit", fitRows, "≤ 0.7 s")));
    if (stack) {
      const s = stack;
      if (selected.has("upload")) rows.push(...(await guarded("upload", () => uploadRows(s), "≥ 60% of raw COPY")));
      if (selected.has("predict")) rows.push(...(await guarded("predict", () => predictRows(s), "≥ 90% of ping")));
      if (selected.has("slider")) rows.push(...(await guarded("slider", () => sliderLatency({ baseUrl: s.browserUrl, databaseUrl: s.databaseUrl }), "p95 ≤ 50 ms")));
      if (selected.has("memory")) {
        rows.push(...(await guarded("memory", () => memoryUnderLoad({ baseUrl: s.baseUrl, databaseUrl: s.databaseUrl, webPid: s.webPid(), ...(quick ? { duration: 5 } : {}) }), "≤ 512 MB")));
      }
      if (selected.has("bundle")) rows.push(...(await guarded("bundle", async () => bundleRows(s.distDir), "≤ 170 kB gz")));
    }
  } catch (error) {
    rows.push(notMeasured("(stack)", "", `the throwaway app did not start: ${error instanceof Error ? error.message : String(error)}`));
  } finally {
    await stack?.stop();
  }
  const loadAfter = loadavg();
  console.log("");
  console.log(`npm run bench${quick ? " --quick (NOT the figures to quote)" : ""} — ${new Date().toISOString()}, ${Math.round((Date.now() - startedAt) / 1000)} s;` +
    ` load average ${loadBefore[0].toFixed(1)} before, ${loadAfter[0].toFixed(1)} after (other work on this machine slows every figure)`);
  console.log(formatTable(rows));
  const missed = rows.filter((row) => row.met === false).length;
  const unmeasured = rows.filter((row) => row.measured === "—").length;
  console.log(`\n${rows.length} rows: ${rows.filter((row) => row.met === true).length} targets met, ${missed} missed, ${unmeasured} not measured`);
  return unmeasured > 0 ? 1 : 0;
}

main().then(
  (code) => process.exit(code),
  (error: unknown) => {
    console.error(error);
    process.exit(1);
  },
);
