// WCAG 2 contrast ratios: the definition's end points (21:1 black on white, 1:1 a colour on itself)
// and the palette pairs the app relies on (AA: 4.5:1 for body text). Reference: WCAG 2.1, "contrast ratio".
import { describe, expect, it } from "vitest";
import { contrastRatio, hexToRgb, readableTextOn } from "@/ui/charts/contrast";
import { chartColors } from "@/ui/charts/palette";

const silt = hexToRgb("#f3efe6");
const white = hexToRgb("#ffffff");

describe("contrastRatio", () => {
  it("runs from 1:1 to 21:1", () => {
    expect(contrastRatio(hexToRgb("#000000"), white)).toBeCloseTo(21, 6);
    expect(contrastRatio(silt, silt)).toBe(1);
  });

  it("the palette's text colours reach 4.5:1 on white and on the silt page", () => {
    for (const colour of [chartColors.shallows, chartColors.reed, chartColors.ember, chartColors.river, chartColors.axis]) {
      expect(contrastRatio(hexToRgb(colour), white), colour).toBeGreaterThanOrEqual(4.5);
      expect(contrastRatio(hexToRgb(colour), silt), colour).toBeGreaterThanOrEqual(4.5);
    }
  });
});

describe("readableTextOn", () => {
  it("picks white on dark cells and the dark text colour on light ones, whichever contrasts more", () => {
    expect(readableTextOn(hexToRgb(chartColors.river), chartColors.text)).toBe("white");
    expect(readableTextOn(hexToRgb("#cfe5e7"), chartColors.text)).toBe(chartColors.text);
    // A mid-tone where a fixed threshold put white text at 3.6:1: dark text does better there.
    const mid = hexToRgb("#4d9199");
    expect(readableTextOn(mid, chartColors.text)).toBe(chartColors.text);
    expect(contrastRatio(hexToRgb(chartColors.text), mid)).toBeGreaterThan(contrastRatio(white, mid));
  });
});

describe("correlation grid cells", () => {
  it("print their value at 4.5:1 or better at every strength, positive and negative", async () => {
    const { cellColor } = await import("@/ui/charts/correlation-grid");
    for (let step = -100; step <= 100; step++) {
      const { background, color } = cellColor(step / 100);
      const channels = background.match(/\d+/g)!.map(Number) as [number, number, number];
      const text = color === "white" ? white : hexToRgb(color);
      expect(contrastRatio(text, channels), `r = ${step / 100}`).toBeGreaterThanOrEqual(4.5);
    }
  });
});
