import type { LinearScale } from "./linear-scale";
import { chartColors, tickLabelProps } from "./palette";

export interface BottomAxisProps {
  scale: LinearScale;
  /** About this many ticks (round values). */
  numTicks: number;
  tickFormat: (value: number) => string;
  /** Vertical offset of the axis line inside the svg. */
  top?: number;
  tickLength?: number;
}

/** A horizontal axis below a drawing: a hairline, short ticks and their labels centred under them. */
export function BottomAxis({ scale, numTicks, tickFormat, top = 0, tickLength = 4 }: BottomAxisProps) {
  const [x0, x1] = scale.range;
  return (
    <g transform={`translate(0, ${top})`}>
      <line x1={Math.min(x0, x1)} x2={Math.max(x0, x1)} y1={0} y2={0} stroke={chartColors.grid} shapeRendering="crispEdges" />
      {scale.ticks(numTicks).map((value) => {
        const x = scale(value);
        return (
          <g key={value}>
            <line x1={x} x2={x} y1={0} y2={tickLength} stroke={chartColors.grid} />
            <text x={x} y={tickLength + tickLabelProps.fontSize} textAnchor="middle" {...tickLabelProps}>
              {tickFormat(value)}
            </text>
          </g>
        );
      })}
    </g>
  );
}
