import type { AllocationState } from "@/server/planning/allocation";

/**
 * The scale every channel's slider and range strip share, in cents: 0 to the fixed total (fixed
 * mode) or to the ceiling (growing mode), so a thumb's position reads as a share of the budget and
 * rows can be compared by eye. Never empty, so the slider stays operable at a zero total.
 */
export function sliderMaxCents(state: AllocationState): number {
  const top = state.mode === "fixed" ? state.totalCents : Math.max(state.ceilingCents, state.totalCents);
  return Math.max(top, 100);
}

/** A round drag step (1, 10, 100… cents) giving about a thousand positions across the range. */
export function dragStepCents(rangeCents: number): number {
  const target = rangeCents / 1000;
  if (target <= 1) return 1;
  return 10 ** Math.floor(Math.log10(target));
}

/** Keyboard steps: arrows move 1% of the range, PageUp/PageDown (and Shift+arrows) 10%. */
export function keyboardDelta(key: string, shiftKey: boolean, rangeCents: number): number | "min" | "max" | null {
  const small = Math.max(1, Math.round(rangeCents / 100));
  const large = Math.max(1, Math.round(rangeCents / 10));
  switch (key) {
    case "ArrowRight":
    case "ArrowUp":
      return shiftKey ? large : small;
    case "ArrowLeft":
    case "ArrowDown":
      return shiftKey ? -large : -small;
    case "PageUp":
      return large;
    case "PageDown":
      return -large;
    case "Home":
      return "min";
    case "End":
      return "max";
    default:
      return null;
  }
}
