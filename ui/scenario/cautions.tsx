import type { ReactNode } from "react";

/** Share of the starting budget moved elsewhere above which the planner is told to test first. */
export const LARGE_SHIFT_SHARE = 0.2;

/**
 * Share of the starting plan's money that the plan moves between channels or adds/removes:
 * (Σ |plan − start| over channels) ÷ 2 ÷ starting total, counting added money once.
 */
export function shiftShare(plan: Readonly<Record<string, number>>, start: Readonly<Record<string, number>>): number {
  const names = new Set([...Object.keys(plan), ...Object.keys(start)]);
  let moved = 0;
  let startTotal = 0;
  let planTotal = 0;
  for (const name of names) {
    moved += Math.abs((plan[name] ?? 0) - (start[name] ?? 0));
    startTotal += start[name] ?? 0;
    planTotal += plan[name] ?? 0;
  }
  // Money moved between channels counts once (it leaves one and enters another); added money counts once too.
  const between = (moved - Math.abs(planTotal - startTotal)) / 2 + Math.abs(planTotal - startTotal);
  return startTotal > 0 ? between / startTotal : 0;
}

/** A caution sentence placed beside the number it qualifies. */
export function Caution({ children, tone = "quiet", testId }: { children: ReactNode; tone?: "quiet" | "strong"; testId?: string }) {
  return tone === "strong" ? (
    <p data-testid={testId} role="note" className="rounded-md border-l-4 border-ember bg-ember/10 px-3 py-2 text-sm text-slate-900">
      {children}
    </p>
  ) : (
    <p data-testid={testId} className="text-xs leading-snug text-slate-600">
      {children}
    </p>
  );
}

export const cautionText = {
  association: "These effects are associations in past data, not the result of changing one channel alone.",
  modelHolds: "The interval assumes the fitted model still describes the market.",
  extrapolation: "The model has no data here; treat the number as a guess.",
  testFirst: "Before moving a large share of budget, test the shift on part of it.",
} as const;
