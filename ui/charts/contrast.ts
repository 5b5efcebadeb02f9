// WCAG 2 contrast (https://www.w3.org/TR/WCAG21/#dfn-contrast-ratio): text on a computed colour picks
// whichever of white or the dark text colour reads better, instead of a fixed threshold.

type Rgb = readonly [number, number, number];

/** Relative luminance of an sRGB colour with 0–255 channels. */
export function relativeLuminance([r, g, b]: Rgb): number {
  const linear = (channel: number) => {
    const c = channel / 255;
    return c <= 0.03928 ? c / 12.92 : ((c + 0.055) / 1.055) ** 2.4;
  };
  return 0.2126 * linear(r) + 0.7152 * linear(g) + 0.0722 * linear(b);
}

export function contrastRatio(a: Rgb, b: Rgb): number {
  const [light, dark] = [relativeLuminance(a), relativeLuminance(b)].sort((x, y) => y - x);
  return (light + 0.05) / (dark + 0.05);
}

export function hexToRgb(hex: string): Rgb {
  const value = Number.parseInt(hex.replace("#", ""), 16);
  return [(value >> 16) & 255, (value >> 8) & 255, value & 255];
}

/** White or `dark`, whichever has the higher contrast on `background`. */
export function readableTextOn(background: Rgb, dark: string): string {
  const white: Rgb = [255, 255, 255];
  return contrastRatio(white, background) >= contrastRatio(hexToRgb(dark), background) ? "white" : dark;
}
