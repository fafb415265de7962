import { describe, expect, test } from "vitest";
import { findReferencePattern } from "@/lib/science/minerals";
import { hillHoward, internalStandard, massFactor } from "@/lib/science/wholepattern";

const pattern = (name: string) => {
  const p = findReferencePattern(name);
  if (!p?.cellMass || !p.cellVolume || !p.absoluteScale || !p.rir) throw new Error(`${name} lacks fit data`);
  return p;
};

describe("Hill & Howard (1987) weight fractions", () => {
  test("W_p = S_p·ZMV_p / Σ S·ZMV: scales made from known fractions return them (the relation itself, J. Appl. Cryst. 20, 467)", () => {
    // Rietveld scale S ∝ W/(ZMV) (Hill & Howard 1987, eq. 4); our multiplier s = S·absoluteScale/100.
    const phases = ["quartz", "calcite", "corundum"].map(pattern);
    const truth = [0.5, 0.3, 0.2];
    const q = phases.map((p, i) => ({
      scale: ((truth[i] / (p.cellMass! * p.cellVolume!)) * p.absoluteScale!) / 100,
      scaleSigma: 0,
      cellMass: p.cellMass,
      cellVolume: p.cellVolume,
      absoluteScale: p.absoluteScale,
      rir: p.rir,
    }));
    const r = hillHoward(q);
    r.wt.forEach((w, i) => expect(w).toBeCloseTo(100 * truth[i], 6));
    expect(r.basis).toEqual(["ZMV", "ZMV", "ZMV"]);
  });

  test("the ZMV factor and the structure's RIR give the same fractions (Chung 1974: RIR = I/I_corundum at 50:50 by weight)", () => {
    const quartz = pattern("quartz");
    const corundum = pattern("corundum");
    // A 50:50 mixture: the strongest lines stand in the ratio RIR, so the multipliers are RIR·k and 1·k.
    const mix = [
      { scale: quartz.rir!, scaleSigma: 0, cellMass: quartz.cellMass, cellVolume: quartz.cellVolume, absoluteScale: quartz.absoluteScale },
      { scale: 1, scaleSigma: 0, cellMass: corundum.cellMass, cellVolume: corundum.cellVolume, absoluteScale: corundum.absoluteScale },
    ];
    const r = hillHoward(mix);
    expect(r.wt[0]).toBeGreaterThan(48.5); // stored RIR rounded to 3 decimals and computed with the same structures
    expect(r.wt[0]).toBeLessThan(51.5);
  });

  test("phases without structure data fall back to scale/RIR for all, and a phase with neither has no wt%", () => {
    const r = hillHoward([
      { scale: 2, scaleSigma: 0.1, rir: 2 },
      { scale: 1, scaleSigma: 0.1, rir: 1 },
      { scale: 1, scaleSigma: 0.1 },
    ]);
    expect(r.wt[0]).toBeCloseTo(50, 6);
    expect(r.wt[1]).toBeCloseTo(50, 6);
    expect(r.wt[2]).toBeNull();
    expect(r.basis).toEqual(["RIR", "RIR", null]);
    expect(massFactor({ scale: 1, scaleSigma: 0 })).toBeNull();
  });

  test("σ(W) follows first-order propagation: equal phases with 10 % scale uncertainty give σ = 100·√2·0.1/4 ≈ 3.5 wt%", () => {
    // W₁ = a₁/(a₁+a₂) at a₁ = a₂ = 1: ∂W₁/∂a₁ = 1/4, ∂W₁/∂a₂ = −1/4, σ(a) = 0.1 → σ(W₁) = 100·0.1·√2/4.
    const r = hillHoward([
      { scale: 1, scaleSigma: 0.1, rir: 1 },
      { scale: 1, scaleSigma: 0.1, rir: 1 },
    ]);
    expect(r.sigma[0]).toBeCloseTo((100 * 0.1 * Math.SQRT2) / 4, 6);
  });
});

describe("internal standard (Chung 1974, J. Appl. Cryst. 7, 526)", () => {
  test("20 wt% corundum spike, phase factor twice the standard's ⇒ 40 wt% in the spiked, 50 wt% in the original, 50 % amorphous", () => {
    // W_p(spiked) = W_s·a_p/a_s = 0.2·2 = 0.4; original specimen: 0.4/(1 − 0.2) = 0.5 (worked from the published equation).
    const res = internalStandard(
      [
        { scale: 2, scaleSigma: 0, rir: 1 },
        { scale: 1, scaleSigma: 0, rir: 1 },
      ],
      1,
      20,
    );
    expect(res?.wt[0]).toBeCloseTo(50, 6);
    expect(res?.wt[1]).toBeNull();
    expect(res?.amorphous).toBeCloseTo(50, 6);
  });

  test("a standard weight outside (0, 100) % is refused", () => {
    expect(internalStandard([{ scale: 1, scaleSigma: 0, rir: 1 }], 0, 0)).toBeNull();
  });
});
