/**
 * CIF 1.1 → crystal structure model (cell, symmetry operators, atom sites, citation).
 * Data names follow the IUCr core dictionary; both the current (`_space_group_symop_operation_xyz`,
 * `_space_group_name_H-M_alt`) and the older (`_symmetry_equiv_pos_as_xyz`, `_symmetry_space_group_name_H-M`)
 * names are read.
 */
import { uEquivalent, cellVolume } from "./cell";
import { CifError } from "./cif-error";
import {
  cifLoopOf,
  cifValue,
  cifValues,
  isCifNull,
  parseCifNumber,
  readCifBlocks,
  type CifBlock,
  type CifValue,
} from "./cif-star";
import { elementFromSymbol } from "./elements";
import { IDENTITY_OP, parseSymop, SymopSyntaxError, type SymOp } from "./symop";
import type { AdpSource, AtomSite, CellParameters, CifCitation, CifStructure } from "./types";

const EIGHT_PI2 = 8 * Math.PI * Math.PI;

/** B (Å²) assumed when a site has no displacement parameter (common practice for mineral structures). */
export const DEFAULT_B_ISO = 0.5;

/**
 * Limits that keep one uploaded CIF from occupying the server (a P 1 cell with a = 60 Å and 600 atoms took 12 s).
 * The shipped library peaks at V ≈ 2 600 Å³, 52 sites and 192 operators; these bounds leave room for zeolites and
 * clay supercells (V up to ≈ 15 000 Å³) — common practice, not a crystallographic rule. 192 operators is the largest
 * conventional-cell group order (F m -3 m, International Tables A, 2016).
 */
export const CIF_LIMITS = {
  /** Largest unit-cell volume, Å³. */
  maxCellVolume: 20_000,
  /** Most atom sites in the asymmetric unit (rows of the atom-site loop). */
  maxSites: 300,
  /** Most symmetry operators. */
  maxSymops: 192,
} as const;

export interface ParseCifOptions {
  /** Name of the data block to read (without `data_`); default: the first block with atom sites. */
  block?: string;
}

function text(v: CifValue | undefined): string | undefined {
  if (!v) return undefined;
  const t = v.text.trim();
  return t === "" ? undefined : t;
}

function firstText(block: CifBlock, tags: string[]): string | undefined {
  for (const t of tags) {
    const v = text(cifValue(block, t));
    if (v !== undefined) return v;
  }
  return undefined;
}

function firstNumber(block: CifBlock, tags: string[]): number | undefined {
  for (const t of tags) {
    const n = parseCifNumber(cifValue(block, t), t);
    if (n) return n.value;
  }
  return undefined;
}

function selectBlock(blocks: CifBlock[], name?: string): CifBlock {
  if (blocks.length === 0) throw new CifError("no-data-block", "no data_ block found (is this a CIF file?)", 0);
  if (name !== undefined) {
    const b = blocks.find((x) => x.name.toLowerCase() === name.toLowerCase());
    if (!b) {
      throw new CifError(
        "block-not-found",
        `no data block named '${name}' (blocks: ${blocks.map((x) => x.name).join(", ")})`,
        0,
      );
    }
    return b;
  }
  const withAtoms = blocks.find((b) => cifLoopOf(b, "_atom_site_fract_x") || b.items.has("_atom_site_fract_x"));
  if (!withAtoms) {
    throw new CifError(
      "no-atoms",
      `no atom sites (_atom_site_fract_x) in any data block (${blocks.map((x) => x.name).join(", ")})`,
      blocks[0].line,
      "_atom_site_fract_x",
    );
  }
  return withAtoms;
}

