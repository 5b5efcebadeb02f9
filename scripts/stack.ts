// The pieces `npm start` and `npm test` share: the process table, database preparation and the build check.
import { existsSync, readdirSync, rmSync, statSync, utimesSync } from "node:fs";
import path from "node:path";
import postgres from "postgres";
import type { Env } from "./env";
import { httpOk, isPortOpen, portOpen, type ProcessSpec, type Supervisor } from "./supervisor";
import { WORKER_NODE_FLAGS } from "./worker-flags";

const NODE = process.execPath;
/** Runs a TypeScript file with tsx inside this node (one process, so signals reach it directly). */
const TSX = ["--import", "tsx"];
/** For scripts that import server-only modules (see DEVELOPERS.md). */
const SERVER = ["--conditions=react-server"];

export interface Stack {
  /** `.data` (npm start) or `.data-test` (npm test): pg data, sockets, logs. */
  dataDir: string;
  logDir: string;
  /** The resolved environment of every process (PORT, DATABASE_URL, SMTP_*, NEXT_DIST_DIR, ...). */
  env: Env;
  /** Extra PostgreSQL server options, e.g. `-c fsync=off` for a throwaway cluster. */
  pgExtraOpts?: string;
}

export function pgEnv(stack: Stack): Env {
  return {
    PGDATA_DIR: path.resolve(stack.dataDir, "pg"),
    PGSOCK_DIR: path.resolve(stack.dataDir, "pgsock"),
    PGLOG: path.resolve(stack.logDir, "pg.log"),
    PGPORT: localDatabase(stack.env)?.port ?? stack.env.PGPORT,
    PG_EXTRA_OPTS: stack.pgExtraOpts ?? "",
  };
}

/** The project-local cluster's port and database name, or null when DATABASE_URL points elsewhere. */
export function localDatabase(env: Env): { port: string; name: string } | null {
  const url = new URL(env.DATABASE_URL);
  const local = ["127.0.0.1", "localhost"].includes(url.hostname) && url.port === env.PGPORT;
  return local ? { port: url.port, name: decodeURIComponent(url.pathname.slice(1)) || "tributary" } : null;
}

// --- the process table ------------------------------------------------------------------------------

/** PostgreSQL in the foreground (`pg.sh run`), stopped with `pg_ctl stop -m fast`. */
export function databaseProcess(stack: Stack): ProcessSpec {
  const env = pgEnv(stack);
  return {
    name: "db",
    command: "bash",
    args: ["scripts/pg.sh", "run"],
    env,
    readyCheck: postgresReady(Number(env.PGPORT)),
    readyTimeoutMs: 90_000,
    stopCommand: { command: "bash", args: ["scripts/pg.sh", "stop"] },
    stopTimeoutMs: 60_000,
  };
}

/** The app's long-running processes in start order; adding one is one line. */
export function appProcesses(stack: Stack): ProcessSpec[] {
  const { env } = stack;
  const next = ["node_modules/next/dist/bin/next", "start", "-H", "127.0.0.1", "-p", env.PORT];
  const table: (ProcessSpec | false)[] = [
    env.MAIL_SINK === "local" && { name: "mail", command: NODE, args: [...TSX, "scripts/mail-sink.ts"], env, readyCheck: portOpen(Number(env.SMTP_PORT), env.SMTP_HOST) },
    existsSync("server/jobs/worker.ts") && { name: "worker", command: NODE, args: [...WORKER_NODE_FLAGS, ...SERVER, ...TSX, "server/jobs/worker.ts"], env },
    { name: "web", command: NODE, args: next, env, readyCheck: httpOk(`http://127.0.0.1:${env.PORT}/api/ping`), readyTimeoutMs: 120_000 },
  ];
  return table.filter((spec): spec is ProcessSpec => Boolean(spec));
}

export async function startAppProcesses(supervisor: Supervisor, stack: Stack): Promise<void> {
  for (const spec of appProcesses(stack)) await supervisor.start(spec);
}

// --- steps ----------------------------------------------------------------------------------------------

export class StepError extends Error {}

/** Runs a one-shot command under the supervisor; throws StepError when it fails. */
export async function step(supervisor: Supervisor, spec: ProcessSpec): Promise<void> {
  const code = await supervisor.run(spec);
  if (supervisor.isStopping) throw new StepError(`${spec.name}: interrupted`);
  if (code !== 0) throw new StepError(`${spec.name} failed (exit code ${code}); see ${supervisor.logFile(spec.name)}`);
}

export async function assertPortsFree(ports: { name: string; port: string; variable: string }[]): Promise<void> {
  for (const { name, port, variable } of ports) {
    if (await isPortOpen(Number(port))) {
      throw new StepError(`port ${port} (${name}) is already in use by another program: stop it, or set ${variable} in .env`);
    }
  }
}

