/** Small builders for structure-model tests (not a test file). */
import { readFileSync } from "node:fs";
import { join } from "node:path";
import { parseCif, type CifStructure } from "@/lib/science/crystal";

export const testCif = (name: string) => readFileSync(join(process.cwd(), "tests/fixtures/gemmi/cif", name), "utf8");
export const testStructure = (name: string) => parseCif(testCif(name));

export interface SiteSpec {
  label: string;
  x: number;
  y: number;
  z: number;
  /** B (Å²) @default 0.5 */
  b?: number;
  occ?: number;
}

/** A CIF text from cell, operator strings and sites (element = label's leading letters). */
export function cifText(cell: [number, number, number, number, number, number], ops: string[], sites: SiteSpec[], sg = "P 1"): string {
  const [a, b, c, al, be, ga] = cell;
  return [
    "data_built",
    `_space_group_name_H-M_alt '${sg}'`,
    `_cell_length_a ${a}`,
    `_cell_length_b ${b}`,
    `_cell_length_c ${c}`,
    `_cell_angle_alpha ${al}`,
    `_cell_angle_beta ${be}`,
    `_cell_angle_gamma ${ga}`,
    "loop_",
    "_space_group_symop_operation_xyz",
    ...ops.map((o) => `'${o}'`),
    "loop_",
    "_atom_site_label",
    "_atom_site_fract_x",
    "_atom_site_fract_y",
    "_atom_site_fract_z",
    "_atom_site_occupancy",
    "_atom_site_B_iso_or_equiv",
    ...sites.map((s) => `${s.label} ${s.x} ${s.y} ${s.z} ${s.occ ?? 1} ${s.b ?? 0.5}`),
  ].join("\n");
}

export function build(cell: [number, number, number, number, number, number], ops: string[], sites: SiteSpec[]): CifStructure {
  return parseCif(cifText(cell, ops, sites));
}

/** The 48 operators of point group m-3m as xyz strings: all signed permutations of x, y, z. */
export function m3mOperators(): string[] {
  const perms = [
    ["x", "y", "z"],
    ["x", "z", "y"],
    ["y", "x", "z"],
    ["y", "z", "x"],
    ["z", "x", "y"],
    ["z", "y", "x"],
  ];
  const out: string[] = [];
  for (const p of perms) {
    for (let s = 0; s < 8; s++) {
      out.push(p.map((v, i) => ((s >> i) & 1 ? "-" : "") + v).join(","));
    }
  }
  return out;
}

/** Operators x,y,z plus each centring translation added to each base operator. */
export function withCentring(base: string[], translations: [string, string, string][]): string[] {
  const out = [...base];
  for (const t of translations) {
    for (const op of base) out.push(op.split(",").map((c, i) => (t[i] === "0" ? c : `${c}+${t[i]}`)).join(","));
  }
  return out;
}

/** A few general positions (arbitrary, no special coordinates) for absence tests. */
export const GENERAL_SITES: SiteSpec[] = [
  { label: "Fe1", x: 0.1234, y: 0.2871, z: 0.0619 },
  { label: "O1", x: 0.3917, y: 0.0443, z: 0.2718 },
  { label: "Si1", x: 0.7321, y: 0.6113, z: 0.4402 },
];
