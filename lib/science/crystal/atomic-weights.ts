/**
 * Standard atomic weights, abridged (IUPAC Commission on Isotopic Abundances and Atomic Weights, "Standard
 * atomic weights of the elements 2021", Pure Appl. Chem. 2022; abridged table, about five significant figures).
 * Written from memory of that table; elements without a standard atomic weight carry the mass number of their
 * longest-lived isotope (in brackets in the IUPAC table). Checked in tests against gemmi's (older) weights.
 * Index = atomic number Z (index 0 unused).
 */
const WEIGHTS: readonly number[] = [
  0,
  1.008, 4.0026, 6.94, 9.0122, 10.81, 12.011, 14.007, 15.999, 18.998, 20.18, // H..Ne
  22.99, 24.305, 26.982, 28.085, 30.974, 32.06, 35.45, 39.95, // Na..Ar
  39.098, 40.078, 44.956, 47.867, 50.942, 51.996, 54.938, 55.845, 58.933, 58.693, 63.546, 65.38, // K..Zn
  69.723, 72.63, 74.922, 78.971, 79.904, 83.798, // Ga..Kr
  85.468, 87.62, 88.906, 91.222, 92.906, 95.95, 97, 101.07, 102.91, 106.42, 107.87, 112.41, // Rb..Cd
  114.82, 118.71, 121.76, 127.6, 126.9, 131.29, // In..Xe
  132.91, 137.33, // Cs, Ba
  138.91, 140.12, 140.91, 144.24, 145, 150.36, 151.96, 157.25, 158.93, 162.5, 164.93, 167.26, 168.93, 173.05, 174.97, // La..Lu
  178.49, 180.95, 183.84, 186.21, 190.23, 192.22, 195.08, 196.97, 200.59, // Hf..Hg
  204.38, 207.2, 208.98, 209, 210, 222, // Tl..Rn
  223, 226, // Fr, Ra
  227, 232.04, 231.04, 238.03, 237, 244, 243, 247, 247, 251, // Ac..Cf
];

/** Deuterium, for sites typed `D` (IUPAC isotope mass 2.0141, from memory). */
export const DEUTERIUM_WEIGHT = 2.0141;

/**
 * Standard atomic weight (g/mol) for atomic number Z = 1…98.
 * @throws RangeError outside that range.
 */
export function atomicWeight(z: number): number {
  const w = WEIGHTS[z];
  if (!Number.isInteger(z) || z < 1 || w === undefined) throw new RangeError(`no atomic weight for Z = ${z}`);
  return w;
}
