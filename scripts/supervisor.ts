// A small supervisor of named processes, used by `npm start`, `npm test` and by tests that need their own
// servers. Each process runs in its own process group (so stopping it also stops whatever it forked),
// writes its output to `<logDir>/<name>.log` and, prefixed with `[name]`, to the console.
import { spawn, type ChildProcess } from "node:child_process";
import { createWriteStream, mkdirSync, type WriteStream } from "node:fs";
import path from "node:path";

export interface ProcessSpec {
  /** Short name: the log file is `<logDir>/<name>.log`, console lines are prefixed `[name]`. */
  name: string;
  command: string;
  args?: string[];
  /** Added to (and overriding) the supervisor's own environment. */
  env?: Record<string, string | undefined>;
  cwd?: string;
  /** Polled (every 250 ms) after spawning until it answers true; `start()` resolves then. */
  readyCheck?: () => Promise<boolean>;
  readyTimeoutMs?: number;
  /** A command that stops the process (e.g. `pg_ctl stop -m fast`); default: `stopSignal` to its group. */
  stopCommand?: { command: string; args?: string[] };
  stopSignal?: NodeJS.Signals;
  /** Milliseconds to wait for a clean exit before SIGKILL (default 15 s). */
  stopTimeoutMs?: number;
  /** Console lines: "prefix" (default) writes `[name] line`, "plain" writes the line as is, "none" only logs. */
  console?: "prefix" | "plain" | "none";
}

export interface ExitInfo {
  name: string;
  code: number | null;
  signal: NodeJS.Signals | null;
}

export interface SupervisorOptions {
  /** Folder of the per-process log files (created when missing). */
  logDir: string;
  /** Prefix of the supervisor's own console lines, e.g. "start" → `[start] ...`. */
  label?: string;
  cwd?: string;
  /** Called whenever the set of running processes changes (e.g. to record their pids in a lock file). */
  onChange?: (running: { name: string; pid: number }[]) => void;
}

interface Running {
  spec: ProcessSpec;
  child: ChildProcess;
  log: WriteStream;
  exited: Promise<ExitInfo>;
  exit?: ExitInfo;
  longRunning: boolean;
}

const sleep = (ms: number) => new Promise((resolve) => setTimeout(resolve, ms));

export class Supervisor {
  private readonly running: Running[] = [];
  private stopping = false;
  private unexpected: ((info: ExitInfo) => void)[] = [];
  private firstUnexpected?: ExitInfo;
  private signalsInstalled = false;

  constructor(private readonly options: SupervisorOptions) {
    mkdirSync(options.logDir, { recursive: true });
  }

  /** Prints a line of the supervisor itself. */
  say(message: string): void {
    process.stdout.write(`[${this.options.label ?? "supervisor"}] ${message}\n`);
  }

  logFile(name: string): string {
    return path.join(this.options.logDir, `${name}.log`);
  }

  /** Starts a long-running process and resolves once its readyCheck passes (or right away without one). */
  async start(spec: ProcessSpec): Promise<void> {
    if (this.stopping) throw new Error(`not starting ${spec.name}: stopping`);
    const entry = this.spawn(spec, true);
    if (!spec.readyCheck) return;
    const deadline = Date.now() + (spec.readyTimeoutMs ?? 60_000);
    for (;;) {
      if (entry.exit) {
        throw new Error(`${spec.name} exited (${describe(entry.exit)}) before it was ready; see ${this.logFile(spec.name)}`);
      }
      if (this.stopping) throw new Error(`${spec.name}: stopped while starting`);
      if (await spec.readyCheck().catch(() => false)) return;
      if (Date.now() > deadline) {
        throw new Error(`${spec.name} was not ready within ${Math.round((spec.readyTimeoutMs ?? 60_000) / 1000)} s; see ${this.logFile(spec.name)}`);
      }
      await sleep(250);
    }
  }

  /** Runs a one-shot command to completion (stopped too if everything stops); resolves its exit code. */
  async run(spec: ProcessSpec): Promise<number> {
    if (this.stopping) return 130;
    const entry = this.spawn(spec, false);
    const exit = await entry.exited;
    return exit.code ?? 128;
  }

