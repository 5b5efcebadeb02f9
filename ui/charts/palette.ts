// Chart colours from the Tributary palette (see /work/shared/notes/design.md, "Look").
export const chartColors = {
  river: "#12404f",
  shallows: "#2a727b",
  /** Prediction interval: the pale band. */
  shallowsPale: "#cfe5e7",
  /** Confidence interval: the darker band inside it. */
  shallowsMid: "#8fc1c6",
  reed: "#557330",
  ember: "#b54a34",
  grid: "#e2e8f0",
  axis: "#475569",
  text: "#1f2a30",
} as const;

export const axisLabelProps = { fill: chartColors.axis, fontSize: 12, fontFamily: "inherit" } as const;
export const tickLabelProps = { fill: chartColors.axis, fontSize: 11, fontFamily: "inherit", style: { fontVariantNumeric: "tabular-nums" } } as const;
