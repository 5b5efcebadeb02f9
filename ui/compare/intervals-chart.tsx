"use client";

import { useLayoutEffect, useRef, useState } from "react";
import type { MoneyLocale } from "@/server/planning/allocation";
import type { PlanShape } from "@/server/predict/plan-shape";
import { IntervalRow, intervalDomain } from "@/ui/charts/interval-row";
import { BottomAxis } from "@/ui/charts/bottom-axis";
import { linearScale } from "@/ui/charts/linear-scale";
import { compactOutcomeText, outcomeText, signedOutcomeText } from "./format";

export type ChartRow = {
  key: string;
  label: string;
  /** Short text after the label that is never cut off (a version number): long labels are truncated before it. */
  tag?: string;
  /** Null when there is nothing to draw (no joint interval): `note` says why. */
  point: number | null;
  confidence?: [number, number] | null;
  prediction?: [number, number] | null;
  tone?: "normal" | "warning";
  note?: string;
};

const fullLabel = (row: ChartRow) => (row.tag ? `${row.label} ${row.tag}` : row.label);

function useWidth(initial = 520) {
  const box = useRef<HTMLDivElement>(null);
  const [width, setWidth] = useState(initial);
  useLayoutEffect(() => {
    const element = box.current;
    if (!element) return;
    const update = () => setWidth(Math.max(200, Math.floor(element.clientWidth)));
    update();
    const observer = new ResizeObserver(update);
    observer.observe(element);
    return () => observer.disconnect();
  }, []);
  return { box, width };
}

/**
 * Several intervals on one axis, drawn the Tributary way (pale band: prediction interval; darker
 * band: confidence interval; tick: the point), one row per version, with a unit axis below.
 */
export function IntervalsChart({
  rows,
  outcome,
  money,
  reference = null,
  signed = false,
  caption,
  testId,
}: {
  rows: ChartRow[];
  outcome: PlanShape["outcome"];
  money: MoneyLocale;
  /** A dashed reference line (zero for differences). */
  reference?: number | null;
  signed?: boolean;
  caption: string;
  testId?: string;
}) {
  const labelWidth = 200;
  const { box, width } = useWidth();
  const plotWidth = Math.max(160, width - labelWidth);
  const domain = intervalDomain(
    rows.flatMap((row) => [row.point, ...(row.prediction ?? row.confidence ?? [])]),
    reference,
  );
  const scale = linearScale(domain, [6, plotWidth - 6]);
  const text = (value: number) => (signed ? signedOutcomeText(value, outcome, money) : outcomeText(value, outcome, money));
  return (
    <figure ref={box} data-testid={testId} className="w-full break-inside-avoid">
      <figcaption className="mb-2 text-sm text-slate-700">{caption}</figcaption>
      <div className="space-y-1">
        {rows.map((row) => (
          <div key={row.key} className="flex items-center" data-testid={testId ? `${testId}-row` : undefined}>
            <div className="flex shrink-0 gap-1 pr-3 text-sm text-slate-800" style={{ width: labelWidth }} title={fullLabel(row)}>
              <span className="truncate">{row.label}</span>
              {row.tag ? <span className="shrink-0">{row.tag}</span> : null}
            </div>
            {row.point === null ? (
              <p className="text-xs text-slate-600" style={{ width: plotWidth }}>
                {row.note}
              </p>
            ) : (
              <IntervalRow
                domain={domain}
                point={row.point}
                confidence={row.confidence ?? null}
                prediction={row.prediction ?? null}
                reference={reference}
                width={plotWidth}
                height={28}
                tone={row.tone}
                label={`${fullLabel(row)}: ${text(row.point)}${row.confidence ? `, confidence interval ${text(row.confidence[0])} to ${text(row.confidence[1])}` : ""}${
                  row.prediction ? `, prediction interval ${text(row.prediction[0])} to ${text(row.prediction[1])}` : ""
                }`}
              />
            )}
          </div>
        ))}
      </div>
      <div className="flex">
        <div style={{ width: labelWidth }} className="shrink-0" />
        <svg width={plotWidth} height={26} aria-hidden="true" className="block overflow-visible">
          <BottomAxis top={1} scale={scale} numTicks={Math.max(2, Math.floor(plotWidth / 110))} tickFormat={(value) => compactOutcomeText(value, outcome, money)} tickLength={4} />
        </svg>
      </div>
    </figure>
  );
}
