// The supervisor of `npm start`/`npm test`: readiness, logs, process groups, unexpected exits.
import { existsSync, mkdtempSync, readFileSync, rmSync } from "node:fs";
import { tmpdir } from "node:os";
import path from "node:path";
import { afterEach, beforeEach, expect, test } from "vitest";
import { superviseProcesses, Supervisor } from "@/scripts/supervisor";

let logDir: string;
let supervisor: Supervisor | undefined;

beforeEach(() => {
  logDir = mkdtempSync(path.join(tmpdir(), "tributary-supervisor-"));
});

afterEach(async () => {
  await supervisor?.stopAll();
  supervisor = undefined;
  rmSync(logDir, { recursive: true, force: true });
});

/** Running (a zombie waiting for its reaper counts as gone). */
const alive = (pid: number) => {
  try {
    const stat = readFileSync(`/proc/${pid}/stat`, "utf8");
    return stat.charAt(stat.lastIndexOf(")") + 2) !== "Z";
  } catch {
    return false;
  }
};

test("waits for readiness, logs each process, and stops whole process groups", async () => {
  const marker = path.join(logDir, "ready");
  supervisor = await superviseProcesses(
    [
      {
        name: "forker",
        command: "bash",
        // A grandchild the supervisor never sees directly: it must go when the group is stopped.
        args: ["-c", `sleep 300 & echo "child $!"; touch ${marker}; wait`],
        readyCheck: async () => existsSync(marker),
        console: "none",
      },
    ],
    { logDir, label: "t" },
  );
  await new Promise((resolve) => setTimeout(resolve, 200));
  const log = readFileSync(path.join(logDir, "forker.log"), "utf8");
  const grandchild = Number(/child (\d+)/.exec(log)?.[1]);
  expect(alive(grandchild)).toBe(true);
  await supervisor.stopAll();
  await new Promise((resolve) => setTimeout(resolve, 200));
  expect(alive(grandchild)).toBe(false);
  expect(readFileSync(path.join(logDir, "forker.log"), "utf8")).toMatch(/exited \(signal SIGTERM\)/);
});

test("reports the first process that exits on its own", async () => {
  supervisor = new Supervisor({ logDir, label: "t" });
  await supervisor.start({ name: "steady", command: "sleep", args: ["300"], console: "none" });
  await supervisor.start({ name: "crasher", command: "bash", args: ["-c", "echo boom; exit 3"], console: "none" });
  const exit = await supervisor.firstExit();
  expect(exit).toEqual({ name: "crasher", code: 3, signal: null });
  expect(supervisor.pids().map((p) => p.name)).toEqual(["steady"]);
});

test("start() fails clearly when a process dies before it is ready", async () => {
  supervisor = new Supervisor({ logDir, label: "t" });
  await expect(
    supervisor.start({ name: "never", command: "bash", args: ["-c", "exit 1"], readyCheck: async () => false, console: "none" }),
  ).rejects.toThrow(/never exited \(code 1\) before it was ready/);
});

test("one-shot commands return their exit code", async () => {
  supervisor = new Supervisor({ logDir, label: "t" });
  expect(await supervisor.run({ name: "ok", command: "true", console: "none" })).toBe(0);
  expect(await supervisor.run({ name: "no", command: "bash", args: ["-c", "exit 4"], console: "none" })).toBe(4);
  expect(await supervisor.run({ name: "missing", command: "/nonexistent/binary", console: "none" })).toBe(127);
});
