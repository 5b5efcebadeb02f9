import type { LinearScale } from "./linear-scale";
import { chartColors, tickLabelProps } from "./palette";
import { tickAnchor } from "./tick-anchor";

export interface BottomAxisProps {
  scale: LinearScale;
  /** About this many ticks (round values). */
  numTicks: number;
  tickFormat: (value: number) => string;
  /** Vertical offset of the axis line inside the svg. */
  top?: number;
  tickLength?: number;
}

/**
 * A horizontal axis below a drawing: a hairline, short ticks and their labels centred under them. A label
 * that would stick out past either end of the axis is aligned to its tick instead, so it is never cut off.
 */
export function BottomAxis({ scale, numTicks, tickFormat, top = 0, tickLength = 4 }: BottomAxisProps) {
  const [x0, x1] = scale.range;
  const [left, right] = [Math.min(x0, x1), Math.max(x0, x1)];
  return (
    <g transform={`translate(0, ${top})`}>
      <line x1={left} x2={right} y1={0} y2={0} stroke={chartColors.grid} shapeRendering="crispEdges" />
      {scale.ticks(numTicks).map((value) => {
        const x = scale(value);
        const label = tickFormat(value);
        const anchor = tickAnchor(x, label, [left, right]);
        return (
          <g key={value}>
            <line x1={x} x2={x} y1={0} y2={tickLength} stroke={chartColors.grid} />
            <text x={x} y={tickLength + tickLabelProps.fontSize} textAnchor={anchor} {...tickLabelProps}>
              {label}
            </text>
          </g>
        );
      })}
    </g>
  );
}
