/** Synthetic scans and random reference libraries for tests and benchmarks (pure, seeded). */
export { synthesizeScan, type SynthesizeScanOptions, type SyntheticPhase, type SyntheticBackground } from "./synthesize-scan";
export { randomReferenceLibrary, type RandomLibraryOptions } from "./random-library";
export { pseudoVoigt, cagliotiFwhm, type Caglioti } from "./profile";
export { marchDollase, reciprocalMetric, type UnitCell } from "./march-dollase";
export { createRandom, normalDeviate, poissonDeviate, type Random } from "./random";