/**
 * Starts the project-local cluster (when DATABASE_URL points at it; a server left running by a killed
 * earlier run is stopped first), creates DATABASE_URL's database if missing, migrates and seeds it.
 * A failing seed throws, unless `onSeedError` takes it (the tests count it and go on).
 */
export async function prepareDatabase(supervisor: Supervisor, stack: Stack, onSeedError?: (error: StepError) => void): Promise<void> {
  const local = localDatabase(stack.env);
  if (local) {
    const pg = { env: pgEnv(stack), console: "none" as const };
    if ((await supervisor.run({ name: "pg-status", command: "bash", args: ["scripts/pg.sh", "status"], ...pg })) === 0) {
      supervisor.say(`stopping a PostgreSQL left running on ${pg.env.PGDATA_DIR} by an earlier run`);
      await step(supervisor, { name: "pg-stop", command: "bash", args: ["scripts/pg.sh", "stop"], ...pg });
    }
    await assertPortsFree([{ name: "PostgreSQL", port: local.port, variable: "PGPORT" }]);
    await supervisor.start(databaseProcess(stack));
    await step(supervisor, { name: "createdb", command: "bash", args: ["scripts/pg.sh", "createdb", local.name], env: pg.env });
  }
  await step(supervisor, { name: "migrate", command: NODE, args: [...TSX, "db/migrate.ts"], env: stack.env });
  if (existsSync("seed/index.ts")) {
    try {
      await step(supervisor, { name: "seed", command: NODE, args: [...SERVER, ...TSX, "seed/index.ts"], env: stack.env });
    } catch (error) {
      if (!onSeedError || supervisor.isStopping || !(error instanceof StepError)) throw error;
      onSeedError(error);
    }
  }
}

/** True once PostgreSQL on 127.0.0.1:port answers a query. */
export function postgresReady(port: number): () => Promise<boolean> {
  return async () => {
    const sql = postgres({ host: "127.0.0.1", port, user: "postgres", database: "postgres", max: 1, connect_timeout: 2, onnotice: () => {} });
    try {
      await sql`select 1`;
      return true;
    } finally {
      await sql.end({ timeout: 1 });
    }
  };
}

// --- building -----------------------------------------------------------------------------------------

/** What the production build depends on (directories are walked; their own mtimes catch deletions). */
const BUILD_INPUTS = [
  "app", "pages", "server", "db", "ui", "lib", "public", "types", "proxy.ts", "middleware.ts", "instrumentation.ts",
  "package.json", "package-lock.json", "next.config.ts", "tsconfig.json", "postcss.config.mjs",
  "tailwind.config.ts", ".env",
];

/** Why `next build` must run for distDir, or null when the build there is newer than every input. */
export function buildReason(distDir: string): string | null {
  const buildId = path.join(distDir, "BUILD_ID");
  if (!existsSync(buildId)) return `no build in ${distDir} yet`;
  const builtAt = statSync(buildId).mtimeMs;
  const newer = newestInput(builtAt);
  return newer ? `${newer} changed since the last build` : null;
}

function newestInput(since: number): string | null {
  const stack = [...BUILD_INPUTS];
  while (stack.length) {
    const entry = stack.pop()!;
    let stat;
    try {
      stat = statSync(entry);
    } catch {
      continue;
    }
    if (stat.mtimeMs > since) return entry;
    if (stat.isDirectory()) {
      for (const name of readdirSync(entry)) {
        if (name === "node_modules" || name.startsWith(".")) continue;
        stack.push(path.join(entry, name));
      }
    }
  }
  return null;
}

/** Every build folder: `npm start`'s, `npm test`'s and the benchmarks' (tsconfig.json includes the types of each). */
const DIST_DIRS = [".next", ".next-test", ".data-bench/next"];

/**
 * The route types another build folder generated are type-checked by this build too (tsconfig.json
 * includes them); after a route moves or goes they name a file that no longer exists and fail it.
 * Each build writes its own again, so the others' are removed first.
 */
function removeOtherBuildsRouteTypes(distDir: string): void {
  for (const other of DIST_DIRS) {
    if (path.resolve(other) !== path.resolve(distDir)) rmSync(path.join(other, "types"), { recursive: true, force: true });
  }
}

/** `next build` into env.NEXT_DIST_DIR when needed; the BUILD_ID gets the build's start time. */
export async function buildIfNeeded(supervisor: Supervisor, stack: Stack): Promise<void> {
  const distDir = stack.env.NEXT_DIST_DIR || ".next";
  const reason = buildReason(distDir);
  if (!reason) {
    supervisor.say(`build in ${distDir} is up to date`);
    return;
  }
  supervisor.say(`building the app (${reason}); log: ${supervisor.logFile("build")}`);
  const startedAt = new Date();
  removeOtherBuildsRouteTypes(distDir);
  await step(supervisor, { name: "build", command: NODE, args: ["node_modules/next/dist/bin/next", "build"], env: stack.env });
  utimesSync(path.join(distDir, "BUILD_ID"), startedAt, startedAt);
}
