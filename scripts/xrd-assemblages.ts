/**
 * Score the whole-pattern identification on randomly generated field assemblages (our own synthetic scans, not
 * measured data): rock-type mineral pools, random weight fractions, March–Dollase texture on platy phases, some
 * broadened phases, zero shift, Kα2 present or absent, Cu or Co radiation, curved background, sometimes an
 * amorphous hump, Poisson noise. The scans are synthesised from the shipped library's own calculated patterns, so
 * this measures the method (selection, refinement, quantification) without structure mismatch; the separate
 * development set measures it against structures computed elsewhere.
 *
 *   npm run --silent xrd:assemblages -- [--count 40] [--seed 1] [--verbose] [--only N]
 *
 * Prints one line per scan with --verbose, then the summary line in the development set's form.
 */
import { ANODE_WAVELENGTHS } from "@/lib/science/anodes";
import { findReferencePattern, REFERENCE_LIBRARY } from "@/lib/science/minerals";
import { processScan } from "@/lib/science/signal";
import { createRandom, synthesizeScan, type SyntheticPhase } from "@/lib/science/synthetic";
import { identifyWholePattern } from "@/lib/science/wholepattern";
import { seriesOf } from "@/lib/science/wholepattern/series";
import type { Anode } from "@/lib/science/types";

/** Mineral pools of common rock types (common practice; the weights are drawn at random). */
const ROCKS: Record<string, string[]> = {
  granite: ["quartz", "albite", "orthoclase", "microcline", "muscovite", "annite"],
  schist: ["quartz", "muscovite", "phlogopite", "almandine", "albite", "clinochlore"],
  skarn: ["grossular", "andradite", "diopside", "calcite", "quartz", "magnetite"],
  greenschist: ["albite", "epidote", "actinolite", "clinochlore", "quartz", "calcite"],
  carbonate: ["calcite", "dolomite", "quartz", "forsterite", "magnesite"],
  clay: ["kaolinite", "quartz", "anatase", "illite", "montmorillonite", "goethite"],
  ore: ["pyrite", "chalcopyrite", "sphalerite", "galena", "quartz", "arsenopyrite"],
  gossan: ["goethite", "hematite", "quartz", "jarosite", "kaolinite"],
  evaporite: ["halite", "gypsum", "anhydrite", "sylvite", "calcite"],
  sand: ["quartz", "ilmenite", "rutile", "zircon", "magnetite", "almandine"],
  mafic: ["labradorite", "augite", "forsterite", "magnetite", "ilmenite", "enstatite"],
};
const PLATY = new Set(["muscovite", "phlogopite", "annite", "kaolinite", "clinochlore", "illite", "montmorillonite", "gypsum", "calcite", "actinolite"]);

function args(): { count: number; seed: number; verbose: boolean; only: number } {
  const a = process.argv.slice(2);
  const get = (k: string, d: number) => {
    const i = a.indexOf(k);
    return i >= 0 ? Number(a[i + 1]) : d;
  };
  return { count: get("--count", 40), seed: get("--seed", 1), verbose: a.includes("--verbose"), only: get("--only", -1) };
}

/** True when a reported name stands for the true mineral (same name, or the series the true mineral belongs to). */
function matches(reported: string, truth: string): boolean {
  if (reported === truth) return true;
  return seriesOf(truth)?.name === reported;
}

