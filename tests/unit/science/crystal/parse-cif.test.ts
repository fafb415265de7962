/**
 * CIF reader: STAR syntax and core-dictionary data names (CIF 1.1 syntax specification; Hall, Allen & Brown
 * 1991, Acta Cryst. A47, 655), plus the error paths required for unusable files.
 */
import { readFileSync } from "node:fs";
import { join } from "node:path";
import { describe, expect, it } from "vitest";
import { CifError, parseCif, parseCifNumber, readCifBlocks, uEquivalent } from "@/lib/science/crystal";

const fixture = (name: string) => readFileSync(join(process.cwd(), "tests/fixtures/gemmi/cif", name), "utf8");

/** A minimal, valid P-1 CIF; parts can be replaced to make broken variants. */
function miniCif(parts: { cell?: string; symops?: string; atoms?: string; extra?: string } = {}): string {
  const cell =
    parts.cell ??
    ["_cell_length_a 5.2", "_cell_length_b 9.1", "_cell_length_c 7.4", "_cell_angle_alpha 91.7", "_cell_angle_beta 104.6", "_cell_angle_gamma 89.8"].join("\n");
  const symops = parts.symops ?? ["loop_", "_space_group_symop_operation_xyz", "'x, y, z'", "'-x, -y, -z'"].join("\n");
  const atoms =
    parts.atoms ??
    ["loop_", "_atom_site_label", "_atom_site_type_symbol", "_atom_site_fract_x", "_atom_site_fract_y", "_atom_site_fract_z", "_atom_site_U_iso_or_equiv", "Si1 Si 0.1 0.2 0.3 0.01", "O1 O 0.3 0.1 0.2 0.02"].join("\n");
  return ["data_mini", "_space_group_name_H-M_alt 'P -1'", cell, symops, atoms, parts.extra ?? ""].join("\n") + "\n";
}

function cifError(fn: () => unknown): CifError {
  try {
    fn();
  } catch (e) {
    if (e instanceof CifError) return e;
    throw e;
  }
  throw new Error("expected a CifError");
}

describe("parseCif: operator loops (both data names)", () => {
  it("reads _space_group_symop_operation_xyz (halite, Fm-3m: 192 operators, ITA Vol. A group order)", () => {
    const s = parseCif(fixture("halite.cif"));
    expect(s.symops).toHaveLength(192);
    expect(s.spaceGroup).toMatchObject({ name: "F m -3 m", number: 225 });
    expect(s.warnings).toEqual([]);
  });

  it("reads _symmetry_equiv_pos_as_xyz (quartz, P3221: 6 operators, ITA Vol. A)", () => {
    const s = parseCif(fixture("quartz.cif"));
    expect(s.symops.map((o) => o.text)).toContain("-x+y,-x,z+1/3");
    expect(s.symops).toHaveLength(6);
    // '-x+y,-x,z+1/3' → rotation rows (-1 1 0), (-1 0 0), (0 0 1), translation (0, 0, 1/3)
    const op = s.symops.find((o) => o.text === "-x+y,-x,z+1/3")!;
    expect(op.rotation).toEqual([-1, 1, 0, -1, 0, 0, 0, 0, 1]);
    expect(op.translation[2]).toBeCloseTo(1 / 3, 12);
  });

  it("parses operator forms '1/2-x,y,1/2+z', 'x-y,x,-z', 'x+0.5,y,z' and rejects non-operators", () => {
    const s = parseCif(miniCif({ symops: ["loop_", "_symmetry_equiv_pos_as_xyz", "x,y,z", "'1/2-x,y,1/2+z'"].join("\n") }));
    expect(s.symops[1].rotation).toEqual([-1, 0, 0, 0, 1, 0, 0, 0, 1]);
    expect(s.symops[1].translation).toEqual([0.5, 0, 0.5]);
    const hex = parseCif(miniCif({ symops: ["loop_", "_symmetry_equiv_pos_as_xyz", "x,y,z", "'x-y,x,-z'", "'x+0.5,y,z'"].join("\n") }));
    expect(hex.symops[1].rotation).toEqual([1, -1, 0, 1, 0, 0, 0, 0, -1]);
    expect(hex.symops[2].translation[0]).toBe(0.5);
    // an incomplete list is flagged (x-y,x,-z generates a 6-fold rotoinversion group)
    expect(hex.warnings.join(" ")).toMatch(/do not form a group/);

    const bad = cifError(() => parseCif(miniCif({ symops: ["loop_", "_symmetry_equiv_pos_as_xyz", "x,y,z", "'x,y'"].join("\n") })));
    expect(bad.code).toBe("bad-symop");
    expect(bad.field).toBe("_symmetry_equiv_pos_as_xyz");
    expect(bad.line).toBe(12);
    expect(cifError(() => parseCif(miniCif({ symops: "_symmetry_equiv_pos_as_xyz 'x,y,z+q'" }))).code).toBe("bad-symop");
    expect(cifError(() => parseCif(miniCif({ symops: "_symmetry_equiv_pos_as_xyz 'x,x,z'" }))).message).toMatch(/determinant 0/);
  });
});

