// Runs a benchmark script as its own process (its memory and JIT are its own), echoing its output with a
// prefix and keeping it for parsing.
import { spawn } from "node:child_process";

export interface ChildResult {
  code: number | null;
  output: string;
}

export function runChild(label: string, args: string[], env: Record<string, string | undefined> = {}): Promise<ChildResult> {
  return new Promise((resolve) => {
    const child = spawn(process.execPath, args, { env: { ...process.env, ...env }, stdio: ["ignore", "pipe", "pipe"] });
    let output = "";
    const echo = (chunk: Buffer) => {
      const text = chunk.toString("utf8");
      output += text;
      for (const line of text.split("\n")) if (line.trim() && !line.startsWith("{")) process.stdout.write(`[${label}] ${line}\n`);
    };
    child.stdout.on("data", echo);
    child.stderr.on("data", echo);
    child.on("error", (error) => {
      output += `\n${error.message}`;
      resolve({ code: 127, output });
    });
    child.on("close", (code) => resolve({ code, output }));
  });
}

/** The last few non-JSON lines of a failed child's output, for the table's note. */
export function tail(output: string, lines = 3): string {
  return output
    .trim()
    .split("\n")
    .filter((line) => line.trim() && !line.startsWith("{"))
    .slice(-lines)
    .join(" / ")
    .slice(0, 400);
}
