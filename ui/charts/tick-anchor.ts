import { tickLabelProps } from "./palette";

/** Rough width of a tick label in pixels: tabular digits and most letters are about 0.6 em wide. */
export const tickLabelWidth = (text: string, fontSize: number = tickLabelProps.fontSize) => text.length * fontSize * 0.6;

/**
 * How to align a tick's label so it stays over the axis: centred under its tick, unless centring would
 * push it past an end of the axis (then it ends, or starts, at the tick and is never cut off).
 */
export function tickAnchor(x: number, label: string, axis: readonly [number, number], fontSize?: number): "start" | "middle" | "end" {
  const half = tickLabelWidth(label, fontSize) / 2;
  const [left, right] = [Math.min(...axis), Math.max(...axis)];
  if (x + half > right) return "end";
  if (x - half < left) return "start";
  return "middle";
}
