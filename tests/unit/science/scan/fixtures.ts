import { readFileSync } from "node:fs";

/** Text of a synthetic fixture in tests/fixtures/scans (see generate.py there). */
export function fixture(name: string): string {
  return readFileSync(new URL(`../../../fixtures/scans/${name}`, import.meta.url), "utf8");
}

/** Plain XY text of n points, 2θ from `start` by `step`, counts = 100 + i. */
export function xyText(n: number, { start = 10, step = 0.02, sep = " " } = {}): string {
  const lines: string[] = [];
  for (let i = 0; i < n; i++) lines.push(`${(start + i * step).toFixed(2)}${sep}${100 + i}`);
  return lines.join("\n") + "\n";
}
