// What every benchmark reports to `npm run bench` (bench/index.ts): rows of one table.

export interface BenchRow {
  /** What was measured, e.g. "fit 1,000,000 × 20: solve". */
  name: string;
  /** The figure, already formatted with its unit ("0.62 s", "812 req/s"), or "—" when not measured. */
  measured: string;
  /** The target in words ("≤ 0.7 s and ≥ 20× baseline"). */
  target: string;
  /** The baseline measured in the same run, formatted with what it is ("ml-matrix QR 14.2 s"); "" when none. */
  baseline: string;
  /** measured relative to the baseline ("21.4×", "63%"); "" when there is no baseline. */
  ratio: string;
  /** true: target met; false: missed; null: no target or not measured. */
  met: boolean | null;
  /** Why a row was not measured, or a caveat. */
  note?: string;
}

/** The line a benchmark prints last with `--json` (or that bench/index.ts builds from its JSON). */
export interface BenchReport {
  bench: string;
  rows: BenchRow[];
}

export const fmt = {
  seconds: (s: number) => `${s < 10 ? s.toFixed(2) : s.toFixed(1)} s`,
  ms: (ms: number) => `${ms < 10 ? ms.toFixed(1) : ms.toFixed(0)} ms`,
  int: (n: number) => Math.round(n).toLocaleString("en-US"),
  mb: (bytes: number) => `${(bytes / (1024 * 1024)).toFixed(0)} MB`,
  kb: (bytes: number) => `${(bytes / 1024).toFixed(1)} kB`,
  percent: (x: number) => `${(x * 100).toFixed(0)}%`,
  times: (x: number) => `${x.toFixed(x < 10 ? 2 : 1)}×`,
};

export function notMeasured(name: string, target: string, reason: string): BenchRow {
  return { name, measured: "—", target, baseline: "", ratio: "", met: null, note: reason };
}

/** Prints rows as one aligned text table (name, measured, target, baseline, ratio, met) with notes below. */
export function formatTable(rows: BenchRow[]): string {
  const header = ["name", "measured", "target", "baseline (same run)", "ratio", "met"];
  const cells = rows.map((row, index) => [
    row.note ? `${row.name} [${noteMark(rows, index)}]` : row.name,
    row.measured,
    row.target,
    row.baseline || "—",
    row.ratio || "—",
    row.met === null ? "—" : row.met ? "yes" : "NO",
  ]);
  const widths = header.map((h, i) => Math.max(h.length, ...cells.map((c) => c[i].length)));
  const line = (values: string[]) => values.map((v, i) => v.padEnd(widths[i])).join(" | ").trimEnd();
  const out = [line(header), widths.map((w) => "-".repeat(w)).join("-+-"), ...cells.map(line)];
  const notes = rows.filter((row) => row.note);
  if (notes.length > 0) {
    out.push("");
    notes.forEach((row) => out.push(`[${noteMark(rows, rows.indexOf(row))}] ${row.note}`));
  }
  return out.join("\n");
}

function noteMark(rows: BenchRow[], index: number): number {
  return rows.slice(0, index + 1).filter((row) => row.note).length;
}

/** The last line of `output` that is a JSON object (what `--json` prints), parsed; null when none. */
export function lastJsonLine<T>(output: string): T | null {
  const lines = output.trim().split("\n").reverse();
  for (const line of lines) {
    const trimmed = line.trim();
    if (!trimmed.startsWith("{")) continue;
    try {
      return JSON.parse(trimmed) as T;
    } catch {
      // not this one
    }
  }
  return null;
}

export const percentile = (values: number[], p: number) => {
  const sorted = [...values].sort((a, b) => a - b);
  return sorted[Math.min(sorted.length - 1, Math.max(0, Math.ceil((p / 100) * sorted.length) - 1))];
};

/** True when the module at `moduleUrl` is the script node was started with (not imported by bench/index.ts). */
export function isMain(moduleUrl: string): boolean {
  if (!process.argv[1]) return false;
  const script = process.argv[1].replace(/\.ts$/, "");
  return new URL(moduleUrl).pathname.replace(/\.ts$/, "") === (script.startsWith("/") ? script : `${process.cwd()}/${script}`);
}