describe("parseCif: numbers, strings, text fields", () => {
  it("reads standard uncertainties in parentheses (CIF 1.1: su applies to the last digits)", () => {
    const v = (text: string) => parseCifNumber({ text, quoted: false, line: 1 }, "_x");
    expect(v("4.9134(2)")).toEqual({ value: 4.9134, esd: expect.closeTo(0.0002, 12) });
    expect(v("90.00(1)")!.esd).toBeCloseTo(0.01, 12);
    expect(v("12(3)")).toEqual({ value: 12, esd: 3 });
    expect(v("1.5E-3(2)")!.esd).toBeCloseTo(0.2e-3, 15);
    expect(v("-.25")).toEqual({ value: -0.25 });
    expect(v("?")).toBeUndefined();
    expect(v(".")).toBeUndefined();
    expect(() => v("4.91a")).toThrow(CifError);

    const s = parseCif(miniCif({ cell: ["_cell_length_a 4.9134(2)", "_cell_length_b 4.9134(2)", "_cell_length_c 5.4052(3)", "_cell_angle_alpha 90", "_cell_angle_beta 90", "_cell_angle_gamma 120.00(1)"].join("\n") }));
    expect(s.cell).toEqual({ a: 4.9134, b: 4.9134, c: 5.4052, alpha: 90, beta: 90, gamma: 120 });
  });

  it("reads quoted strings with embedded quotes, semicolon text fields, comments and author loops", () => {
    const extra = [
      "# a comment line",
      "_publ_section_title",
      ";",
      "The crystal structure",
      "  of a test mineral",
      ";",
      "_journal_name_full 'American Mineralogist'   # trailing comment",
      "_journal_year 1980",
      "_journal_volume 65",
      "_journal_page_first 920",
      "_chemical_name_mineral \"Quartz\"",
      "_chemical_formula_sum 'O2 Si'",
      "loop_",
      "_publ_author_name",
      "'O'Brien, T.'",
      "\"Smith, J. \"",
    ].join("\n");
    const s = parseCif(miniCif({ extra }));
    expect(s.citation).toMatchObject({ journal: "American Mineralogist", year: 1980, volume: "65", firstPage: "920" });
    expect(s.citation.title).toBe("The crystal structure of a test mineral");
    expect(s.citation.authors).toEqual(["O'Brien, T.", "Smith, J."]);
    expect(s.mineral).toBe("Quartz");
    expect(s.formulaSum).toBe("O2 Si");
  });

  it("treats ? and . as unknown (defaults with warnings) but quoted '?' as text", () => {
    const atoms = ["loop_", "_atom_site_label", "_atom_site_type_symbol", "_atom_site_fract_x", "_atom_site_fract_y", "_atom_site_fract_z", "_atom_site_occupancy", "_atom_site_U_iso_or_equiv", "Si1 ? 0.1 0.2 0.3 ? ?", "O1 O 0.3 0.1 0.2 . 0.02"].join("\n");
    const s = parseCif(miniCif({ atoms }));
    expect(s.sites[0]).toMatchObject({ element: "Si", typeSymbol: "Si1", occupancy: 1, bIso: 0.5, adpSource: "default" });
    expect(s.sites[1].occupancy).toBe(1);
    expect(s.warnings.join(" ")).toMatch(/no displacement parameter for Si1; B = 0.5/);
    const blocks = readCifBlocks("data_x\n_a '?'\n_b ?\n");
    expect(blocks[0].items.get("_a")).toMatchObject({ text: "?", quoted: true });
    expect(blocks[0].items.get("_b")).toMatchObject({ text: "?", quoted: false });
  });
});

