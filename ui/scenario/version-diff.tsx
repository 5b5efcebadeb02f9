"use client";

import { useQuery } from "@tanstack/react-query";
import type { MoneyLocale } from "@/server/planning/allocation";
import type { PlanShape } from "@/server/predict/plan-shape";
import { planDifference } from "@/server/predict/scenario-outcome";
import type { FitRecord } from "@/server/stats";
import { IntervalRow, intervalDomain } from "@/ui/charts/interval-row";
import { scenarioApi } from "./api";
import { Caution, cautionText } from "./cautions";
import { formatMoney, formatOutcome, formatPercent, formatSignedOutcome } from "./format";

export interface VersionDiffProps {
  scenarioId: string;
  a: number;
  b: number;
  record: FitRecord;
  shape: PlanShape;
  money: MoneyLocale;
}

/**
 * Two versions next to each other: spend per channel and the change, each version's predicted total
 * with its bands (the server's snapshots), and B − A with its own confidence interval.
 */
export function VersionDiff({ scenarioId, a, b, record, shape, money }: VersionDiffProps) {
  const first = useQuery({ queryKey: ["scenario-version", scenarioId, a], queryFn: () => scenarioApi.version(scenarioId, a), staleTime: Infinity });
  const second = useQuery({ queryKey: ["scenario-version", scenarioId, b], queryFn: () => scenarioApi.version(scenarioId, b), staleTime: Infinity });
  if (first.error || second.error) return <p role="alert" className="text-sm text-ember">{(first.error ?? second.error)?.message}</p>;
  if (!first.data || !second.data) return <p className="text-sm text-slate-600">Loading versions {a} and {b}…</p>;
  const va = first.data;
  const vb = second.data;
  let difference: ReturnType<typeof planDifference> | null = null;
  try {
    difference = planDifference(record, shape, vb, va, va.prediction.level);
  } catch {
    difference = null;
  }
  const totals = [va.prediction.horizonTotal, vb.prediction.horizonTotal];
  const domain = intervalDomain(totals.flatMap((total) => [total.prediction[0], total.prediction[1]]), null);
  const percent = formatPercent(va.prediction.level, money.locale);
  return (
    <div data-testid="version-diff" className="space-y-4">
      <table className="num w-full text-sm">
        <thead>
          <tr className="text-left text-xs text-slate-600">
            <th className="font-medium">Channel</th>
            <th className="text-right font-medium">v{a}</th>
            <th className="text-right font-medium">v{b}</th>
            <th className="text-right font-medium">Change</th>
          </tr>
        </thead>
        <tbody>
          {shape.channels.map((channel) => {
            const before = va.allocation[channel.name] ?? 0;
            const after = vb.allocation[channel.name] ?? 0;
            const change = after - before;
            return (
              <tr key={channel.name} className="border-t border-slate-100">
                <td className="py-1">{channel.label}</td>
                <td className="py-1 text-right">{formatMoney(before, money)}</td>
                <td className="py-1 text-right">{formatMoney(after, money)}</td>
                <td className={`py-1 text-right ${change === 0 ? "text-slate-600" : ""}`}>
                  {change === 0 ? "—" : `${change > 0 ? "+" : "−"}${formatMoney(Math.abs(change), money)}`}
                </td>
              </tr>
            );
          })}
          <tr className="border-t border-slate-300 font-medium">
            <td className="py-1">Total</td>
            <td className="py-1 text-right">{formatMoney(va.total, money)}</td>
            <td className="py-1 text-right">{formatMoney(vb.total, money)}</td>
            <td className="py-1 text-right">{vb.total === va.total ? "—" : `${vb.total > va.total ? "+" : "−"}${formatMoney(Math.abs(vb.total - va.total), money)}`}</td>
          </tr>
        </tbody>
      </table>
      <div className="space-y-2">
        {[va, vb].map((version) => (
          <div key={version.number} className="grid grid-cols-[3rem_1fr] items-center gap-2">
            <span className="text-sm font-medium text-river">v{version.number}</span>
            <div>
              <IntervalRow
                domain={domain}
                point={version.prediction.horizonTotal.mean}
                confidence={version.prediction.horizonTotal.confidence}
                prediction={version.prediction.horizonTotal.prediction}
                width={300}
                tone={version.warnings.length > 0 ? "warning" : "normal"}
                label={`Version ${version.number}: predicted total ${formatOutcome(version.prediction.horizonTotal.mean, shape, money)}`}
              />
              <p className="num text-xs text-slate-600">
                {formatOutcome(version.prediction.horizonTotal.mean, shape, money)} ({percent} prediction {formatOutcome(version.prediction.horizonTotal.prediction[0], shape, money)} –{" "}
                {formatOutcome(version.prediction.horizonTotal.prediction[1], shape, money)})
                {version.warnings.length > 0 ? " · with extrapolation warnings" : ""}
              </p>
            </div>
          </div>
        ))}
      </div>
      {difference ? (
        <p className="num text-sm" data-testid="version-diff-difference">
          v{b} − v{a}: <strong>{formatSignedOutcome(difference.mean, shape, money)}</strong> ({percent} confidence{" "}
          {formatSignedOutcome(difference.confidence[0], shape, money)} to {formatSignedOutcome(difference.confidence[1], shape, money)})
        </p>
      ) : null}
      <Caution>{cautionText.association}</Caution>
    </div>
  );
}
