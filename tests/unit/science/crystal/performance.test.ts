/**
 * Speed on this project's 2-core target: small cells in a few ms, ~300-atom cells well under a second
 * (Cu Kα1, 2θ ≤ 90°). Best of several runs, so that other processes on the machine do not make it flaky.
 */
import { describe, expect, it } from "vitest";
import { computePatternDetailed, expandSites, parseCif } from "@/lib/science/crystal";
import { build, testCif, testStructure } from "./helpers";

function bestMs(fn: () => unknown, runs = 5): number {
  fn(); // warm-up (JIT)
  let best = Infinity;
  for (let i = 0; i < runs; i++) {
    const t0 = performance.now();
    fn();
    best = Math.min(best, performance.now() - t0);
  }
  return best;
}

describe("performance", () => {
  it("quartz and halite: parse + pattern in a few ms", () => {
    for (const name of ["quartz.cif", "halite.cif"]) {
      const text = testCif(name);
      // measured ≈ 1.5 ms on a quiet 2-core machine; 25 ms leaves room for other processes
      expect(bestMs(() => computePatternDetailed(parseCif(text)), 20), name).toBeLessThan(25);
    }
  });

  it("324-atom P1 cell (3×3×4 quartz supercell) in well under a second", () => {
    const q = testStructure("quartz.cif");
    const cells = expandSites(q);
    const [na, nb, nc] = [3, 3, 4];
    const sites = [];
    for (let j = 0; j < cells.x.length; j++) {
      const s = q.sites[cells.site[j]];
      for (let i = 0; i < na; i++) for (let k = 0; k < nb; k++) for (let m = 0; m < nc; m++) {
        sites.push({ label: `${s.element}${sites.length}`, x: (cells.x[j] + i) / na, y: (cells.y[j] + k) / nb, z: (cells.z[j] + m) / nc, b: s.bIso });
      }
    }
    const big = build([q.cell.a * na, q.cell.b * nb, q.cell.c * nc, 90, 90, 120], ["x,y,z"], sites);
    expect(big.sites).toHaveLength(324);
    let result = computePatternDetailed(big);
    const ms = bestMs(() => (result = computePatternDetailed(big)), 3); // ≈ 80 ms measured
    expect(result.atomCount).toBe(324);
    expect(result.reflectionClassCount).toBeGreaterThan(5000);
    expect(ms).toBeLessThan(1000);
    // and it is still quartz: the strongest line is at d(101) of the small cell
    const top = result.lines.reduce((a, b) => (b.intensity > a.intensity ? b : a));
    expect(top.d).toBeCloseTo(3.3446, 3);
  });
});