describe("parseCif: atom sites", () => {
  it("strips oxidation states, maps D to H and falls back to the label's leading letters", () => {
    const atoms = [
      "loop_", "_atom_site_label", "_atom_site_type_symbol", "_atom_site_fract_x", "_atom_site_fract_y", "_atom_site_fract_z", "_atom_site_B_iso_or_equiv",
      "Fe1 Fe3+ 0 0 0 0.4", "O1 O2- 0.1 0.1 0.1 0.6", "Fe2 Fe+2 0.2 0.2 0.2 0.5", "D1 D 0.3 0.3 0.3 1.5", "Si1m ? 0.4 0.4 0.4 0.5", "O-H6 . 0.45 0.1 0.2 0.5", "Mn1 MN 0.5 0.2 0.1 0.5",
    ].join("\n");
    const s = parseCif(miniCif({ atoms }));
    expect(s.sites.map((x) => [x.element, x.charge])).toEqual([["Fe", 3], ["O", -2], ["Fe", 2], ["H", 0], ["Si", 0], ["O", 0], ["Mn", 0]]);
    expect(s.sites[3].deuterium).toBe(true);
    expect(s.sites[0]).toMatchObject({ bIso: 0.4, adpSource: "Biso", line: 20 });
  });

  it("converts U to B = 8π²U (ITC Vol. C 2006 ch. 6.1)", () => {
    const s = parseCif(miniCif());
    expect(s.sites[0].bIso).toBeCloseTo(8 * Math.PI ** 2 * 0.01, 12);
    expect(s.sites[0].adpSource).toBe("Uiso");
  });

  it("replaces U_iso by U_eq of the aniso loop; U_eq agrees with gemmi's UnitCell.calculate_u_eq", () => {
    const extra = ["loop_", "_atom_site_aniso_label", "_atom_site_aniso_U_11", "_atom_site_aniso_U_22", "_atom_site_aniso_U_33", "_atom_site_aniso_U_12", "_atom_site_aniso_U_13", "_atom_site_aniso_U_23", "Si1 0.010 0.008 0.012 0.001 0.003 -0.002"].join("\n");
    const s = parseCif(miniCif({ extra }));
    // gemmi 0.5.7: UnitCell(5.2, 9.1, 7.4, 91.7, 104.6, 89.8).calculate_u_eq(SMat33d(.010,.008,.012,.001,.003,-.002))
    expect(s.sites[0].bIso / (8 * Math.PI ** 2)).toBeCloseTo(0.0100085348442889, 12);
    expect(s.sites[0].adpSource).toBe("Uani");
    expect(s.sites[1].adpSource).toBe("Uiso");
    // gemmi 0.5.7, monoclinic cell (9.7, 8.9, 5.25, 90, 105.8, 90), same tensor
    expect(uEquivalent({ a: 9.7, b: 8.9, c: 5.25, alpha: 90, beta: 105.8, gamma: 90 }, [0.01, 0.008, 0.012, 0.001, 0.003, -0.002])).toBeCloseTo(0.009999035942154825, 12);
    // orthogonal axes: U_eq = (U11 + U22 + U33)/3 (Fischer & Tillmanns 1988, Acta Cryst. C44, 775)
    const rutile = parseCif(fixture("rutile.cif"));
    expect(rutile.sites[0].bIso / (8 * Math.PI ** 2)).toBeCloseTo((0.0066 + 0.0066 + 0.0043) / 3, 12);
  });

  it("skips dummy sites (_atom_site_calc_flag dum)", () => {
    const atoms = ["loop_", "_atom_site_label", "_atom_site_fract_x", "_atom_site_fract_y", "_atom_site_fract_z", "_atom_site_calc_flag", "Si1 0.1 0.2 0.3 d", "Q1 0.5 0.5 0.5 dum"].join("\n");
    const s = parseCif(miniCif({ atoms }));
    expect(s.sites.map((x) => x.label)).toEqual(["Si1"]);
    expect(s.warnings.join(" ")).toMatch(/dummy site 'Q1'/);
  });
});

