// What both upload benchmarks share (bench/upload.ts: createDataset; bench/upload-route.ts: the route and the
// worker): the generated file, a throwaway PostgreSQL cluster, CPU read from /proc, and the figures' format.
import { execFileSync } from "node:child_process";
import { once } from "node:events";
import { createWriteStream, readdirSync, readFileSync } from "node:fs";
import { join } from "node:path";
import { freePort as freePortOutsideReserved } from "../../scripts/free-port";

export const ROWS = Number(process.env.BENCH_ROWS ?? 1_000_000);
export const ROUNDS = Number(process.env.BENCH_ROUNDS ?? 3);
export const ROOT = new URL("../..", import.meta.url).pathname;
export const SPEND = ["tv", "radio", "search", "social", "display", "video", "print", "ooh"];
export const HEADER = ["date", "sales", ...SPEND, "price", "temperature"];

/** mulberry32: a small seeded generator, so every run writes the same file. */
function random(seed: number) {
  return () => {
    seed = (seed + 0x6d2b79f5) | 0;
    let t = Math.imul(seed ^ (seed >>> 15), 1 | seed);
    t = (t + Math.imul(t ^ (t >>> 7), 61 | t)) ^ t;
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };
}

/** The benchmark file: `rows` weekly rows of 8 spend channels, 2 controls and the outcome (12 columns). */
export async function generate(path: string, rows: number): Promise<void> {
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

/** BENCH_PG_PORT, else a free port outside the ones npm start and npm test use. */
export const freePort = () => freePortOutsideReserved(process.env.BENCH_PG_PORT);

export function startThrowawayCluster(dir: string, port: string): { url: string; stop: () => void; dataDir: string } {
  const env = { ...process.env, PGDATA_DIR: join(dir, "pg"), PGPORT: port, PGSOCK_DIR: join(dir, "sock"), PGLOG: join(dir, "pg.log") };
  const pg = (...args: string[]) => execFileSync("bash", [join(ROOT, "scripts/pg.sh"), ...args], { env, stdio: ["ignore", "ignore", "inherit"] });
  pg("start");
  pg("createdb", "bench");
  return { url: `postgres://postgres@127.0.0.1:${port}/bench`, stop: () => pg("stop"), dataDir: join(dir, "pg") };
}

let ticksPerSecond: number | null = null;
/** Clock ticks per second of /proc's CPU times (asked once: a child process costs CPU of its own). */
function clockTicks(): number {
  ticksPerSecond ??= Number(execFileSync("getconf", ["CLK_TCK"]).toString().trim()) || 100;
  return ticksPerSecond;
}

/** CPU seconds (user + system) a process has used, from /proc. */
export function processCpu(pid: number): number {
  try {
    const stat = readFileSync(`/proc/${pid}/stat`, "utf8");
    const fields = stat.slice(stat.lastIndexOf(")") + 2).split(" ");
    const ticks = clockTicks();
    return (Number(fields[11]) + Number(fields[12])) / ticks;
  } catch {
    return Number.NaN;
  }
}

/** CPU seconds used so far by each process of a PostgreSQL cluster: its postmaster and every child. */
export function clusterCpu(dataDir: string): Map<number, number> {
  const out = new Map<number, number>();
  let postmaster: number;
  try {
    postmaster = Number(readFileSync(join(dataDir, "postmaster.pid"), "utf8").split("\n")[0]);
  } catch {
    return out;
  }
  const ticks = clockTicks();
  for (const entry of readdirSync("/proc")) {
    if (!/^\d+$/.test(entry)) continue;
    let stat: string;
    try {
      stat = readFileSync(`/proc/${entry}/stat`, "utf8");
    } catch {
      continue;
    }
    const fields = stat.slice(stat.lastIndexOf(")") + 2).split(" ");
    if (Number(entry) === postmaster || Number(fields[1]) === postmaster) out.set(Number(entry), (Number(fields[11]) + Number(fields[12])) / ticks);
  }
  return out;
}

/** CPU between two snapshots of the processes alive at the second (exited ones were idle connections). */
export function cpuBetween(before: Map<number, number>, after: Map<number, number>): number {
  if (after.size === 0) return Number.NaN;
  let total = 0;
  for (const [pid, cpu] of after) total += cpu - (before.get(pid) ?? 0);
  return total;
}

/** The CPU of the busiest single PostgreSQL process between two snapshots (one backend runs on one core). */
export function busiestBetween(before: Map<number, number>, after: Map<number, number>): number {
  let most = Number.NaN;
  for (const [pid, cpu] of after) {
    const used = cpu - (before.get(pid) ?? 0);
    if (!(used <= most)) most = used;
  }
  return most;
}

export const median = (xs: number[]) => {
  const sorted = [...xs].sort((a, b) => a - b);
  const mid = Math.floor(sorted.length / 2);
  return sorted.length % 2 ? sorted[mid] : (sorted[mid - 1] + sorted[mid]) / 2;
};
export const fmt = (n: number) => Math.round(n).toLocaleString("en-US");
