// One measurement in a fresh process, so that peak resident memory (getrusage's maxRSS) belongs
// to this measurement alone. Prints one JSON line.
import { Matrix, QrDecomposition } from "ml-matrix";
import { fitLeastSquares, solveLeastSquares } from "../server/stats";
import { generateDesign } from "./fit-data";

const gc = (globalThis as { gc?: () => void }).gc ?? (() => {});
const megabyte = 1024 * 1024;

function peakResidentBytes(): number {
  return process.resourceUsage().maxRSS * 1024;
}

/** User + system CPU time: less disturbed than wall time when other work shares the cores. */
function cpuSeconds(usage: NodeJS.CpuUsage): number {
  return (usage.user + usage.system) / 1e6;
}

function median(values: number[]): number {
  const sorted = [...values].sort((a, b) => a - b);
  return sorted[Math.floor(sorted.length / 2)];
}

export function runChild(mode: string, rowCount: number, columnCount: number, repetitions: number): void {
  if (mode === "engine") {
    // Warm the JIT on a small problem of the same shape first (small, so the allocator keeps
    // little memory from it that the measured fit could reuse unseen).
    const warm = generateDesign(5_000, columnCount, 7);
    fitLeastSquares(warm);
    solveLeastSquares(warm);
    const design = generateDesign(rowCount, columnCount);
    gc();
    const baseline = process.memoryUsage().rss;
    const solveSeconds: number[] = [];
    const solveCpuSeconds: number[] = [];
    let estimates: number[] = [];
    let refinementSteps = 0;
    for (let repetition = 0; repetition < repetitions; repetition++) {
      // Collect the previous repetition's results first, so peaks do not stack across repetitions.
      gc();
      const start = performance.now();
      const cpuStart = process.cpuUsage();
      const solution = solveLeastSquares(design);
      solveSeconds.push((performance.now() - start) / 1000);
      solveCpuSeconds.push(cpuSeconds(process.cpuUsage(cpuStart)));
      estimates = Array.from(solution.estimates);
      refinementSteps = solution.accuracy.solutionRefinementSteps + solution.accuracy.inverseRefinementSteps;
    }
    const solvePeak = peakResidentBytes() - baseline;
    gc();
    const fullSeconds: number[] = [];
    const fullCpuSeconds: number[] = [];
    let conditionNumber = 0;
    let fullPeak = 0;
    let fitPeak = 0;
    for (let repetition = 0; repetition < repetitions; repetition++) {
      gc();
      const start = performance.now();
      const cpuStart = process.cpuUsage();
      const fit = fitLeastSquares(design);
      // The fit as the app keeps it: inference, residuals and leverages; the other diagnostics wait to be read.
      if (repetition === 0) fitPeak = peakResidentBytes() - baseline;
      // Read every lazily computed diagnostic so the timing covers all of them.
      const touched =
        fit.fittedValues[0] + fit.studentizedResiduals[0] + fit.externallyStudentizedResiduals[0] + fit.cooksDistances[0];
      fullSeconds.push((performance.now() - start) / 1000);
      fullCpuSeconds.push(cpuSeconds(process.cpuUsage(cpuStart)));
      conditionNumber = fit.conditionNumber + 0 * touched;
      // Peak of the first repetition only: freed buffers are not always returned to the system at
      // once, so later repetitions would stack on memory the allocator still holds.
      if (repetition === 0) fullPeak = peakResidentBytes() - baseline;
    }
    console.log(
      JSON.stringify({
        solveSeconds: Math.min(...solveSeconds),
        solveMedianSeconds: median(solveSeconds),
        solveCpuSeconds: Math.min(...solveCpuSeconds),
        fullSeconds: Math.min(...fullSeconds),
        fullMedianSeconds: median(fullSeconds),
        fullCpuSeconds: Math.min(...fullCpuSeconds),
        solvePeakMegabytes: solvePeak / megabyte,
        fullPeakMegabytes: fullPeak / megabyte,
        fitPeakMegabytes: fitPeak / megabyte,
        estimates,
        refinementSteps,
        conditionNumber,
      }),
    );
    return;
  }
  // ml-matrix baseline: the same data as an ml-matrix Matrix, then QrDecomposition(X).solve(y).
  const design = generateDesign(rowCount, columnCount);
  const matrix = new Matrix(rowCount, columnCount);
  for (let column = 0; column < columnCount; column++) {
    for (let row = 0; row < rowCount; row++) matrix.set(row, column, design.values[column * rowCount + row]);
  }
  const outcome = Matrix.columnVector(Array.from(design.outcome));
  gc();
  const baseline = process.memoryUsage().rss;
  const start = performance.now();
  const cpuStart = process.cpuUsage();
  const solution = new QrDecomposition(matrix).solve(outcome);
  const seconds = (performance.now() - start) / 1000;
  const cpu = cpuSeconds(process.cpuUsage(cpuStart));
  console.log(
    JSON.stringify({
      seconds,
      cpuSeconds: cpu,
      peakMegabytes: (peakResidentBytes() - baseline) / megabyte,
      estimates: solution.to1DArray(),
    }),
  );
}