  /** Resolves with the first long-running process that exits on its own. */
  firstExit(): Promise<ExitInfo> {
    if (this.firstUnexpected) return Promise.resolve(this.firstUnexpected);
    return new Promise((resolve) => this.unexpected.push(resolve));
  }

  get isStopping(): boolean {
    return this.stopping;
  }

  pids(): { name: string; pid: number }[] {
    return this.running.filter((r) => !r.exit && r.child.pid).map((r) => ({ name: r.spec.name, pid: r.child.pid! }));
  }

  /** Stops everything it started, newest first; waits for each to exit (SIGKILL after its timeout). */
  async stopAll(): Promise<void> {
    this.stopping = true;
    for (const entry of [...this.running].reverse()) {
      if (entry.exit) continue;
      await this.stopOne(entry);
    }
  }

  /** Ctrl-C, SIGTERM and SIGHUP stop everything, then call `onStopped` (default: exit 130). A second Ctrl-C kills. */
  installSignalHandlers(onStopped: (signal: NodeJS.Signals) => void | Promise<void> = () => process.exit(130)): void {
    if (this.signalsInstalled) return;
    this.signalsInstalled = true;
    let firstAt = 0;
    const handler = (signal: NodeJS.Signals) => {
      // npm forwards the terminal's Ctrl-C to us as well: a repeat within a second is the same Ctrl-C.
      if (firstAt && Date.now() - firstAt < 1000) return;
      if (firstAt) {
        this.say(`${signal} again: killing everything now`);
        this.killAll();
        process.exit(130);
      }
      firstAt = Date.now();
      this.say(`${signal}: stopping everything (Ctrl-C again to kill)`);
      void this.stopAll().then(() => onStopped(signal));
    };
    for (const signal of ["SIGINT", "SIGTERM", "SIGHUP"] as const) process.on(signal, handler);
    // Last resort (uncaught error, process.exit elsewhere): never leave process groups behind.
    process.on("exit", () => this.killAll());
  }

  /** SIGKILL to every process group still running (synchronous; safe in an exit handler). */
  killAll(): void {
    for (const entry of this.running) {
      if (!entry.exit && entry.child.pid) killGroup(entry.child.pid, "SIGKILL");
    }
  }

  private spawn(spec: ProcessSpec, longRunning: boolean): Running {
    const log = createWriteStream(this.logFile(spec.name), { flags: "a" });
    // A log that cannot be written (its folder removed, disk full) must not take the supervisor down.
    log.on("error", (error) => process.stderr.write(`[${spec.name}] log ${this.logFile(spec.name)}: ${error.message}\n`));
    const commandLine = [spec.command, ...(spec.args ?? [])].join(" ");
    log.write(`--- ${new Date().toISOString()} ${commandLine}\n`);
    const child = spawn(spec.command, spec.args ?? [], {
      cwd: spec.cwd ?? this.options.cwd ?? process.cwd(),
      env: { ...process.env, ...spec.env } as NodeJS.ProcessEnv,
      stdio: ["ignore", "pipe", "pipe"],
      detached: true, // its own process group: stopping it stops its children too; Ctrl-C reaches only us
    });
    const mode = spec.console ?? "prefix";
    const out = (line: string) => {
      if (!log.writableEnded) log.write(`${line}\n`);
      if (mode === "prefix") process.stdout.write(`[${spec.name}] ${line}\n`);
      else if (mode === "plain") process.stdout.write(`${line}\n`);
    };
    child.stdout?.on("data", lineSplitter(out));
    child.stderr?.on("data", lineSplitter(out));
    const entry: Running = { spec, child, log, longRunning, exited: undefined as unknown as Promise<ExitInfo> };
    entry.exited = new Promise<ExitInfo>((resolve) => {
      let settled = false;
      const finish = (info: ExitInfo) => {
        if (settled) return;
        settled = true;
        entry.exit = info;
        // Resolve once the log is complete on disk (callers read it, tests remove its folder).
        const logged = new Promise<void>((done) => {
          if (log.destroyed) return done();
          log.once("close", () => done());
          log.end(`--- ${new Date().toISOString()} exited (${describe(info)})\n`);
        });
        this.options.onChange?.(this.pids());
        if (longRunning && !this.stopping && !this.firstUnexpected) {
          this.firstUnexpected = info;
          for (const notify of this.unexpected.splice(0)) notify(info);
        }
        void logged.then(() => resolve(info));
      };
      child.on("error", (error) => {
        out(`could not start ${commandLine}: ${error.message}`);
        finish({ name: spec.name, code: 127, signal: null });
      });
      // "close" fires after the output pipes are drained, so the log is complete.
      child.on("close", (code, signal) => finish({ name: spec.name, code, signal }));
    });
    this.running.push(entry);
    this.options.onChange?.(this.pids());
    return entry;
  }