describe("parseCif: data blocks", () => {
  const two = "data_global\n_journal_year 2001\n" + miniCif().replace("data_mini", "data_phase2") + miniCif().replace("data_mini", "data_phase3").replace("Si1 Si", "Ge1 Ge");
  it("takes the first block with atom sites, or the named one", () => {
    expect(parseCif(two).blockName).toBe("phase2");
    expect(parseCif(two, { block: "PHASE3" }).sites[0].element).toBe("Ge");
    const e = cifError(() => parseCif(two, { block: "nope" }));
    expect(e.code).toBe("block-not-found");
    expect(e.message).toMatch(/global, phase2, phase3/);
  });
});

describe("parseCif: errors name line and field", () => {
  it("no cell", () => {
    const e = cifError(() => parseCif(miniCif({ cell: "_cell_length_a 5.2\n_cell_length_b 5.3\n_cell_length_c ?" })));
    expect([e.code, e.field, e.line]).toEqual(["missing-cell", "_cell_length_c", 5]);
    expect(e.message).toMatch(/^CIF line 5 \(_cell_length_c\)/);
    expect(cifError(() => parseCif(miniCif({ cell: "_cell_length_b 5.3\n_cell_length_c 5" }))).field).toBe("_cell_length_a");
    expect(cifError(() => parseCif(miniCif({ cell: "_cell_length_a -5\n_cell_length_b 5.3\n_cell_length_c 5" }))).code).toBe("bad-cell");
  });

  it("no atoms", () => {
    const e = cifError(() => parseCif(miniCif({ atoms: "_atom_type_symbol Si" })));
    expect([e.code, e.field]).toEqual(["no-atoms", "_atom_site_fract_x"]);
    expect(cifError(() => parseCif("# nothing here\n")).code).toBe("no-data-block");
  });

  it("no symmetry operators (only P 1 is accepted without them)", () => {
    const e = cifError(() => parseCif(miniCif({ symops: "" })));
    expect(e.code).toBe("no-symmetry");
    expect(e.line).toBe(2);
    expect(e.message).toMatch(/P -1/);
    const p1 = parseCif(miniCif({ symops: "" }).replace("'P -1'", "'P 1'"));
    expect(p1.symops.map((o) => o.text)).toEqual(["x,y,z"]);
    expect(p1.warnings.join(" ")).toMatch(/P 1 assumed/);
  });

  it("unknown element", () => {
    const atoms = ["loop_", "_atom_site_label", "_atom_site_type_symbol", "_atom_site_fract_x", "_atom_site_fract_y", "_atom_site_fract_z", "Si1 Si 0.1 0.2 0.3", "Xx1 Xx 0.3 0.1 0.2"].join("\n");
    const e = cifError(() => parseCif(miniCif({ atoms })));
    expect([e.code, e.field, e.line]).toEqual(["unknown-element", "_atom_site_type_symbol", 20]);
    expect(e.message).toMatch(/'Xx' of site 'Xx1'/);
  });

  it("coordinates not numeric", () => {
    const atoms = ["loop_", "_atom_site_label", "_atom_site_fract_x", "_atom_site_fract_y", "_atom_site_fract_z", "Si1 0.1 0.2 0.3", "O1 0.3 abc 0.2"].join("\n");
    const e = cifError(() => parseCif(miniCif({ atoms })));
    expect([e.code, e.field, e.line]).toEqual(["not-numeric", "_atom_site_fract_y", 19]);
    const unknown = cifError(() => parseCif(miniCif({ atoms: atoms.replace("abc", "?") })));
    expect(unknown.message).toMatch(/coordinate of site 'O1' is unknown/);
  });

  it("duplicate data names", () => {
    const e = cifError(() => parseCif(miniCif({ extra: "_cell_length_b 9.2" })));
    expect([e.code, e.field, e.line]).toEqual(["duplicate-name", "_cell_length_b", 22]);
    expect(e.message).toMatch(/first on line 4/);
  });

  it("syntax: unclosed text field, unclosed quote, ragged loop, value without name", () => {
    expect(cifError(() => parseCif("data_x\n_publ_section_title\n;\nno end\n"))).toMatchObject({ code: "syntax", line: 3 });
    expect(cifError(() => parseCif("data_x\n_a 'open\n"))).toMatchObject({ code: "syntax", line: 2 });
    expect(cifError(() => parseCif("data_x\nloop_\n_a\n_b\n1 2\n3\n"))).toMatchObject({ code: "loop-shape", line: 6, field: "_a" });
    expect(cifError(() => parseCif("data_x\n_a 1\nstray\n"))).toMatchObject({ code: "syntax", line: 3 });
  });
});
