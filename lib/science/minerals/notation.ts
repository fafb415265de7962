/**
 * How mineral formulas and space groups are written for people (issue 11 §6). Pure.
 *
 * Formulas: the ideal formula in mineral notation — structural groups kept (OH, CO3, SO4, H2O), e.g. goethite FeO(OH)
 * rather than the CIF sum "Fe O2 H". The table gives the end-member or general formulas as the IMA list of minerals
 * writes them (written from memory; check against the current IMA–CNMNC list before relying on a detail). A phase
 * not in the table (an imported CIF) shows its CIF sum formula compacted ("Cl Na" → "ClNa"); hydrogen is never dropped.
 *
 * Space groups: Hermann–Mauguin symbols as printed in the International Tables for Crystallography Vol. A (Aroyo
 * 2016): no spaces, the bar over inversion axes (3̄, written with U+0304), screw axes with subscripts (2₁, 4₁, 6₃),
 * the short symbol for monoclinic full symbols ("C 1 2/m 1" → C2/m), and CIF setting suffixes (":H", ":2") left out.
 */

export const MINERAL_FORMULAS: Record<string, string> = {
  actinolite: "Ca2(Mg,Fe)5Si8O22(OH)2",
  albite: "NaAlSi3O8",
  almandine: "Fe3Al2(SiO4)3",
  alunite: "KAl3(SO4)2(OH)6",
  analcime: "NaAlSi2O6·H2O",
  anatase: "TiO2",
  andalusite: "Al2SiO5",
  andesine: "(Na,Ca)(Al,Si)4O8",
  andradite: "Ca3Fe2(SiO4)3",
  anhydrite: "CaSO4",
  ankerite: "Ca(Fe,Mg)(CO3)2",
  annite: "KFe3AlSi3O10(OH)2",
  anorthite: "CaAl2Si2O8",
  anthophyllite: "(Mg,Fe)7Si8O22(OH)2",
  aragonite: "CaCO3",
  arsenopyrite: "FeAsS",
  augite: "(Ca,Mg,Fe)2Si2O6",
  baryte: "BaSO4",
  beryl: "Be3Al2Si6O18",
  boehmite: "AlO(OH)",
  brookite: "TiO2",
  calcite: "CaCO3",
  cassiterite: "SnO2",
  celestine: "SrSO4",
  cerussite: "PbCO3",
  chalcopyrite: "CuFeS2",
  chamosite: "(Fe,Mg)5Al(Si3Al)O10(OH)8",
  chromite: "FeCr2O4",
  chrysotile: "Mg3Si2O5(OH)4",
  cinnabar: "HgS",
  clinochlore: "Mg5Al(AlSi3O10)(OH)8",
  clinozoisite: "Ca2Al3(SiO4)(Si2O7)O(OH)",
  coesite: "SiO2",
  copper: "Cu",
  cordierite: "Mg2Al4Si5O18",
  corundum: "Al2O3",
  covellite: "CuS",
  cristobalite: "SiO2",
  cuprite: "Cu2O",
  diaspore: "AlO(OH)",
  dickite: "Al2Si2O5(OH)4",
  diopside: "CaMgSi2O6",
  dolomite: "CaMg(CO3)2",
  dravite: "NaMg3Al6(Si6O18)(BO3)3(OH)3(OH)",
  enstatite: "MgSiO3",
  epidote: "Ca2(Al2Fe)(SiO4)(Si2O7)O(OH)",
  fayalite: "Fe2SiO4",
  ferberite: "FeWO4",
  fluorapatite: "Ca5(PO4)3F",
  fluorite: "CaF2",
  forsterite: "Mg2SiO4",
  galena: "PbS",
  goethite: "FeO(OH)",
  gold: "Au",
  "graphite-2h": "C",
  grossular: "Ca3Al2(SiO4)3",
  grunerite: "Fe7Si8O22(OH)2",
  gypsum: "CaSO4·2H2O",
  halite: "NaCl",
  hedenbergite: "CaFeSi2O6",
  hematite: "Fe2O3",
  illite: "K0.65Al2(Al0.65Si3.35O10)(OH)2",
  ilmenite: "FeTiO3",
  jarosite: "KFe3(SO4)2(OH)6",
  kaolinite: "Al2Si2O5(OH)4",
  kyanite: "Al2SiO5",
  labradorite: "(Ca,Na)(Al,Si)4O8",
  laumontite: "CaAl2Si4O12·4H2O",
  lepidocrocite: "FeO(OH)",
  lizardite: "Mg3Si2O5(OH)4",
  "magnesio-hornblende": "Ca2(Mg4Al)(Si7Al)O22(OH)2",
  magnesite: "MgCO3",
  magnetite: "Fe3O4",
  marcasite: "FeS2",
  microcline: "KAlSi3O8",
  molybdenite: "MoS2",
  montmorillonite: "(Na,Ca)0.33(Al,Mg)2Si4O10(OH)2·nH2O",
  muscovite: "KAl2(AlSi3O10)(OH)2",
  nepheline: "Na3K(Al4Si4O16)",
  oligoclase: "(Na,Ca)(Al,Si)4O8",
  orthoclase: "KAlSi3O8",
  pentlandite: "(Fe,Ni)9S8",
  phlogopite: "KMg3(AlSi3O10)(OH)2",
  prehnite: "Ca2Al2Si3O10(OH)2",
  pyrite: "FeS2",
  pyrope: "Mg3Al2(SiO4)3",
  pyrophyllite: "Al2Si4O10(OH)2",
  pyrrhotite: "Fe1−xS",
  quartz: "SiO2",
  rhodochrosite: "MnCO3",
  riebeckite: "Na2(Fe2+3Fe3+2)Si8O22(OH)2",
  rutile: "TiO2",
  sanidine: "KAlSi3O8",
  scheelite: "CaWO4",
  siderite: "FeCO3",
  sillimanite: "Al2SiO5",
  smithsonite: "ZnCO3",
  spessartine: "Mn3Al2(SiO4)3",
  sphalerite: "ZnS",
  spinel: "MgAl2O4",
  sylvite: "KCl",
  talc: "Mg3Si4O10(OH)2",
  titanite: "CaTiSiO5",
  tremolite: "Ca2Mg5Si8O22(OH)2",
  tridymite: "SiO2",
  uraninite: "UO2",
  vermiculite: "Mg0.7(Mg,Fe,Al)6(Si,Al)8O20(OH)4·8H2O",
  "xenotime-(y)": "YPO4",
  zincite: "ZnO",
  zircon: "ZrSiO4",
  zoisite: "Ca2Al3(SiO4)(Si2O7)O(OH)",
};