  private async stopOne(entry: Running): Promise<void> {
    const { spec, child } = entry;
    const pid = child.pid;
    if (!pid) return;
    const timeout = spec.stopTimeoutMs ?? 15_000;
    if (spec.stopCommand) {
      const stopper = spawn(spec.stopCommand.command, spec.stopCommand.args ?? [], {
        cwd: spec.cwd ?? this.options.cwd ?? process.cwd(),
        env: { ...process.env, ...spec.env } as NodeJS.ProcessEnv,
        stdio: ["ignore", "pipe", "pipe"],
      });
      const toLog = (line: string) => {
        if (!entry.log.writableEnded) entry.log.write(`${line}\n`);
      };
      stopper.stdout?.on("data", lineSplitter(toLog));
      stopper.stderr?.on("data", lineSplitter(toLog));
      await Promise.race([new Promise((resolve) => stopper.on("close", resolve)), sleep(timeout)]);
    } else {
      killGroup(pid, spec.stopSignal ?? "SIGTERM");
    }
    const exited = await Promise.race([entry.exited.then(() => true), sleep(timeout).then(() => false)]);
    if (!exited) {
      this.say(`${spec.name} did not stop within ${timeout / 1000} s: killing it`);
      killGroup(pid, "SIGKILL");
      await Promise.race([entry.exited, sleep(5_000)]);
    }
    // Anything the process forked and left in its group goes too.
    killGroup(pid, "SIGKILL");
    this.say(`stopped ${spec.name}`);
  }
}

/** Starts the given processes in order (each waits for the previous one's readyCheck) under a new supervisor. */
export async function superviseProcesses(specs: ProcessSpec[], options: SupervisorOptions): Promise<Supervisor> {
  const supervisor = new Supervisor(options);
  try {
    for (const spec of specs) await supervisor.start(spec);
  } catch (error) {
    await supervisor.stopAll();
    throw error;
  }
  return supervisor;
}

export function describe(info: ExitInfo): string {
  return info.signal ? `signal ${info.signal}` : `code ${info.code}`;
}

function killGroup(pid: number, signal: NodeJS.Signals): void {
  try {
    process.kill(-pid, signal);
  } catch {
    // already gone
  }
}

function lineSplitter(onLine: (line: string) => void): (chunk: Buffer) => void {
  let pending = "";
  return (chunk) => {
    pending += chunk.toString("utf8");
    const lines = pending.split(/\r?\n/);
    pending = lines.pop() ?? "";
    for (const line of lines) onLine(line);
    if (pending.length > 64_000) {
      onLine(pending);
      pending = "";
    }
  };
}

// --- readiness checks ---------------------------------------------------------------------------------

/** True once something accepts TCP connections on host:port. */
export function portOpen(port: number, host = "127.0.0.1"): () => Promise<boolean> {
  return () => isPortOpen(port, host);
}

export async function isPortOpen(port: number, host = "127.0.0.1"): Promise<boolean> {
  const net = await import("node:net");
  return new Promise((resolve) => {
    const socket = net.connect({ port, host });
    const done = (open: boolean) => {
      socket.destroy();
      resolve(open);
    };
    socket.setTimeout(1000, () => done(false));
    socket.once("connect", () => done(true));
    socket.once("error", () => done(false));
  });
}

/** True once GET url answers with a 2xx status. */
export function httpOk(url: string): () => Promise<boolean> {
  return async () => {
    const response = await fetch(url, { signal: AbortSignal.timeout(3000) });
    await response.body?.cancel();
    return response.ok;
  };
}
