// `npm test`: a throwaway PostgreSQL (.data-test/pg on 54339) → migrations + seed → vitest unit and
// integration tests → `next build` into .next-test → mail sink + web (+ worker) on test ports → vitest e2e
// with Debian's chromium → stop everything → one line `N passed, M failed` counting every test.
//
//   bash scripts/test.sh [--no-e2e | --only unit | --only e2e] [-- <vitest filters/options>]
import { existsSync, mkdirSync, readdirSync, readFileSync, rmSync } from "node:fs";
import path from "node:path";
import { randomSecret, resolveEnv, startDefaults, type Env } from "./env";
import { acquireLock } from "./lock";
import { assertPortsFree, buildIfNeeded, pgEnv, prepareDatabase, startAppProcesses, StepError, type Stack } from "./stack";
import { Supervisor } from "./supervisor";

const DATA_DIR = ".data-test";
// Fixed so that a test run never collides with `npm start`; TEST_PORT_OFFSET (e.g. 10) moves all three for a
// second checkout testing on the same machine.
const PORT_OFFSET = Number(process.env.TEST_PORT_OFFSET ?? 0) || 0;
const PG_PORT = String(54339 + PORT_OFFSET);
const WEB_PORT = String(3100 + PORT_OFFSET);
const SMTP_PORT = String(2535 + PORT_OFFSET);
/** Integration tests get their own copy of the migrated, seeded database; the e2e app keeps `tributary`. */
const INTEGRATION_DB = "tributary_it";

interface Options {
  unit: boolean;
  e2e: boolean;
  vitestArgs: string[];
}

function parseArgs(argv: string[]): Options {
  const options: Options = { unit: true, e2e: true, vitestArgs: [] };
  for (let i = 0; i < argv.length; i++) {
    const arg = argv[i];
    if (arg === "--") {
      options.vitestArgs = argv.slice(i + 1);
      break;
    } else if (arg === "--no-e2e") options.e2e = false;
    else if (arg === "--only" && (argv[i + 1] === "unit" || argv[i + 1] === "e2e")) {
      options.unit = argv[i + 1] === "unit";
      options.e2e = argv[i + 1] === "e2e";
      i++;
    } else {
      throw new StepError(`unknown option ${arg}; usage: bash scripts/test.sh [--no-e2e | --only unit|e2e] [-- vitest args]`);
    }
  }
  return options;
}

class Tally {
  passed = 0;
  failed = 0;
  private printed = false;
  readonly notes: string[] = [];

  /** A check outside vitest that passed (e.g. npm audit) counts as one passed test. */
  pass(note: string): void {
    this.passed += 1;
    this.notes.push(note);
  }

  /** A stage that could not produce test results counts as one failure. */
  fail(note: string): void {
    this.failed += 1;
    this.notes.push(`FAILED: ${note}`);
  }

  /** Adds the counts of a vitest JSON report; problems outside tests (load errors, crashes) count as failures. */
  addVitest(label: string, file: string, exitCode: number): void {
    if (!existsSync(file)) {
      if (exitCode === 0) this.notes.push(`${label}: no tests`);
      else this.fail(`${label}: vitest exited with code ${exitCode} without a report`);
      return;
    }
    const report = JSON.parse(readFileSync(file, "utf8")) as {
      numPassedTests: number;
      numFailedTests: number;
      numFailedTestSuites: number;
      numPendingTests?: number;
      numTodoTests?: number;
      success: boolean;
    };
    this.passed += report.numPassedTests;
    this.failed += report.numFailedTests;
    const skipped = (report.numPendingTests ?? 0) + (report.numTodoTests ?? 0);
    this.notes.push(`${label}: ${report.numPassedTests} passed, ${report.numFailedTests} failed${skipped ? `, ${skipped} skipped` : ""}`);
    if ((!report.success || exitCode !== 0) && report.numFailedTests === 0) {
      this.fail(`${label}: vitest reported ${Math.max(report.numFailedTestSuites, 1)} failure(s) outside tests (files that do not load, unhandled errors); see above`);
    }
  }

  print(): void {
    if (this.printed) return;
    this.printed = true;
    for (const note of this.notes) console.log(`[test] ${note}`);
    console.log(`${this.passed} passed, ${this.failed} failed`);
  }
}

/** Colours only when a person watches; no notice about Vite's future config loader on every run. */
const vitestEnv: Env = {
  VITE_CONFIG_NATIVE_IGNORE_WARNING: "true",
  ...(process.stdout.isTTY ? { FORCE_COLOR: "1" } : { NO_COLOR: "1" }),
};

