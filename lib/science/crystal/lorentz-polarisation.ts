/** Lorentz–polarisation factor for Bragg–Brentano (θ–2θ) powder geometry. */

const RAD = Math.PI / 180;

/**
 * Lp(θ) for a flat specimen in Bragg–Brentano geometry (thick specimen, random powder).
 * Without monochromator: (1 + cos²2θ) / (sin²θ·cosθ); with a monochromator crystal at 2θ_M:
 * (1 + cos²2θ_M·cos²2θ) / (sin²θ·cosθ·(1 + cos²2θ_M)) — the usual forms (common practice; see
 * e.g. ITC Vol. C §6.2).
 * @param twoThetaDeg - diffraction angle 2θ (°)
 * @param monochromatorTwoThetaDeg - 2θ_M of the monochromator (°); undefined for none
 */
export function lorentzPolarisation(twoThetaDeg: number, monochromatorTwoThetaDeg?: number): number {
  const th = (twoThetaDeg / 2) * RAD;
  const s = Math.sin(th);
  const c2 = Math.cos(2 * th);
  const geo = s * s * Math.cos(th);
  if (monochromatorTwoThetaDeg === undefined) return (1 + c2 * c2) / geo;
  const cm = Math.cos(monochromatorTwoThetaDeg * RAD);
  return (1 + cm * cm * c2 * c2) / (geo * (1 + cm * cm));
}