function main(): void {
  const { count, seed, verbose, only } = args();
  const random = createRandom(seed);
  const pick = <T>(list: readonly T[]): T => list[Math.floor(random() * list.length)];
  let mixOk = 0;
  let phantoms = 0;
  let amorphousOk = 0;
  let amorphousN = 0;
  let scored = 0;
  const errors: number[] = [];
  const times: number[] = [];
  const rocks = Object.keys(ROCKS);
  for (let s = 0; s < count; s++) {
    const amorphousOnly = s % 20 === 19;
    const anode: Anode = random() < 0.8 ? "Cu" : "Co";
    const pool = ROCKS[pick(rocks)].slice();
    const nPhases = amorphousOnly ? 0 : 2 + Math.floor(random() * 3);
    const names: string[] = [];
    while (names.length < nPhases && pool.length) names.push(pool.splice(Math.floor(random() * pool.length), 1)[0]);
    // Dirichlet(1) weights with a floor of 5 wt%
    const raw = names.map(() => -Math.log(1 - random()));
    const total = raw.reduce((a, b) => a + b, 0);
    let weights = raw.map((v) => Math.max(0.05, v / total));
    const wsum = weights.reduce((a, b) => a + b, 0);
    weights = weights.map((v) => v / wsum);
    const phases: SyntheticPhase[] = names.map((name, i) => {
      const pattern = findReferencePattern(name)!;
      const texture = PLATY.has(name) && pattern.texture && pattern.cell && random() < 0.7;
      return {
        pattern,
        weight: weights[i],
        ...(texture ? { preferredOrientation: { hkl: pattern.texture!, r: 0.6 + 0.35 * random(), cell: pattern.cell! } } : {}),
      };
    });
    const w = ANODE_WAVELENGTHS[anode];
    const ka2 = random() < 0.8;
    const scan = synthesizeScan({
      phases,
      wavelength: w.kAlpha1,
      ...(ka2 ? { wavelength2: w.kAlpha2 } : { kalpha2Ratio: 0 }),
      range: anode === "Cu" ? [4, 75] : [8, 90],
      step: 0.02,
      maxCounts: 4000 + 16000 * random(),
      zeroShift: (random() - 0.5) * 0.08,
      ...(amorphousOnly || random() < 0.15 ? { amorphousHump: { center: 20 + 8 * random(), fwhm: 4 + 3 * random(), height: 300 + 700 * random() } } : {}),
      seed: seed * 1000 + s,
    });
    if (only >= 0 && s !== only) continue;
    const t = performance.now();
    const processed = processScan(scan, { anode });
    const result = identifyWholePattern(processed, REFERENCE_LIBRARY);
    times.push(performance.now() - t);
    const found = result.phases.map((p) => ({ name: p.mineral, wt: p.wtPercent }));
    if (process.env.XRD_EVIDENCE)
      for (const p of result.phases)
        console.log(`evidence ${names.some((m) => matches(p.mineral, m)) ? "true" : "false"} ${p.mineral} wt=${p.wtPercent} dbic=${p.evidence.deltaBic.toFixed(0)} own=${p.evidence.aloneLines.length} share=${p.evidence.profileShare.toFixed(3)}`);
    if (only >= 0)
      for (const p of result.phases)
        console.log(`  ${p.mineral}: width ×${p.params.widthFactor.toFixed(2)}, cell ${p.params.cellScale.toFixed(4)}, ${p.evidence.aloneLines.length} own lines, share ${p.evidence.profileShare.toFixed(3)}, ΔBIC ${p.evidence.deltaBic.toFixed(0)}`);
    if (amorphousOnly) {
      amorphousN++;
      amorphousOk += found.length === 0 ? 1 : 0;
      if (verbose) console.log(`#${s} amorphous-only: found ${found.map((f) => f.name).join(", ") || "nothing"}`);
      continue;
    }
    scored++;
    const major = names.filter((_, i) => weights[i] >= 0.1);
    const ok = major.every((m) => found.some((f) => matches(f.name, m)));
    mixOk += ok ? 1 : 0;
    const extra = found.filter((f) => !names.some((m) => matches(f.name, m)));
    phantoms += extra.length;
    names.forEach((m, i) => {
      const f = found.find((x) => matches(x.name, m));
      if (f && typeof f.wt === "number") errors.push(Math.abs(f.wt - 100 * weights[i]));
    });
    if (verbose)
      console.log(
        `#${s} ${anode}${ka2 ? "" : " Kα1-only"} ${ok ? "ok  " : "MISS"} truth=${names.map((m, i) => `${m} ${(100 * weights[i]).toFixed(0)}`).join(", ")} found=${found.map((f) => `${f.name} ${f.wt}`).join(", ")}${extra.length ? ` PHANTOM ${extra.map((f) => f.name).join(", ")}` : ""}`,
      );
  }
  times.sort((a, b) => a - b);
  const mae = errors.reduce((a, b) => a + b, 0) / Math.max(errors.length, 1);
  console.log(
    `generated assemblages (seed ${seed}): mixtures ${mixOk}/${scored}; phantoms/scan ${(phantoms / Math.max(scored, 1)).toFixed(2)}; amorphous ${amorphousOk}/${amorphousN}; wt% MAE ${mae.toFixed(1)}; median process+identify ${times[times.length >> 1].toFixed(0)} ms`,
  );
}

main();