function vitestArgs(config: string | null, report: string, extra: string[]): string[] {
  return [
    "node_modules/vitest/vitest.mjs",
    "run",
    ...(config ? ["--config", config] : []),
    "--reporter=default",
    "--reporter=json",
    `--outputFile.json=${report}`,
    "--passWithNoTests",
    ...extra,
  ];
}

/**
 * `npm audit --omit=dev`: one counted check. A high or critical advisory in a production dependency fails
 * it; none passes it. When the registry's audit endpoint cannot answer (offline, or a mirror without it),
 * nothing is known: that is neither a pass nor a failure, and the summary says so in capitals.
 */
async function npmAudit(supervisor: Supervisor, tally: Tally): Promise<void> {
  const report = path.join(DATA_DIR, "npm-audit.json");
  const code = await supervisor.run({ name: "npm-audit", command: "bash", args: ["-c", `npm audit --omit=dev --json > ${report}`], console: "none" });
  if (supervisor.isStopping) return;
  let result: { metadata?: { vulnerabilities?: Record<string, number> }; vulnerabilities?: Record<string, { severity: string }>; message?: string; error?: { summary?: string } };
  try {
    result = JSON.parse(readFileSync(report, "utf8"));
  } catch {
    result = { message: `no JSON answer (exit code ${code}); see ${supervisor.logFile("npm-audit")}` };
  }
  const counts = result.metadata?.vulnerabilities;
  if (!counts) {
    tally.notes.push(`npm audit --omit=dev: NOT CHECKED — the registry's audit endpoint did not answer (${(result.message ?? result.error?.summary ?? "unknown error").slice(0, 160)})`);
    return;
  }
  const serious = Object.entries(result.vulnerabilities ?? {}).filter(([, v]) => v.severity === "high" || v.severity === "critical");
  const summary = ["critical", "high", "moderate", "low"].map((level) => `${counts[level] ?? 0} ${level}`).join(", ");
  if (serious.length > 0) tally.fail(`npm audit --omit=dev: ${summary}: ${serious.map(([name, v]) => `${name} (${v.severity})`).join(", ")}`);
  else tally.pass(`npm audit --omit=dev: no high or critical advisory (${summary})`);
}