function readCell(block: CifBlock, warnings: string[]): CellParameters {
  const get = (tag: string, required: boolean, dflt: number) => {
    const n = parseCifNumber(cifValue(block, tag), tag);
    if (n) return n.value;
    if (required) {
      const line = block.names.get(tag) ?? block.line;
      throw new CifError("missing-cell", "unit-cell length missing or unknown", line, tag);
    }
    warnings.push(`${tag} missing; assumed ${dflt}°`);
    return dflt;
  };
  const cell: CellParameters = {
    a: get("_cell_length_a", true, 0),
    b: get("_cell_length_b", true, 0),
    c: get("_cell_length_c", true, 0),
    alpha: get("_cell_angle_alpha", false, 90),
    beta: get("_cell_angle_beta", false, 90),
    gamma: get("_cell_angle_gamma", false, 90),
  };
  for (const k of ["a", "b", "c"] as const) {
    if (!(cell[k] > 0)) {
      throw new CifError("bad-cell", `cell length must be positive, got ${cell[k]}`, block.names.get(`_cell_length_${k}`) ?? 0, `_cell_length_${k}`);
    }
  }
  for (const k of ["alpha", "beta", "gamma"] as const) {
    if (!(cell[k] > 0 && cell[k] < 180)) {
      throw new CifError("bad-cell", `cell angle must be between 0 and 180°, got ${cell[k]}`, block.names.get(`_cell_angle_${k}`) ?? 0, `_cell_angle_${k}`);
    }
  }
  try {
    cellVolume(cell);
  } catch {
    throw new CifError("bad-cell", "cell angles α, β, γ do not form a valid cell (volume² ≤ 0)", block.names.get("_cell_angle_alpha") ?? block.line, "_cell_angle_alpha");
  }
  return cell;
}

const SYMOP_TAGS = ["_space_group_symop_operation_xyz", "_symmetry_equiv_pos_as_xyz"];

/** Integer key of a rotation matrix (entries −2…2 in base 5); other entries fall back to a string. */
function rotationKey(r: readonly number[]): number | string {
  let k = 0;
  for (let i = 0; i < 9; i++) {
    const v = r[i];
    if (v < -2 || v > 2) return r.join(",");
    k = k * 5 + v + 2;
  }
  return k;
}

/** Operators compared by rotation and by translation modulo 1 within 2·10⁻³ (decimals such as 0.333 pass). */
class OpSet {
  private byRot = new Map<number | string, number[]>();
  hasParts(rot: readonly number[], t0: number, t1: number, t2: number): boolean {
    const list = this.byRot.get(rotationKey(rot));
    if (!list) return false;
    for (let i = 0; i < list.length; i += 3) {
      if (near(list[i], t0) && near(list[i + 1], t1) && near(list[i + 2], t2)) return true;
    }
    return false;
  }
  has(op: SymOp): boolean {
    return this.hasParts(op.rotation, op.translation[0], op.translation[1], op.translation[2]);
  }
  add(op: SymOp): void {
    const key = rotationKey(op.rotation);
    const list = this.byRot.get(key) ?? [];
    list.push(...op.translation);
    this.byRot.set(key, list);
  }
}

function near(a: number, b: number): boolean {
  const d = Math.abs(a - b) % 1;
  return Math.min(d, 1 - d) < 2e-3;
}

/**
 * A product a∘b that is not in the list (modulo lattice translations), or null. b runs over the first 12
 * operators only: a missing operator X shows up as (X∘b⁻¹)∘b for every b, so this finds an incomplete list
 * unless most of it is missing, at O(12·n) instead of O(n²) cost.
 */
function findUnlistedProduct(ops: SymOp[], set: OpSet): { a: SymOp; b: SymOp } | null {
  const r = [0, 0, 0, 0, 0, 0, 0, 0, 0];
  const probes = ops.slice(0, 12);
  for (const a of ops) {
    const A = a.rotation;
    const ta = a.translation;
    for (const b of probes) {
      const B = b.rotation;
      const tb = b.translation;
      for (let i = 0; i < 3; i++) {
        for (let j = 0; j < 3; j++) r[3 * i + j] = A[3 * i] * B[j] + A[3 * i + 1] * B[3 + j] + A[3 * i + 2] * B[6 + j];
      }
      const t0 = ta[0] + A[0] * tb[0] + A[1] * tb[1] + A[2] * tb[2];
      const t1 = ta[1] + A[3] * tb[0] + A[4] * tb[1] + A[5] * tb[2];
      const t2 = ta[2] + A[6] * tb[0] + A[7] * tb[1] + A[8] * tb[2];
      if (!set.hasParts(r, t0 - Math.floor(t0), t1 - Math.floor(t1), t2 - Math.floor(t2))) return { a, b };
    }
  }
  return null;
}

