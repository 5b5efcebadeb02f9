import { chartColors } from "./palette";
import { ScatterPlot, type ScatterLine, type ScatterPoint } from "./scatter-plot";

const two = (v: number) => (Math.abs(v) >= 100 ? v.toFixed(0) : Math.abs(v) >= 10 ? v.toFixed(1) : v.toFixed(2));

/** Residuals against fitted values, with the zero line; points beyond ±3 standardized residuals are highlighted. */
export function ResidualsVsFittedPlot(props: {
  fitted: readonly number[];
  residuals: readonly number[];
  standardized: readonly (number | null)[];
  rowLabels: readonly string[];
  formatValue: (value: number) => string;
  unitLabel: string;
}) {
  const points: ScatterPoint[] = props.fitted.map((fitted, index) => {
    const z = props.standardized[index];
    return {
      x: fitted,
      y: props.residuals[index],
      highlight: z !== null && Math.abs(z) > 3,
      title: `${props.rowLabels[index]}: fitted ${props.formatValue(fitted)}, residual ${props.formatValue(props.residuals[index])}`,
    };
  });
  return (
    <ScatterPlot
      title="Residuals vs fitted"
      points={points}
      xLabel={`Fitted value (${props.unitLabel})`}
      yLabel={`Residual (${props.unitLabel})`}
      formatX={props.formatValue}
      formatY={props.formatValue}
      yReferences={[0]}
      footer="A shapeless band around zero is what a well-specified linear model gives; a curve or a funnel is worth a look. Ember points: |standardized residual| > 3."
    />
  );
}

/** Normal Q–Q plot of standardized residuals with the y = x reference line. */
export function NormalQqPlot(props: { theoretical: readonly number[]; sample: readonly number[] }) {
  const points: ScatterPoint[] = props.theoretical.map((t, index) => ({
    x: t,
    y: props.sample[index],
    title: `normal quantile ${t.toFixed(2)}, standardized residual ${props.sample[index].toFixed(2)}`,
  }));
  const all = [...props.theoretical, ...props.sample].filter(Number.isFinite);
  const low = Math.min(-3, ...all);
  const high = Math.max(3, ...all);
  return (
    <ScatterPlot
      title="Normal Q–Q of standardized residuals"
      points={points}
      xLabel="Standard normal quantile (no unit)"
      yLabel="Standardized residual (no unit)"
      formatX={two}
      formatY={two}
      xDomain={[low, high]}
      yDomain={[low, high]}
      lines={[{ points: [[low, low], [high, high]], color: chartColors.river, dashed: true }]}
      footer="Points near the dashed line mean the residuals look normal; bends at the ends mean heavier or lighter tails."
    />
  );
}

/**
 * Standardized residuals against leverage, with Cook's distance contours (D = 0.5 and D = 1):
 * points beyond a contour move the coefficients noticeably. D = e²h / (p(1 − h)), so the contour
 * is e = ±√(D p (1 − h) / h).
 */
export function LeverageResidualsPlot(props: {
  leverage: readonly number[];
  standardized: readonly (number | null)[];
  cooks: readonly (number | null)[];
  rowLabels: readonly string[];
  /** Rank p of the model (number of estimated coefficients). */
  parameterCount: number;
}) {
  const points: ScatterPoint[] = [];
  props.leverage.forEach((h, index) => {
    const z = props.standardized[index];
    if (z === null) return;
    const d = props.cooks[index];
    points.push({
      x: h,
      y: z,
      highlight: d !== null && d >= 0.5,
      title: `${props.rowLabels[index]}: leverage ${h.toFixed(3)}, standardized residual ${z.toFixed(2)}, Cook's distance ${d === null ? "—" : d.toFixed(3)}`,
    });
  });
  const maxLeverage = Math.max(0.05, ...props.leverage.filter(Number.isFinite)) * 1.08;
  let largest: { d: number; label: string } | null = null;
  props.cooks.forEach((d, index) => {
    if (d !== null && Number.isFinite(d) && (largest === null || d > largest.d)) largest = { d, label: props.rowLabels[index] };
  });
  const top = largest as { d: number; label: string } | null;
  const zs = points.map((p) => p.y);
  const yLimit = Math.max(3, ...zs.map(Math.abs)) * 1.05;
  const contour = (distance: number, sign: 1 | -1): ScatterLine => {
    const line: [number, number][] = [];
    for (let step = 1; step <= 60; step++) {
      const h = (maxLeverage * step) / 60;
      if (h >= 1) break;
      line.push([h, sign * Math.sqrt((distance * props.parameterCount * (1 - h)) / h)]);
    }
    return { points: line, dashed: distance === 0.5, color: chartColors.ember };
  };
  return (
    <ScatterPlot
      title="Leverage vs standardized residuals"
      points={points}
      xLabel="Leverage (hat value, no unit)"
      yLabel="Standardized residual (no unit)"
      formatX={(v) => v.toFixed(2)}
      formatY={two}
      xDomain={[0, maxLeverage]}
      yDomain={[-yLimit, yLimit]}
      yReferences={[0]}
      lines={[contour(0.5, 1), contour(0.5, -1), contour(1, 1), contour(1, -1)]}
      footer={
        <>
          Ember curves: Cook&apos;s distance 0.5 (dashed) and 1 (solid); rows beyond them pull the coefficients noticeably and are drawn in ember.{" "}
          {top ? (
            top.d >= 0.5 ? (
              <strong>
                Largest Cook&apos;s distance: {top.d.toFixed(2)} ({top.label}).
              </strong>
            ) : (
              `Largest Cook's distance: ${top.d.toFixed(3)} (${top.label}), well inside the contours${
                Math.sqrt((0.5 * props.parameterCount * (1 - maxLeverage)) / maxLeverage) > yLimit ? ", which lie beyond the plotted area" : ""
              }.`
            )
          ) : null}
        </>
      }
    />
  );
}
