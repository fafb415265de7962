/**
 * Public entry of the Lithodex diffraction core. Pure computation: no framework, database or I/O.
 * Angles in degrees 2θ, d-spacings and wavelengths in ångström.
 *
 * - types, units (Bragg conversions), anodes (tube wavelengths)
 * - scan: reading XY/CSV/pdCIF text into a Scan
 * - signal: smoothing, background, Kα2 stripping, peaks, profile fitting, corrections
 * - crystal: CIF reading, calculated powder patterns, RIR
 * - identify: strong-line index and multiphase search–match with semi-quantitative RIR weight fractions
 * - minerals: the shipped reference library (imports a ~0.3 MB JSON; import "@/lib/science/minerals" directly
 *   where bundle size matters)
 * - synthetic: seeded synthetic scans and random libraries for tests and benchmarks (namespaced)
 */
export * from "./types";
export * from "./units";
export * from "./anodes";
export * from "./scan";
export * from "./signal";
export * from "./crystal";
export * from "./identify";
export * from "./minerals";
export * as synthetic from "./synthetic";