/** The formula shown for a phase: mineral notation when the mineral is known, else the CIF sum formula compacted. */
export function mineralFormula(mineral: string, sumFormula: string | null | undefined): string {
  const known = MINERAL_FORMULAS[mineral.trim().toLowerCase()];
  if (known) return known;
  return (sumFormula ?? "").replace(/\s+/g, "");
}

/** A formula reduced for searching: case, spaces, brackets, dots and commas ignored ("Fe S2", "FeS2", "fes2" agree). */
export function formulaSearchKey(formula: string): string {
  return formula.toLowerCase().replace(/[\s()[\]·.,+−-]/g, "");
}

const SUB: Record<string, string> = { "0": "₀", "1": "₁", "2": "₂", "3": "₃", "4": "₄", "5": "₅", "6": "₆" };

/**
 * A CIF space-group name ("P 1 21/c 1", "R -3 c :H", "I 41/a m d :2") as a Hermann–Mauguin symbol (P2₁/c, R3̄c,
 * I4₁/amd). Names it cannot read come back with only the spaces removed.
 */
export function hermannMauguin(name: string | null | undefined): string {
  if (!name) return "";
  const raw = name.trim().replace(/\s*:\s*\w+$/, "");
  const parts = raw.split(/\s+/);
  if (parts.length < 2) return raw.replace(/\s+/g, "");
  const [lattice, ...rest] = parts;
  let axes = rest;
  // Monoclinic full symbols: "C 1 2/m 1" → C2/m (the unique axis is the one that is not 1).
  if (axes.length === 3 && axes.filter((a) => a === "1").length === 2) axes = axes.filter((a) => a !== "1");
  const axis = (a: string) =>
    a
      .replace(/^-(\d)/, "$1\u0304")
      .replace(/(\d)(\d)(?=\/|$)/, (_, n: string, s: string) => `${n}${SUB[s] ?? s}`);
  return `${lattice}${axes.map(axis).join("")}`;
}
