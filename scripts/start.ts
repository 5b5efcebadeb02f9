// `npm start`: PostgreSQL in .data/pg → database → migrations → seed → build when needed → mail sink,
// worker and web server under one supervisor. Ctrl-C stops everything it started.
import { mkdirSync } from "node:fs";
import path from "node:path";
import { persistentAuthSecret, resolveEnv, startDefaults } from "./env";
import { acquireLock } from "./lock";
import { assertPortsFree, buildIfNeeded, prepareDatabase, startAppProcesses, StepError, type Stack } from "./stack";
import { describe, Supervisor } from "./supervisor";

const DATA_DIR = ".data";

async function main(): Promise<number> {
  const env = resolveEnv({ defaults: startDefaults() });
  if (!env.AUTH_SECRET) env.AUTH_SECRET = persistentAuthSecret(DATA_DIR);
  const url = `http://127.0.0.1:${env.PORT}`;

  const taken = acquireLock(path.join(DATA_DIR, "run", "start.lock"), "scripts/start.ts", url);
  if (!taken.ok) {
    console.error(`Tributary is already running (pid ${taken.holder.pid}, ${taken.holder.url ?? url}). Stop it with Ctrl-C in its terminal, or: kill ${taken.holder.pid}`);
    return 1;
  }
  const { lock } = taken;
  if (taken.recovered) console.log("[start] an earlier start was killed without cleaning up: stopped what it left running");

  const logDir = path.join(DATA_DIR, "logs");
  mkdirSync(logDir, { recursive: true });
  const stack: Stack = { dataDir: DATA_DIR, logDir, env };
  const supervisor = new Supervisor({ logDir, label: "start", onChange: (children) => lock.update({ children }) });
  supervisor.installSignalHandlers(() => {
    lock.release();
    supervisor.say("stopped");
    process.exit(130);
  });

  try {
    const ports = [{ name: "web", port: env.PORT, variable: "PORT" }];
    if (env.MAIL_SINK === "local") ports.push({ name: "mail sink", port: env.SMTP_PORT, variable: "SMTP_PORT" });
    await assertPortsFree(ports);
    // The build needs no database: it runs while PostgreSQL starts, migrates and seeds.
    await Promise.all([prepareDatabase(supervisor, stack), buildIfNeeded(supervisor, stack)]);
    await startAppProcesses(supervisor, stack);
  } catch (error) {
    if (supervisor.isStopping) return new Promise(() => {}); // the signal handler finishes and exits
    supervisor.say(error instanceof StepError ? error.message : `failed: ${error instanceof Error ? error.stack : String(error)}`);
    await supervisor.stopAll();
    lock.release();
    return 1;
  }

  console.log("");
  console.log(`Tributary is ready at ${url}`);
  console.log(`Sign in with a demo account (see README). Logs: ${logDir}/. Press Ctrl-C to stop.`);
  console.log("");

  const exit = await supervisor.firstExit();
  if (supervisor.isStopping) return new Promise(() => {});
  supervisor.say(`${exit.name} stopped unexpectedly (${describe(exit)}); see ${supervisor.logFile(exit.name)}. Stopping the rest.`);
  await supervisor.stopAll();
  lock.release();
  return 1;
}

main().then(
  (code) => process.exit(code),
  (error: unknown) => {
    console.error(error);
    process.exit(1);
  },
);
