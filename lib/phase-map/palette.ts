/**
 * Colour-blind-safe qualitative palette for mineral classes. Pure data.
 *
 * Source: Paul Tol, "Colour Schemes", SRON technical note SRON/EPS/TN/09-002 (issue 3.2, 2021), the
 * "muted" qualitative scheme: nine colours distinct for normal vision and for the common forms of
 * colour blindness (deuteranopia, protanopia, tritanopia), plus pale grey for missing data. We use it
 * because the phase map needs nine classes and the scheme is designed for exactly that count.
 */

/** Tol's muted scheme, in his published order. */
export const TOL_MUTED = {
  rose: "#CC6677",
  indigo: "#332288",
  sand: "#DDCC77",
  green: "#117733",
  cyan: "#88CCEE",
  wine: "#882255",
  teal: "#44AA99",
  olive: "#999933",
  purple: "#AA4499",
} as const;

/** Tol's colour for "bad data / not applicable" in the muted scheme. */
export const TOL_PALE_GREY = "#DDDDDD";

export type TolMutedName = keyof typeof TOL_MUTED;

/** Ink used for outlines, separators and dark text on the map (our own choice). */
export const INK = "#1F2933";

/**
 * WCAG 2.1 relative luminance of an sRGB colour "#RRGGBB" (0 black … 1 white).
 * Formula from WCAG 2.1 §1.4.3 "relative luminance" definition.
 */
export function relativeLuminance(hex: string): number {
  const m = /^#([0-9a-f]{6})$/i.exec(hex);
  if (!m) throw new TypeError(`colour must be "#RRGGBB", got ${JSON.stringify(hex)}`);
  const n = parseInt(m[1], 16);
  const lin = (c: number) => {
    const s = c / 255;
    return s <= 0.04045 ? s / 12.92 : ((s + 0.055) / 1.055) ** 2.4;
  };
  return 0.2126 * lin((n >> 16) & 255) + 0.7152 * lin((n >> 8) & 255) + 0.0722 * lin(n & 255);
}

/** WCAG 2.1 contrast ratio (1 … 21) between two colours. */
export function contrastRatio(a: string, b: string): number {
  const [hi, lo] = [relativeLuminance(a), relativeLuminance(b)].sort((x, y) => y - x);
  return (hi + 0.05) / (lo + 0.05);
}

/** Black-ish ink or white, whichever reads better on `fill` (larger WCAG contrast). */
export function labelColourOn(fill: string): string {
  const best = contrastRatio(fill, INK) >= contrastRatio(fill, "#FFFFFF") ? INK : "#FFFFFF";
  // Mid-tone fills reach WCAG 2.2 SC 1.4.3's 4.5:1 for small text with neither ink nor white: use black there.
  return contrastRatio(fill, best) >= 4.5 ? best : contrastRatio(fill, "#000000") > contrastRatio(fill, best) ? "#000000" : best;
}
