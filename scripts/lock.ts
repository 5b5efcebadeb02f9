// A pid lock file, so that a second `npm start` (or `npm test`) says clearly that one already runs.
// The file records the supervisor's pid and the pids of the process groups it started, so that a lock left
// behind by a supervisor that was killed (SIGKILL, power loss) is recognised as stale and its leftovers stopped.
import { closeSync, mkdirSync, openSync, readFileSync, renameSync, rmSync, writeFileSync, writeSync } from "node:fs";
import path from "node:path";

export interface LockInfo {
  pid: number;
  url?: string;
  startedAt: string;
  children: { name: string; pid: number; startTime?: string }[];
}

export type LockResult = { ok: true; lock: Lock; recovered: boolean } | { ok: false; holder: LockInfo };

export class Lock {
  private info: LockInfo;

  constructor(
    readonly file: string,
    info: LockInfo,
  ) {
    this.info = info;
  }

  update(patch: Partial<LockInfo>): void {
    this.info = { ...this.info, ...patch };
    if (patch.children) {
      this.info.children = patch.children.map((c) => ({ ...c, startTime: c.startTime ?? startTimeOf(c.pid) }));
    }
    const temp = `${this.file}.${process.pid}.tmp`;
    writeFileSync(temp, JSON.stringify(this.info, null, 2));
    renameSync(temp, this.file);
  }

  release(): void {
    try {
      const current = JSON.parse(readFileSync(this.file, "utf8")) as LockInfo;
      if (current.pid === process.pid) rmSync(this.file, { force: true });
    } catch {
      // gone already
    }
  }
}

/**
 * Takes the lock at `file` for this process. `marker` is a string found in the command line of a genuine
 * holder (e.g. "scripts/start.ts"); a lock whose pid is dead or runs something else is stale: the process
 * groups it recorded are killed (when their command line still matches) and the lock is taken over.
 */
export function acquireLock(file: string, marker: string, url?: string): LockResult {
  mkdirSync(path.dirname(file), { recursive: true });
  let recovered = false;
  for (let attempt = 0; attempt < 5; attempt++) {
    const info: LockInfo = { pid: process.pid, url, startedAt: new Date().toISOString(), children: [] };
    try {
      const fd = openSync(file, "wx");
      writeSync(fd, JSON.stringify(info, null, 2));
      closeSync(fd);
      return { ok: true, lock: new Lock(file, info), recovered };
    } catch (error) {
      if ((error as NodeJS.ErrnoException).code !== "EEXIST") throw error;
    }
    let holder: LockInfo | undefined;
    try {
      holder = JSON.parse(readFileSync(file, "utf8")) as LockInfo;
    } catch {
      holder = undefined; // half-written or unreadable: treat as stale after a moment
    }
    if (holder && isAlive(holder.pid) && (cmdlineOf(holder.pid) ?? "").includes(marker)) {
      return { ok: false, holder };
    }
    if (!holder && attempt === 0) {
      // A holder may be writing it right now.
      sleepSync(200);
      continue;
    }
    stopLeftovers(holder?.children ?? []);
    rmSync(file, { force: true });
    recovered = true;
  }
  throw new Error(`could not take the lock ${file}`);
}

/** SIGTERM to the recorded process groups whose leader is still the same process, SIGKILL after 5 s. */
function stopLeftovers(children: LockInfo["children"]): void {
  const leftovers = children.filter((c) => isAlive(c.pid) && c.startTime && startTimeOf(c.pid) === c.startTime);
  const signal = (pid: number, name: NodeJS.Signals) => {
    try {
      process.kill(-pid, name);
    } catch {
      // gone
    }
  };
  for (const child of leftovers) signal(child.pid, "SIGTERM");
  const deadline = Date.now() + 5000;
  while (leftovers.some((c) => isAlive(c.pid)) && Date.now() < deadline) sleepSync(100);
  for (const child of leftovers) signal(child.pid, "SIGKILL");
}

function sleepSync(ms: number): void {
  Atomics.wait(new Int32Array(new SharedArrayBuffer(4)), 0, 0, ms);
}

/** The process exists and is not a zombie waiting to be reaped. */
function isAlive(pid: number): boolean {
  try {
    const stat = readFileSync(`/proc/${pid}/stat`, "utf8");
    return stat.charAt(stat.lastIndexOf(")") + 2) !== "Z";
  } catch {
    return false;
  }
}

/** The process's start time (clock ticks since boot): with the pid, it identifies a process across pid reuse. */
function startTimeOf(pid: number): string | undefined {
  try {
    const stat = readFileSync(`/proc/${pid}/stat`, "utf8");
    return stat.slice(stat.lastIndexOf(")") + 2).split(" ")[19];
  } catch {
    return undefined;
  }
}

function cmdlineOf(pid: number): string | undefined {
  try {
    return readFileSync(`/proc/${pid}/cmdline`, "utf8").replaceAll("\0", " ").trim();
  } catch {
    return undefined;
  }
}
