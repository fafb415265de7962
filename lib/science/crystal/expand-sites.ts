/** Apply every symmetry operator to every site and keep one copy of coincident images (special positions). */
import { metricTensor } from "./cell";
import type { SymOp } from "./symop";
import { wrapFraction } from "./symop";
import type { CifStructure } from "./types";

/** All atoms of the unit cell, grouped by the site they come from (images of site s are contiguous). */
export interface ExpandedCell {
  x: Float64Array;
  y: Float64Array;
  z: Float64Array;
  /** Site index of each image. */
  site: Int32Array;
  /** First image of site s is imageStart[s], last is imageStart[s + 1] − 1. */
  imageStart: Int32Array;
}

function applyOp(op: SymOp, x: number, y: number, z: number): [number, number, number] {
  const r = op.rotation;
  const t = op.translation;
  return [
    wrapFraction(r[0] * x + r[1] * y + r[2] * z + t[0]),
    wrapFraction(r[3] * x + r[4] * y + r[5] * z + t[1]),
    wrapFraction(r[6] * x + r[7] * y + r[8] * z + t[2]),
  ];
}

const nearestZero = (d: number) => d - Math.round(d);

/**
 * Expand the asymmetric unit to the full cell. Images of one site closer than `tolerance` (Å, minimum image)
 * are one atom: a site on a special position contributes its multiplicity, not the group order. Different
 * sites on the same position (mixed occupancy) are all kept, each with its own occupancy.
 * @param tolerance - Å @default 0.05
 */
export function expandSites(structure: CifStructure, tolerance = 0.05): ExpandedCell {
  const g = metricTensor(structure.cell);
  const tol2 = tolerance * tolerance;
  const xs: number[] = [];
  const ys: number[] = [];
  const zs: number[] = [];
  const site: number[] = [];
  const start = new Int32Array(structure.sites.length + 1);
  structure.sites.forEach((s, si) => {
    start[si] = xs.length;
    for (const op of structure.symops) {
      const [x, y, z] = applyOp(op, s.x, s.y, s.z);
      let dup = false;
      for (let j = start[si]; j < xs.length && !dup; j++) {
        const dx = nearestZero(x - xs[j]);
        const dy = nearestZero(y - ys[j]);
        const dz = nearestZero(z - zs[j]);
        const d2 =
          g[0] * dx * dx + g[4] * dy * dy + g[8] * dz * dz + 2 * (g[1] * dx * dy + g[2] * dx * dz + g[5] * dy * dz);
        dup = d2 < tol2;
      }
      if (!dup) {
        xs.push(x);
        ys.push(y);
        zs.push(z);
        site.push(si);
      }
    }
  });
  start[structure.sites.length] = xs.length;
  return {
    x: Float64Array.from(xs),
    y: Float64Array.from(ys),
    z: Float64Array.from(zs),
    site: Int32Array.from(site),
    imageStart: start,
  };
}
