// A throwaway Tributary for benchmarks: PostgreSQL in .data-bench/pg (default server settings, fsync on),
// migrated and seeded; `next build` into .data-bench/next (its own distDir, so neither `npm start`'s .next
// nor `npm test`'s .next-test is touched); mail sink, worker and web server under the same supervisor as
// `npm start`. Ports are free ones picked at start (BENCH_PG_PORT / BENCH_WEB_PORT / BENCH_SMTP_PORT
// override). Everything is stopped by `stop()`, on Ctrl-C, and on exit.
import { mkdirSync, readdirSync, readFileSync, rmSync } from "node:fs";
import path from "node:path";
import { randomSecret, resolveEnv, startDefaults, type Env } from "../../scripts/env";
import { acquireLock, type Lock } from "../../scripts/lock";
import { buildIfNeeded, pgEnv, prepareDatabase, startAppProcesses, type Stack } from "../../scripts/stack";
import { Supervisor } from "../../scripts/supervisor";
import { freePort } from "../../scripts/free-port";

export const BENCH_DIR = ".data-bench";
export const BENCH_DIST_DIR = `${BENCH_DIR}/next`;

export interface BenchStack {
  env: Env;
  stack: Stack;
  supervisor: Supervisor;
  /** http://127.0.0.1:<port> (autocannon and fetch) */
  baseUrl: string;
  /** http://localhost:<port> (browsers: Auth.js redirects say localhost) */
  browserUrl: string;
  databaseUrl: string;
  distDir: string;
  /** Pid of the web server's process group leader (`next start`). */
  webPid(): number;
  stop(): Promise<void>;
}

export { freePort };

export async function startBenchStack(options: { log?: (line: string) => void } = {}): Promise<BenchStack> {
  const say = options.log ?? ((line: string) => console.log(`[bench] ${line}`));
  const taken = acquireLock(path.join(BENCH_DIR, "bench.lock"), "bench/");
  if (!taken.ok) throw new Error(`npm run bench already runs (pid ${taken.holder.pid}); wait for it or stop it (kill ${taken.holder.pid})`);
  const lock: Lock = taken.lock;

  const pgPort = await freePort(process.env.BENCH_PG_PORT);
  const webPort = await freePort(process.env.BENCH_WEB_PORT);
  const smtpPort = await freePort(process.env.BENCH_SMTP_PORT);
  const env = resolveEnv({
    defaults: startDefaults(),
    forced: {
      PORT: webPort,
      PGPORT: pgPort,
      DATABASE_URL: `postgres://postgres@127.0.0.1:${pgPort}/tributary`,
      APP_URL: `http://localhost:${webPort}`,
      SMTP_HOST: "127.0.0.1",
      SMTP_PORT: smtpPort,
      SMTP_USER: "",
      SMTP_PASS: "",
      SMTP_SECURE: "false",
      MAIL_SINK: "local",
      AUTH_SECRET: randomSecret(),
      AUTH_TRUST_HOST: "true",
      NEXT_DIST_DIR: BENCH_DIST_DIR,
      NEXT_TELEMETRY_DISABLED: "1",
    },
  });
  const logDir = path.join(BENCH_DIR, "logs");
  const stack: Stack = { dataDir: BENCH_DIR, logDir, env };

  // A cluster left by a killed earlier run is stopped by prepareDatabase; its data and logs go (the build stays).
  const cleaner = new Supervisor({ logDir: path.join(BENCH_DIR, "run"), label: "bench" });
  await cleaner.run({ name: "pg-stop", command: "bash", args: ["scripts/pg.sh", "stop"], env: pgEnv(stack), console: "none" });
  for (const entry of ["pg", "pgsock", "logs"]) rmSync(path.join(BENCH_DIR, entry), { recursive: true, force: true });
  mkdirSync(logDir, { recursive: true });

  const supervisor = new Supervisor({ logDir, label: "bench", onChange: (children) => lock.update({ children }) });
  supervisor.installSignalHandlers(() => {
    lock.release();
    process.exit(130);
  });
  const stop = async () => {
    await supervisor.stopAll();
    lock.release();
  };
  try {
    say(`throwaway stack: PostgreSQL 127.0.0.1:${pgPort}, web 127.0.0.1:${webPort}, build in ${BENCH_DIST_DIR}, logs in ${logDir}/`);
    await Promise.all([prepareDatabase(supervisor, stack), buildIfNeeded(supervisor, stack)]);
    await startAppProcesses(supervisor, stack);
  } catch (error) {
    await stop();
    throw error;
  }
  return {
    env,
    stack,
    supervisor,
    baseUrl: `http://127.0.0.1:${webPort}`,
    browserUrl: `http://localhost:${webPort}`,
    databaseUrl: env.DATABASE_URL,
    distDir: BENCH_DIST_DIR,
    webPid: () => {
      const web = supervisor.pids().find((p) => p.name === "web");
      if (!web) throw new Error("the web server is not running");
      return web.pid;
    },
    stop,
  };
}

/** Resident memory (bytes) of every process in the process group `pgid` (the web server and anything it forked). */
export function groupRss(pgid: number): number {
  let total = 0;
  for (const entry of readdirSync("/proc")) {
    if (!/^\d+$/.test(entry)) continue;
    try {
      const stat = readFileSync(`/proc/${entry}/stat`, "utf8");
      const fields = stat.slice(stat.lastIndexOf(")") + 2).split(" ");
      if (Number(fields[2]) !== pgid) continue;
      const status = readFileSync(`/proc/${entry}/status`, "utf8");
      const rss = /^VmRSS:\s+(\d+) kB/m.exec(status);
      if (rss) total += Number(rss[1]) * 1024;
    } catch {
      // gone
    }
  }
  return total;
}
