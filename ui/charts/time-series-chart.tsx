import { AxisBottom, AxisLeft } from "@visx/axis";
import { Group } from "@visx/group";
import { scaleLinear } from "@visx/scale";
import { LinePath } from "@visx/shape";
import type { ReactNode } from "react";
import { axisLabelProps, chartColors, tickLabelProps } from "./palette";

export type TimeSeries = { name: string; values: readonly number[]; color?: string; dashed?: boolean };

export type TimeSeriesChartProps = {
  title: string;
  /** One label per point (ISO dates or row numbers), in order. */
  labels: readonly string[];
  series: readonly TimeSeries[];
  yLabel: string;
  xLabel?: string;
  formatY?: (value: number) => string;
  /** Shortens a label for the axis (e.g. an ISO date to "Jan 2024"). */
  formatLabel?: (label: string) => string;
  width?: number;
  height?: number;
  footer?: ReactNode;
};

/** Lines over an ordered axis (weeks, rows), with a legend. Server-renderable SVG. */
export function TimeSeriesChart({
  title,
  labels,
  series,
  yLabel,
  xLabel,
  formatY = (v) => String(v),
  formatLabel = (label) => label,
  width = 1040,
  height = 320,
  footer,
}: TimeSeriesChartProps) {
  const margin = { top: 12, right: 36, bottom: xLabel ? 48 : 32, left: 80 };
  const innerWidth = width - margin.left - margin.right;
  const innerHeight = height - margin.top - margin.bottom;
  const count = labels.length;
  const x = scaleLinear<number>({ domain: [0, Math.max(1, count - 1)], range: [0, innerWidth] });
  const all = series.flatMap((s) => s.values.filter(Number.isFinite));
  const low = all.length ? Math.min(...all) : 0;
  const high = all.length ? Math.max(...all) : 1;
  const air = (high - low) * 0.06 || 1;
  const y = scaleLinear<number>({ domain: [low - air, high + air], range: [innerHeight, 0], nice: true });
  const tickCount = Math.min(8, count);
  const tickIndices = Array.from({ length: tickCount }, (_, i) => Math.round((i * (count - 1)) / Math.max(1, tickCount - 1)));
  return (
    <figure className="min-w-0">
      <figcaption className="mb-1 flex flex-wrap items-center gap-x-4 gap-y-1 text-sm">
        <span className="font-medium text-river">{title}</span>
        {series.map((s, index) => (
          <span key={s.name} className="inline-flex items-center gap-1.5 text-slate-700">
            <svg width="22" height="8" aria-hidden="true">
              <line x1="1" x2="21" y1="4" y2="4" stroke={s.color ?? (index === 0 ? chartColors.river : chartColors.ember)} strokeWidth="2" strokeDasharray={s.dashed ? "5 3" : undefined} />
            </svg>
            {s.name}
          </span>
        ))}
      </figcaption>
      <svg viewBox={`0 0 ${width} ${height}`} width="100%" role="img" aria-label={`${title}: ${series.map((s) => s.name).join(" and ")} over ${count} points`}>
        <Group left={margin.left} top={margin.top}>
          <rect x={0} y={0} width={innerWidth} height={innerHeight} fill="white" stroke={chartColors.grid} />
          {y.ticks(5).map((tick) => (
            <line key={tick} x1={0} x2={innerWidth} y1={y(tick)} y2={y(tick)} stroke={chartColors.grid} />
          ))}
          {series.map((s, index) => (
            <LinePath
              key={s.name}
              data={s.values.map((value, i) => [i, value] as [number, number]).filter(([, value]) => Number.isFinite(value))}
              x={(d) => x(d[0])}
              y={(d) => y(d[1])}
              stroke={s.color ?? (index === 0 ? chartColors.river : chartColors.ember)}
              strokeWidth={index === 0 ? 1.6 : 1.8}
              strokeDasharray={s.dashed ? "5 3" : undefined}
              fill="none"
            />
          ))}
          <AxisLeft
            scale={y}
            numTicks={5}
            tickFormat={(v) => formatY(Number(v))}
            stroke={chartColors.axis}
            tickStroke={chartColors.axis}
            tickLabelProps={() => ({ ...tickLabelProps, textAnchor: "end", dx: -4, dy: 4 })}
            label={yLabel}
            labelProps={{ ...axisLabelProps, textAnchor: "middle" }}
            labelOffset={56}
          />
          <AxisBottom
            top={innerHeight}
            scale={x}
            tickValues={tickIndices}
            tickFormat={(v) => formatLabel(labels[Number(v)] ?? "")}
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