async function main(): Promise<number> {
  const tally = new Tally();
  let options: Options;
  try {
    options = parseArgs(process.argv.slice(2));
  } catch (error) {
    tally.fail((error as Error).message);
    tally.print();
    return 2;
  }

  const taken = acquireLock(path.join(DATA_DIR, "test.lock"), "scripts/test.ts");
  if (!taken.ok) {
    tally.fail(`the tests are already running (pid ${taken.holder.pid}); wait for them or stop them (kill ${taken.holder.pid})`);
    tally.print();
    return 1;
  }
  const { lock } = taken;

  const forced: Env = {
    PORT: WEB_PORT,
    PGPORT: PG_PORT,
    DATABASE_URL: `postgres://postgres@127.0.0.1:${PG_PORT}/tributary`,
    APP_URL: `http://localhost:${WEB_PORT}`,
    SMTP_HOST: "127.0.0.1",
    SMTP_PORT,
    SMTP_USER: "",
    SMTP_PASS: "",
    SMTP_SECURE: "false",
    MAIL_SINK: "local",
    AUTH_SECRET: randomSecret(),
    AUTH_TRUST_HOST: "true",
    NEXT_DIST_DIR: ".next-test",
    NEXT_TELEMETRY_DISABLED: "1",
  };
  const env = resolveEnv({ defaults: startDefaults(), forced });
  const logDir = path.join(DATA_DIR, "logs");
  const stack: Stack = {
    dataDir: DATA_DIR,
    logDir,
    env,
    // A throwaway cluster: durability off makes migrations and tests faster.
    pgExtraOpts: "-c fsync=off -c synchronous_commit=off -c full_page_writes=off",
  };

  // Stop a cluster left by a killed earlier run, then start from nothing (the lock file stays).
  mkdirSync(DATA_DIR, { recursive: true });
  const cleaner = new Supervisor({ logDir: path.join(DATA_DIR, "run"), label: "test" });
  await cleaner.run({ name: "pg-stop", command: "bash", args: ["scripts/pg.sh", "stop"], env: pgEnv(stack), console: "none" });
  for (const entry of readdirSync(DATA_DIR)) {
    if (entry !== "test.lock") rmSync(path.join(DATA_DIR, entry), { recursive: true, force: true });
  }
  mkdirSync(logDir, { recursive: true });

  const supervisor = new Supervisor({ logDir, label: "test", onChange: (children) => lock.update({ children }) });
  supervisor.installSignalHandlers(() => {
    tally.fail("interrupted");
    lock.release();
    tally.print();
    process.exit(130);
  });
  const interrupted = () => new Promise<number>(() => {}); // the signal handler prints and exits

  const started = Date.now();
  // Runs beside the database and build steps; not with --only e2e or vitest filters (quick loops).
  const audit = options.unit && options.vitestArgs.length === 0 ? npmAudit(supervisor, tally) : Promise.resolve();
  try {
    const ports = options.e2e
      ? [
          { name: "test web server", port: WEB_PORT, variable: "(fixed for tests)" },
          { name: "test mail sink", port: SMTP_PORT, variable: "(fixed for tests)" },
        ]
      : [];
    await assertPortsFree(ports);
    // The build needs no database: it runs while PostgreSQL starts, migrates and seeds.
    const build = options.e2e
      ? buildIfNeeded(supervisor, stack).then(
          () => true,
          (error: unknown) => {
            if (!supervisor.isStopping) tally.fail(`next build: ${(error as Error).message}`);
            return false;
          },
        )
      : Promise.resolve(false);
    const seeded = prepareDatabase(supervisor, stack, (error) => tally.fail(`${error.message} (tests go on with the unseeded database)`));
    const [built] = await Promise.all([build, seeded]);

    if (options.unit) {
      const code = await supervisor.run({
        name: "createdb-it",
        command: "bash",
        args: ["scripts/pg.sh", "psql", "-q", "-c", `create database ${INTEGRATION_DB} template tributary`],
        env: { ...pgEnv(stack), PGDATABASE: "postgres" },
      });
      if (code !== 0) throw new StepError(`could not create the integration database; see ${supervisor.logFile("createdb-it")}`);
      const report = path.join(DATA_DIR, "vitest-unit.json");
      supervisor.say("unit and integration tests (vitest.config.ts)");
      const exitCode = await supervisor.run({
        name: "vitest-unit",
        command: process.execPath,
        args: vitestArgs(null, report, options.vitestArgs),
        env: { ...env, ...vitestEnv, DATABASE_URL: `postgres://postgres@127.0.0.1:${PG_PORT}/${INTEGRATION_DB}` },
        console: "plain",
      });
      if (supervisor.isStopping) return interrupted();
      tally.addVitest("unit + integration", report, exitCode);
    }

    if (options.e2e && built) {
      try {
        await startAppProcesses(supervisor, stack);
      } catch (error) {
        if (supervisor.isStopping) return interrupted();
        tally.fail(`starting the app for browser tests: ${(error as Error).message}`);
      }
      if (supervisor.pids().some((p) => p.name === "web")) {
        const report = path.join(DATA_DIR, "vitest-e2e.json");
        supervisor.say(`browser tests (vitest.e2e.config.ts) against http://localhost:${WEB_PORT}`);
        const exitCode = await supervisor.run({
          name: "vitest-e2e",
          command: process.execPath,
          args: vitestArgs("vitest.e2e.config.ts", report, options.vitestArgs),
          env: {
            ...env,
            ...vitestEnv,
            E2E_BASE_URL: `http://localhost:${WEB_PORT}`,
            E2E_LOG_DIR: path.resolve(logDir),
            E2E_SCREEN_DIR: path.resolve(DATA_DIR, "screens"),
          },
          console: "plain",
        });
        if (supervisor.isStopping) return interrupted();
        tally.addVitest("browser (e2e)", report, exitCode);
      }
    }
  } catch (error) {
    if (supervisor.isStopping) return interrupted();
    tally.fail(error instanceof StepError ? error.message : String((error as Error).stack ?? error));
  }

  await audit;
  await supervisor.stopAll();
  lock.release();
  tally.notes.push(`took ${Math.round((Date.now() - started) / 1000)} s; logs in ${logDir}/`);
  tally.print();
  return tally.failed === 0 ? 0 : 1;
}

main().then(
  (code) => process.exit(code),
  (error: unknown) => {
    console.error(error);
    console.log("0 passed, 1 failed");
    process.exit(1);
  },
);
