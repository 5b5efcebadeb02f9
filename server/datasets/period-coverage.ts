// Whether a history's periods come at one steady step: missing weeks break what fits assume of
// time order (Durbin–Watson, Newey–West, the held-out check all take neighbouring rows as neighbouring
// periods), so the spend history's page says where the gaps are.

export type PeriodGap = { after: string; before: string; missing: number };

export type PeriodCoverage = {
  /** The usual distance between neighbouring periods: days for dates, units for numbered periods. */
  step: number;
  unit: "days" | "periods";
  gaps: PeriodGap[];
  /** Periods missing over all gaps. */
  missing: number;
};

const dayNumber = (label: string) => Date.parse(`${label}T00:00:00Z`) / 86_400_000;

/**
 * The step (the median distance between neighbouring periods) and every place where the distance is
 * more than one and a half steps, with how many periods that leaves out. Labels are ISO dates or whole
 * numbers, in period order (as loadDatasetFrame gives them). Null with fewer than three periods.
 */
export function periodCoverage(labels: readonly string[]): PeriodCoverage | null {
  if (labels.length < 3) return null;
  const dated = /^\d{4}-\d{2}-\d{2}$/.test(labels[0]);
  const positions = labels.map((label) => (dated ? dayNumber(label) : Number(label)));
  if (positions.some((value) => !Number.isFinite(value))) return null;
  const distances = positions.slice(1).map((value, index) => value - positions[index]);
  const sorted = [...distances].sort((a, b) => a - b);
  const step = sorted[Math.floor(sorted.length / 2)];
  if (!(step > 0)) return null;
  const gaps: PeriodGap[] = [];
  distances.forEach((distance, index) => {
    if (distance > 1.5 * step) gaps.push({ after: labels[index], before: labels[index + 1], missing: Math.round(distance / step) - 1 });
  });
  return { step, unit: dated ? "days" : "periods", gaps, missing: gaps.reduce((sum, gap) => sum + gap.missing, 0) };
}

/** The coverage in one sentence for the history's page. */
export function describeCoverage(coverage: PeriodCoverage): string {
  const every = coverage.unit === "days" ? (coverage.step === 7 ? "every week (7 days)" : `every ${coverage.step} days`) : `every ${coverage.step} period${coverage.step === 1 ? "" : "s"}`;
  if (coverage.gaps.length === 0) return `One row ${every}, no gaps.`;
  const shown = coverage.gaps.slice(0, 5).map((gap) => `${gap.missing} missing between ${gap.after} and ${gap.before}`);
  return `One row ${every}, except ${coverage.gaps.length} ${coverage.gaps.length === 1 ? "gap" : "gaps"} (${coverage.missing} ${coverage.missing === 1 ? "period" : "periods"} missing): ${shown.join("; ")}${
    coverage.gaps.length > 5 ? "; …" : ""
  }. Fits treat neighbouring rows as neighbouring periods (Durbin–Watson, Newey–West, the held-out check): fill the gaps, or read those figures with care.`;
}
