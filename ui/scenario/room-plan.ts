// The scenario room's plan on screen, as plain functions (no "use client"): the room uses them in the
// browser, and the scenario page on the server to render the opening plan's outcome.
import { type AllocationState, allocationPerHorizon, amountToCents, createAllocationState } from "@/server/planning/allocation";
import type { PlanShape } from "@/server/predict/plan-shape";
import type { ScenarioPlan } from "@/server/predict/scenario-outcome";
import type { ChannelSettings } from "@/server/scenarios/types";

type PlanSource = {
  allocation: Record<string, number>;
  horizon: number;
  mode?: "fixed" | "growing";
  ceiling?: number | null;
  settings?: ChannelSettings;
};

/** The allocation store's state for a saved plan (amounts per horizon in currency units). */
export function allocationFromPlan(shape: PlanShape, plan: PlanSource, startTotalCents: number): AllocationState {
  const state = createAllocationState({
    mode: plan.mode ?? "fixed",
    horizonPeriods: plan.horizon,
    ceilingCents: plan.ceiling === null || plan.ceiling === undefined ? undefined : amountToCents(plan.ceiling),
    channels: shape.channels.map((channel) => ({
      name: channel.name,
      label: channel.label,
      amountCents: amountToCents(plan.allocation[channel.name] ?? 0),
      locked: plan.settings?.[channel.name]?.locked ?? false,
      floorCents: plan.settings?.[channel.name]?.floorCents,
      ceilingCents: plan.settings?.[channel.name]?.ceilingCents,
      observed: { minPerPeriodCents: amountToCents(channel.observed.minimum), maxPerPeriodCents: amountToCents(channel.observed.maximum) },
    })),
  });
  // Growth is measured from the scenario's starting plan, not from whichever version is open.
  const base = plan.mode === "growing" ? startTotalCents : state.totalCents;
  return { ...state, baseTotalCents: base, ceilingCents: plan.ceiling == null ? Math.max(state.totalCents, Math.round(base * 1.1)) : state.ceilingCents };
}

/** The API plan of an allocation: amounts per horizon in currency units. */
export function planOf(allocation: AllocationState, controls: Record<string, number>): ScenarioPlan {
  return { allocation: allocationPerHorizon(allocation), controls, horizon: allocation.horizonPeriods };
}