function readSymops(block: CifBlock, sgName: string | undefined, sgNumber: number | undefined, warnings: string[]): SymOp[] {
  let values: CifValue[] | undefined;
  let field = "";
  for (const tag of SYMOP_TAGS) {
    const v = cifValues(block, tag)?.filter((x) => !isCifNull(x));
    if (v && v.length) {
      if (values) {
        if (v.length !== values.length) warnings.push(`${tag} lists ${v.length} operators, ${field} ${values.length}; used ${field}`);
        continue;
      }
      values = v;
      field = tag;
    }
  }
  if (!values) {
    const isP1 = (sgName !== undefined && sgName.replace(/[\s_]/g, "").toUpperCase() === "P1") || sgNumber === 1;
    if (isP1) {
      warnings.push("no symmetry operators listed; space group P 1 assumed (identity only)");
      return [IDENTITY_OP];
    }
    const line = block.names.get("_space_group_name_h-m_alt") ?? block.names.get("_symmetry_space_group_name_h-m") ?? block.line;
    throw new CifError(
      "no-symmetry",
      `no symmetry operators (_space_group_symop_operation_xyz or _symmetry_equiv_pos_as_xyz)` +
        (sgName ? ` for space group '${sgName}'` : "") +
        "; this reader does not expand space-group symbols — add the operator loop (only P 1 is accepted without one)",
      line,
    );
  }
  const ops: SymOp[] = [];
  const seen = new OpSet();
  for (const v of values) {
    let op: SymOp;
    try {
      op = parseSymop(v.text);
    } catch (e) {
      if (e instanceof SymopSyntaxError) throw new CifError("bad-symop", e.message, v.line, field);
      throw e;
    }
    if (seen.has(op)) {
      warnings.push(`duplicate symmetry operator '${v.text}' (line ${v.line}) ignored`);
      continue;
    }
    seen.add(op);
    ops.push(op);
  }
  if (!seen.has(IDENTITY_OP)) {
    warnings.push("operator list lacks the identity x,y,z; added");
    ops.unshift(IDENTITY_OP);
    seen.add(IDENTITY_OP);
  }
  // a group must be closed under composition; an open list usually means a missing or mistyped operator
  const open = findUnlistedProduct(ops, seen);
  if (open) {
    warnings.push(`symmetry operators do not form a group (e.g. '${open.a.text}' ∘ '${open.b.text}' is not listed); pattern may be wrong`);
  }
  return ops;
}

