// A second Tributary for fault tests that must not disturb the shared e2e app: its own PostgreSQL cluster
// (data in .data-test/faults, a free port, migrated and seeded by the same steps as `npm test`) and its own
// `next start` of the build under test (NEXT_DIST_DIR, a free port), under the scripts' Supervisor. Logs go
// to the e2e log folder as faults-<name>.log, so the log scan (security-logs test) reads them too.
import { rmSync } from "node:fs";
import path from "node:path";
import postgres from "postgres";
import { randomSecret, resolveEnv, startDefaults } from "@/scripts/env";
import { freePort } from "@/scripts/free-port";
import { appProcesses, databaseProcess, pgEnv, prepareDatabase, type Stack } from "@/scripts/stack";
import { Supervisor, type ProcessSpec } from "@/scripts/supervisor";
import { e2e } from "./support/env";

/** Prefixes every process name, so the logs are faults-db.log, faults-web.log, … */
function renamed(spec: ProcessSpec): ProcessSpec {
  return { ...spec, name: `faults-${spec.name}`, console: "none" };
}

export interface OwnStack {
  baseUrl: string;
  databaseUrl: string;
  sql: postgres.Sql;
  webPid(): number | undefined;
  startWeb(): Promise<void>;
  /** SIGKILL to the web server's process group (no clean-up of any kind). */
  killWeb(): void;
  stopDatabase(): Promise<void>;
  startDatabase(): Promise<void>;
  stop(): Promise<void>;
}

export async function startOwnStack(): Promise<OwnStack> {
  const dataDir = path.join(path.dirname(path.resolve(e2e.logDir)), "faults");
  const [pgPort, webPort] = [await freePort(), await freePort()];
  const env = resolveEnv({
    defaults: startDefaults(),
    forced: {
      PORT: webPort,
      PGPORT: pgPort,
      DATABASE_URL: `postgres://postgres@127.0.0.1:${pgPort}/tributary`,
      APP_URL: `http://localhost:${webPort}`,
      // Mail goes to the shared test sink (nothing here sends any).
      SMTP_HOST: e2e.smtpHost,
      SMTP_PORT: String(e2e.smtpPort),
      SMTP_USER: "",
      SMTP_PASS: "",
      MAIL_SINK: "off",
      AUTH_SECRET: randomSecret(),
      AUTH_TRUST_HOST: "true",
      NEXT_DIST_DIR: process.env.NEXT_DIST_DIR || ".next-test",
      NEXT_TELEMETRY_DISABLED: "1",
    },
  });
  const stack: Stack = { dataDir, logDir: path.resolve(e2e.logDir), env, pgExtraOpts: "-c fsync=off -c full_page_writes=off" };
  rmSync(dataDir, { recursive: true, force: true });
  const supervisor = new Supervisor({ logDir: stack.logDir, label: "faults" });
  // prepareDatabase names its steps pg-status, createdb, migrate, seed: run it with a supervisor whose
  // logs go to a sub-folder so the shared app's migrate.log/seed.log are not appended to.
  const setup = new Supervisor({ logDir: path.join(dataDir, "logs"), label: "faults" });
  const web = () => renamed(appProcesses(stack).find((spec) => spec.name === "web")!);
  const db = () => renamed(databaseProcess(stack));
  const pg = pgEnv(stack);
  try {
    await prepareDatabase(setup, stack);
    // prepareDatabase started PostgreSQL under `setup`; from here on `supervisor` owns the cluster.
    await setup.run({ name: "pg-stop", command: "bash", args: ["scripts/pg.sh", "stop"], env: pg, console: "none" });
    await setup.stopAll();
    await supervisor.start(db());
    await supervisor.start(web());
  } catch (error) {
    await supervisor.stopAll();
    await setup.stopAll();
    throw error;
  }
  const sql = postgres(env.DATABASE_URL, { max: 3, onnotice: () => {} });
  const webPid = () => supervisor.pids().find((p) => p.name === "faults-web")?.pid;
  return {
    baseUrl: `http://localhost:${webPort}`,
    databaseUrl: env.DATABASE_URL,
    sql,
    webPid,
    startWeb: () => supervisor.start(web()),
    killWeb: () => {
      const pid = webPid();
      if (pid) process.kill(-pid, "SIGKILL");
    },
    stopDatabase: async () => {
      // pg_ctl stop -m fast: what an operator (or a crash-restart of the database host) does.
      const code = await supervisor.run({ name: "faults-pg-stop", command: "bash", args: ["scripts/pg.sh", "stop"], env: pg, console: "none" });
      if (code !== 0) throw new Error("pg.sh stop failed");
    },
    startDatabase: () => supervisor.start(db()),
    stop: async () => {
      await sql.end({ timeout: 1 }).catch(() => {});
      await supervisor.stopAll();
      // Whatever state the tests left the cluster in: stopped for good.
      await new Supervisor({ logDir: path.join(dataDir, "logs"), label: "faults" }).run({ name: "pg-stop", command: "bash", args: ["scripts/pg.sh", "stop"], env: pg, console: "none" });
    },
  };
}
