import { linearScale } from "./linear-scale";
import { chartColors } from "./palette";

export type IntervalRowProps = {
  /** Shared horizontal domain of every row in the column, so rows can be compared by eye. */
  domain: readonly [number, number];
  point: number | null;
  /** Confidence interval: the darker band. */
  confidence?: readonly [number, number] | null;
  /** Prediction interval: the pale band around it (outcomes only). */
  prediction?: readonly [number, number] | null;
  /** A vertical reference line, e.g. zero for coefficients or the starting plan for outcomes. */
  reference?: number | null;
  width?: number;
  height?: number;
  /** Text for assistive technology, e.g. "estimate 2.1, 95% interval 0.4 to 3.8". */
  label: string;
  /** Draws the row's band and tick in ember (a warning; always paired with words elsewhere). */
  tone?: "normal" | "warning";
};

/**
 * One interval drawn the Tributary way: pale shallows band for the prediction interval, a darker
 * band inside it for the confidence interval, a solid tick for the point. Used beside coefficient
 * rows and, later, beside every outcome a scenario shows.
 */
export function IntervalRow({ domain, point, confidence, prediction, reference, width = 220, height = 22, label, tone = "normal" }: IntervalRowProps) {
  const padding = 6;
  const scale = linearScale(domain, [padding, width - padding], { clamp: true });
  const mid = height / 2;
  const band = (interval: readonly [number, number], thickness: number, fill: string) => {
    const x0 = scale(Math.min(interval[0], interval[1]));
    const x1 = scale(Math.max(interval[0], interval[1]));
    return <rect x={x0} y={mid - thickness / 2} width={Math.max(1, x1 - x0)} height={thickness} rx={thickness / 3} fill={fill} />;
  };
  const strong = tone === "warning" ? chartColors.ember : chartColors.river;
  return (
    <svg width={width} height={height} viewBox={`0 0 ${width} ${height}`} role="img" aria-label={label} className="block">
      <title>{label}</title>
      {reference !== undefined && reference !== null && reference >= domain[0] && reference <= domain[1] ? (
        <line x1={scale(reference)} x2={scale(reference)} y1={1} y2={height - 1} stroke={chartColors.axis} strokeDasharray="2 2" strokeWidth={1} />
      ) : null}
      {prediction ? band(prediction, height * 0.62, chartColors.shallowsPale) : null}
      {confidence ? band(confidence, height * 0.34, tone === "warning" ? "#e9a999" : chartColors.shallowsMid) : null}
      {point !== null && Number.isFinite(point) ? (
        <line x1={scale(point)} x2={scale(point)} y1={mid - height * 0.36} y2={mid + height * 0.36} stroke={strong} strokeWidth={2.5} />
      ) : null}
    </svg>
  );
}

/** A domain covering every interval and the reference, with a little air on both sides. */
export function intervalDomain(values: readonly (number | null | undefined)[], reference: number | null = 0): [number, number] {
  const finite = values.filter((value): value is number => typeof value === "number" && Number.isFinite(value));
  if (reference !== null) finite.push(reference);
  if (finite.length === 0) return [-1, 1];
  let low = Math.min(...finite);
  let high = Math.max(...finite);
  if (low === high) {
    low -= Math.abs(low) * 0.1 || 1;
    high += Math.abs(high) * 0.1 || 1;
  }
  const air = (high - low) * 0.05;
  return [low - air, high + air];
}