function readSites(block: CifBlock, cell: CellParameters, warnings: string[]): AtomSite[] {
  const loop = cifLoopOf(block, "_atom_site_fract_x");
  // single-atom structures may be written without a loop
  const rows: CifValue[][] = [];
  let tags: string[];
  if (loop) {
    tags = loop.tags;
    rows.push(...loop.rows);
  } else {
    tags = [...block.items.keys()].filter((t) => t.startsWith("_atom_site_") && !t.startsWith("_atom_site_aniso_"));
    rows.push(tags.map((t) => block.items.get(t)!));
  }
  const col = (t: string) => tags.indexOf(t);
  const cLabel = col("_atom_site_label");
  const cType = col("_atom_site_type_symbol");
  const cx = col("_atom_site_fract_x");
  const cy = col("_atom_site_fract_y");
  const cz = col("_atom_site_fract_z");
  const cOcc = col("_atom_site_occupancy");
  const cU = col("_atom_site_u_iso_or_equiv");
  const cB = col("_atom_site_b_iso_or_equiv");
  const cFlag = col("_atom_site_calc_flag");
  const loopLine = loop?.line ?? block.line;
  for (const [c, name] of [
    [cx, "_atom_site_fract_x"],
    [cy, "_atom_site_fract_y"],
    [cz, "_atom_site_fract_z"],
  ] as const) {
    if (c < 0) throw new CifError("no-atoms", "atom-site loop lacks fractional coordinates", loopLine, name);
  }
  if (cLabel < 0 && cType < 0) {
    throw new CifError("no-atoms", "atom-site loop has neither _atom_site_label nor _atom_site_type_symbol", loopLine, "_atom_site_label");
  }

  const sites: AtomSite[] = [];
  for (const row of rows) {
    const line = row[cx].line;
    const label = cLabel >= 0 && !isCifNull(row[cLabel]) ? row[cLabel].text : cType >= 0 ? row[cType].text : "?";
    if (cFlag >= 0 && !isCifNull(row[cFlag]) && row[cFlag].text.toLowerCase() === "dum") {
      warnings.push(`dummy site '${label}' (line ${line}) skipped`);
      continue;
    }
    const hasType = cType >= 0 && !isCifNull(row[cType]);
    const typeSymbol = hasType ? row[cType].text : label;
    const guess = elementFromSymbol(typeSymbol);
    if (!guess) {
      throw new CifError(
        "unknown-element",
        `no element recognised in ${hasType ? "type symbol" : "label"} '${typeSymbol}' of site '${label}'`,
        hasType ? row[cType].line : line,
        hasType ? "_atom_site_type_symbol" : "_atom_site_label",
      );
    }
    const coord = (c: number, name: string) => {
      const n = parseCifNumber(row[c], name);
      if (!n) throw new CifError("not-numeric", `coordinate of site '${label}' is unknown ('${row[c].text}')`, row[c].line, name);
      return n.value;
    };
    const x = coord(cx, "_atom_site_fract_x");
    const y = coord(cy, "_atom_site_fract_y");
    const z = coord(cz, "_atom_site_fract_z");
    let occupancy = 1;
    if (cOcc >= 0) {
      const n = parseCifNumber(row[cOcc], "_atom_site_occupancy");
      if (n) occupancy = n.value;
      if (occupancy < 0 || occupancy > 1.001) {
        throw new CifError("not-numeric", `occupancy of site '${label}' must be within 0…1, got ${occupancy}`, row[cOcc].line, "_atom_site_occupancy");
      }
    }
    let bIso = DEFAULT_B_ISO;
    let adpSource: AdpSource = "default";
    const u = cU >= 0 ? parseCifNumber(row[cU], "_atom_site_U_iso_or_equiv") : undefined;
    const b = cB >= 0 ? parseCifNumber(row[cB], "_atom_site_B_iso_or_equiv") : undefined;
    if (u) {
      bIso = EIGHT_PI2 * u.value;
      adpSource = "Uiso";
    } else if (b) {
      bIso = b.value;
      adpSource = "Biso";
    }
    sites.push({
      label,
      typeSymbol,
      element: guess.element,
      charge: guess.charge,
      deuterium: guess.deuterium,
      x,
      y,
      z,
      occupancy,
      bIso,
      adpSource,
      line,
    });
  }
  if (sites.length === 0) throw new CifError("no-atoms", "the atom-site loop has no usable rows", loopLine, "_atom_site_fract_x");

  readAniso(block, cell, sites, warnings);

  const defaulted = sites.filter((s) => s.adpSource === "default").map((s) => s.label);
  if (defaulted.length) {
    warnings.push(`no displacement parameter for ${defaulted.join(", ")}; B = ${DEFAULT_B_ISO} Å² assumed`);
  }
  const negative = sites.filter((s) => s.bIso < 0).map((s) => s.label);
  if (negative.length) warnings.push(`negative isotropic displacement for ${negative.join(", ")} (used as given)`);
  return sites;
}

const ANISO_U = ["_atom_site_aniso_u_11", "_atom_site_aniso_u_22", "_atom_site_aniso_u_33", "_atom_site_aniso_u_12", "_atom_site_aniso_u_13", "_atom_site_aniso_u_23"];
const ANISO_B = ANISO_U.map((t) => t.replace("_u_", "_b_"));

function readAniso(block: CifBlock, cell: CellParameters, sites: AtomSite[], warnings: string[]): void {
  const loop = cifLoopOf(block, "_atom_site_aniso_label");
  if (!loop) return;
  const isB = !loop.tags.includes(ANISO_U[0]) && loop.tags.includes(ANISO_B[0]);
  const names = isB ? ANISO_B : ANISO_U;
  const cols = names.map((t) => loop.tags.indexOf(t));
  if (cols.some((c) => c < 0)) {
    warnings.push(`_atom_site_aniso_ loop (line ${loop.line}) lacks some of U_11…U_23; ignored`);
    return;
  }
  const cLabel = loop.tags.indexOf("_atom_site_aniso_label");
  const byLabel = new Map<string, AtomSite[]>();
  for (const s of sites) byLabel.set(s.label, [...(byLabel.get(s.label) ?? []), s]);
  for (const row of loop.rows) {
    const label = row[cLabel].text;
    const targets = byLabel.get(label);
    if (!targets) {
      warnings.push(`anisotropic row for unknown site '${label}' (line ${row[cLabel].line}) ignored`);
      continue;
    }
    const vals = cols.map((c, i) => parseCifNumber(row[c], names[i]));
    if (vals.some((v) => !v)) continue;
    const scale = isB ? 1 / EIGHT_PI2 : 1;
    const ueq = uEquivalent(cell, vals.map((v) => v!.value * scale));
    if (!(ueq > 0)) {
      warnings.push(`anisotropic displacement of '${label}' gives U_eq ≤ 0; isotropic value kept`);
      continue;
    }
    for (const s of targets) {
      s.bIso = EIGHT_PI2 * ueq;
      s.adpSource = isB ? "Bani" : "Uani";
    }
  }
}

