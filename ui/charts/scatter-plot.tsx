import { AxisBottom, AxisLeft } from "@visx/axis";
import { Group } from "@visx/group";
import { scaleLinear } from "@visx/scale";
import { LinePath } from "@visx/shape";
import type { ReactNode } from "react";
import { axisLabelProps, chartColors, tickLabelProps } from "./palette";

export type ScatterPoint = { x: number; y: number; title?: string; highlight?: boolean };

export type ScatterLine = {
  points: readonly (readonly [number, number])[];
  label?: string;
  dashed?: boolean;
  color?: string;
};

export type ScatterPlotProps = {
  title: string;
  points: readonly ScatterPoint[];
  xLabel: string;
  yLabel: string;
  formatX?: (value: number) => string;
  formatY?: (value: number) => string;
  /** Horizontal reference lines (e.g. y = 0). */
  yReferences?: readonly number[];
  /** Extra lines: a Q–Q reference line, Cook's distance contours… Clipped to the plot. */
  lines?: readonly ScatterLine[];
  /** Force the domains (otherwise the points' extent with a little air). */
  xDomain?: readonly [number, number];
  yDomain?: readonly [number, number];
  width?: number;
  height?: number;
  /** A short legend or note under the plot. */
  footer?: ReactNode;
};

/** One decimal of a pixel is plenty and keeps large plots small. */
const round = (value: number) => Math.round(value * 10) / 10;

function extent(values: readonly number[], include: readonly number[] = []): [number, number] {
  const all = [...values, ...include].filter(Number.isFinite);
  if (all.length === 0) return [0, 1];
  let low = Math.min(...all);
  let high = Math.max(...all);
  if (low === high) {
    low -= 1;
    high += 1;
  }
  const air = (high - low) * 0.06;
  return [low - air, high + air];
}

/** A generic scatter plot with axes, reference lines and optional curves (server-renderable SVG). */
export function ScatterPlot({
  title,
  points,
  xLabel,
  yLabel,
  formatX = (v) => String(v),
  formatY = (v) => String(v),
  yReferences = [],
  lines = [],
  xDomain,
  yDomain,
  width = 520,
  height = 340,
  footer,
}: ScatterPlotProps) {
  const margin = { top: 12, right: 16, bottom: 48, left: 72 };
  const innerWidth = width - margin.left - margin.right;
  const innerHeight = height - margin.top - margin.bottom;
  const x = scaleLinear<number>({ domain: xDomain ? [...xDomain] : extent(points.map((p) => p.x)), range: [0, innerWidth], nice: !xDomain });
  const y = scaleLinear<number>({
    domain: yDomain ? [...yDomain] : extent(points.map((p) => p.y), yReferences),
    range: [innerHeight, 0],
    nice: !yDomain,
  });
  // Deterministic, so server and client render the same id; titles differ between plots on a page.
  const clipId = `scatter-clip-${title.toLowerCase().replace(/[^a-z0-9]+/g, "-")}`;
  return (
    <figure className="min-w-0">
      <figcaption className="mb-1 text-sm font-medium text-river">{title}</figcaption>
      <svg viewBox={`0 0 ${width} ${height}`} width="100%" role="img" aria-label={`${title}: ${points.length} points`} className="max-w-full">
        <defs>
          <clipPath id={clipId}>
            <rect x={0} y={0} width={innerWidth} height={innerHeight} />
          </clipPath>
        </defs>
        <Group left={margin.left} top={margin.top}>
          <rect x={0} y={0} width={innerWidth} height={innerHeight} fill="white" stroke={chartColors.grid} />
          {y.ticks(5).map((tick) => (
            <line key={`gy-${tick}`} x1={0} x2={innerWidth} y1={y(tick)} y2={y(tick)} stroke={chartColors.grid} />
          ))}
          {yReferences.map((value) => (
            <line key={`ref-${value}`} x1={0} x2={innerWidth} y1={y(value)} y2={y(value)} stroke={chartColors.axis} strokeDasharray="4 3" />
          ))}
          <g clipPath={`url(#${clipId})`}>
            {lines.map((line, index) => (
              <LinePath
                key={`line-${index}`}
                data={line.points as [number, number][]}
                x={(d) => x(d[0])}
                y={(d) => y(d[1])}
                stroke={line.color ?? chartColors.ember}
                strokeWidth={1.5}
                strokeDasharray={line.dashed ? "5 4" : undefined}
                fill="none"
              />
            ))}
            {points.map((point, index) => (
              <circle
                key={index}
                cx={round(x(point.x))}
                cy={round(y(point.y))}
                r={point.highlight ? 3.6 : 2.6}
                fill={point.highlight ? chartColors.ember : chartColors.shallows}
                fillOpacity={point.highlight ? 0.95 : 0.6}
              >
                {point.title ? <title>{point.title}</title> : null}
              </circle>
            ))}
          </g>
          <AxisLeft
            scale={y}
            numTicks={5}
            tickFormat={(v) => formatY(Number(v))}
            stroke={chartColors.axis}
            tickStroke={chartColors.axis}
            tickLabelProps={() => ({ ...tickLabelProps, textAnchor: "end", dx: -4, dy: 4 })}
            label={yLabel}
            labelProps={{ ...axisLabelProps, textAnchor: "middle" }}
            labelOffset={48}
          />
          <AxisBottom
            top={innerHeight}
            scale={x}
            numTicks={5}
            tickFormat={(v) => formatX(Number(v))}
            stroke={chartColors.axis}
            tickStroke={chartColors.axis}
            tickLabelProps={() => ({ ...tickLabelProps, textAnchor: "middle" })}
            label={xLabel}
            labelProps={{ ...axisLabelProps, textAnchor: "middle" }}
            labelOffset={14}
          />
        </Group>
      </svg>
      {footer ? <div className="mt-1 text-xs text-slate-600">{footer}</div> : null}
    </figure>
  );
}
