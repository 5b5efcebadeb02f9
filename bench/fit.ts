// npm run bench:fit — least-squares solve and full inference at n = 100,000 and 1,000,000 rows,
// p = 10 and 20 terms, against ml-matrix's QrDecomposition on the same data in the same run.
// Each measurement runs in its own process (peak memory is per process). Prints a table; it
// asserts nothing about time (the machine is shared).
//
// Flags: --skip-baseline-large  skip ml-matrix at 1,000,000 × 20 (about 14 s and 1.6 GB)
//        --repetitions=N         timed repetitions per measurement (default 3; the best is shown)
import { spawnSync } from "node:child_process";
import { runChild } from "./fit-child";

const megabyte = 1024 * 1024;

interface EngineResult {
  solveSeconds: number;
  solveMedianSeconds: number;
  solveCpuSeconds: number;
  fullSeconds: number;
  fullMedianSeconds: number;
  fullCpuSeconds: number;
  solvePeakMegabytes: number;
  fullPeakMegabytes: number;
  fitPeakMegabytes: number;
  estimates: number[];
  refinementSteps: number;
  conditionNumber: number;
}

interface BaselineResult {
  seconds: number;
  cpuSeconds: number;
  peakMegabytes: number;
  estimates: number[];
}

function measure<T>(mode: string, rowCount: number, columnCount: number, repetitions: number): T {
  const child = spawnSync(
    process.execPath,
    [...process.execArgv, process.argv[1], "--child", mode, String(rowCount), String(columnCount), String(repetitions)],
    { encoding: "utf8", maxBuffer: 16 * megabyte },
  );
  if (child.status !== 0) throw new Error(`benchmark child ${mode} ${rowCount}×${columnCount} failed:\n${child.stderr}`);
  const lastLine = child.stdout.trim().split("\n").at(-1) ?? "";
  return JSON.parse(lastLine) as T;
}

function largestRelativeDifference(a: number[], b: number[]): number {
  return Math.max(...a.map((value, index) => Math.abs(value - b[index]) / Math.max(Math.abs(b[index]), 1e-300)));
}

function main(): void {
  const argumentsList = process.argv.slice(2);
  if (argumentsList[0] === "--child") {
    const [, mode, rows, columns, repetitions] = argumentsList;
    runChild(mode, Number(rows), Number(columns), Number(repetitions));
    return;
  }
  const skipLargeBaseline = argumentsList.includes("--skip-baseline-large");
  const repetitionsFlag = argumentsList.find((argument) => argument.startsWith("--repetitions="));
  const repetitions = repetitionsFlag ? Number(repetitionsFlag.split("=")[1]) : 3;
  const rows: string[] = [];
  rows.push(
    "      n     p | data MB | solve s (cpu)    GFLOP/s  peak MB  ×data | full s (cpu)  fit peak ×data  all-diag peak ×data | ml-matrix s (cpu)   peak MB | speed-up | max rel. diff β | κ",
  );
  for (const rowCount of [100_000, 1_000_000]) {
    for (const columnCount of [10, 20]) {
      const engine = measure<EngineResult>("engine", rowCount, columnCount, repetitions);
      const dataMegabytes = (rowCount * (columnCount + 1) * 8) / megabyte;
      const flops = 2 * rowCount * columnCount ** 2 - (2 * columnCount ** 3) / 3;
      let baselineText = "           skipped           ";
      let speedUp = "      —";
      let agreement = "              —";
      if (!(skipLargeBaseline && rowCount === 1_000_000 && columnCount === 20)) {
        const baseline = measure<BaselineResult>("ml-matrix", rowCount, columnCount, 1);
        baselineText = `${baseline.seconds.toFixed(2).padStart(11)} (${baseline.cpuSeconds.toFixed(2).padStart(5)})  ${baseline.peakMegabytes
          .toFixed(0)
          .padStart(7)}`;
        speedUp = `${(baseline.seconds / engine.solveSeconds).toFixed(1).padStart(7)}×`;
        agreement = largestRelativeDifference(engine.estimates, baseline.estimates).toExponential(1).padStart(15);
      }
      rows.push(
        [
          `${String(rowCount).padStart(7)} ${String(columnCount).padStart(5)}`,
          `${dataMegabytes.toFixed(0).padStart(7)}`,
          `${engine.solveSeconds.toFixed(3).padStart(7)} (${engine.solveCpuSeconds.toFixed(3)})  ${(flops / engine.solveSeconds / 1e9)
            .toFixed(2)
            .padStart(7)}  ${engine.solvePeakMegabytes
            .toFixed(1)
            .padStart(7)}  ${(1 + engine.solvePeakMegabytes / dataMegabytes).toFixed(2).padStart(5)}`,
          `${engine.fullSeconds.toFixed(3).padStart(6)} (${engine.fullCpuSeconds.toFixed(3)})  ${engine.fitPeakMegabytes.toFixed(1).padStart(7)}  ${(1 + engine.fitPeakMegabytes / dataMegabytes)
            .toFixed(2)
            .padStart(5)}  ${engine.fullPeakMegabytes.toFixed(1).padStart(12)}  ${(1 + engine.fullPeakMegabytes / dataMegabytes).toFixed(2).padStart(5)}`,
          baselineText,
          speedUp,
          agreement,
          `${engine.conditionNumber.toFixed(0)}${engine.refinementSteps > 0 ? ` (refined ${engine.refinementSteps})` : ""}`,
        ].join(" | "),
      );
      console.log(rows.at(-1));
    }
  }
  console.log(
    [
      "",
      rows.join("\n"),
      "",
      "data MB: the design matrix and outcome (n × (p + 1) doubles). peak MB: growth of peak resident memory",
      "above the process's footprint with the data loaded (getrusage maxRSS). ×data: (data + peak) / data.",
      "solve: solveLeastSquares (QR, aliasing check, β, (XᵀX)⁻¹, error bound; refinement only if needed).",
      "full: fitLeastSquares plus reading every diagnostic (fitted, studentized, externally studentized, Cook's);",
      "fit peak: after fitLeastSquares (inference, residuals and leverages: two n-length arrays, 16 MB at n = 10⁶);",
      "all-diag peak: after also reading the four optional diagnostics (four more n-length arrays, 32 MB at n = 10⁶).",
      "GFLOP/s counts the Householder QR's 2np² − 2p³/3 over the wall time. Times are the best of the repetitions;",
      "(cpu) is the process's user + system CPU time for the same run, a steadier figure when other work shares the cores.",
    ].join("\n"),
  );
}

main();