function readCitation(block: CifBlock): CifCitation {
  const authors = (cifValues(block, "_publ_author_name") ?? []).filter((v) => !isCifNull(v)).map((v) => v.text.trim());
  const year = firstNumber(block, ["_journal_year"]);
  return {
    journal: firstText(block, ["_journal_name_full", "_journal_name_abbrev"]),
    year,
    volume: firstText(block, ["_journal_volume"]),
    firstPage: firstText(block, ["_journal_page_first"]),
    lastPage: firstText(block, ["_journal_page_last"]),
    title: firstText(block, ["_publ_section_title"])?.replace(/\s+/g, " "),
    authors,
    databaseCode: firstText(block, ["_database_code_amcsd", "_cod_database_code", "_database_code_icsd"]),
  };
}

/**
 * Read a CIF 1.1 text into a structure model.
 *
 * - Block: the one named in `options.block`, else the first block with `_atom_site_fract_x`.
 * - Symmetry: operators from `_space_group_symop_operation_xyz` or `_symmetry_equiv_pos_as_xyz`; without
 *   either only P 1 is accepted.
 * - Sites: element from `_atom_site_type_symbol` (charges stripped, D → H) or the label's leading letters;
 *   occupancy default 1; B from `_atom_site_U_iso_or_equiv` (×8π²) or `_atom_site_B_iso_or_equiv`, replaced by
 *   8π²·U_eq when an `_atom_site_aniso_` row exists; B = 0.5 Å² with a warning when none is given.
 *
 * @throws CifError with code, 1-based line and data name for unusable files.
 */
export function parseCif(cifText: string, options: ParseCifOptions = {}): CifStructure {
  const { block: blockName } = options;
  const block = selectBlock(readCifBlocks(cifText), blockName);
  const warnings: string[] = [];
  const cell = readCell(block, warnings);
  const name = firstText(block, ["_space_group_name_h-m_alt", "_symmetry_space_group_name_h-m"]);
  const number = firstNumber(block, ["_space_group_it_number", "_symmetry_int_tables_number"]);
  const hall = firstText(block, ["_space_group_name_hall", "_symmetry_space_group_name_hall"]);
  const volume = cellVolume(cell);
  if (volume > CIF_LIMITS.maxCellVolume) {
    throw new CifError(
      "limit",
      `cell volume ${Math.round(volume)} Å³ is over the limit of ${CIF_LIMITS.maxCellVolume} Å³ (maxCellVolume) for imported structures`,
      block.names.get("_cell_length_a") ?? block.line,
      "_cell_length_a",
    );
  }
  const symops = readSymops(block, name, number, warnings);
  if (symops.length > CIF_LIMITS.maxSymops) {
    throw new CifError("limit", `${symops.length} symmetry operators is over the limit of ${CIF_LIMITS.maxSymops} (maxSymops)`, block.line, "_space_group_symop_operation_xyz");
  }
  const sites = readSites(block, cell, warnings);
  if (sites.length > CIF_LIMITS.maxSites) {
    throw new CifError("limit", `${sites.length} atom sites in the asymmetric unit is over the limit of ${CIF_LIMITS.maxSites} (maxSites)`, block.names.get("_atom_site_fract_x") ?? block.line, "_atom_site_fract_x");
  }
  const z = firstNumber(block, ["_cell_formula_units_z"]);
  return {
    blockName: block.name,
    cell,
    spaceGroup: { name, number, hall },
    symops,
    sites,
    formulaUnitsZ: z,
    mineral: firstText(block, ["_chemical_name_mineral"]),
    formulaSum: firstText(block, ["_chemical_formula_sum"]),
    citation: readCitation(block),
    ambient: {
      temperatureK: firstNumber(block, ["_diffrn_ambient_temperature", "_cell_measurement_temperature"]),
      pressureKPa: firstNumber(block, ["_diffrn_ambient_pressure", "_cell_measurement_pressure"]),
    },
    warnings,
  };
}
