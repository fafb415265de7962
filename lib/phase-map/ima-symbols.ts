/**
 * IMA–CNMNC mineral symbols used as map and table labels. Pure data.
 *
 * Source: Warr, L.N. (2021) IMA–CNMNC approved mineral symbols. Mineralogical Magazine 85, 291–320.
 * The first group (the common minerals of the phase maps) was taken from Warr (2021); the others
 * were written from memory of Warr's table and should be checked against it before a publication
 * (they are labels only: nothing is computed from them).
 */

/** Lowercase IMA mineral name (as in reference_phases.mineral) → symbol. */
export const IMA_SYMBOLS: Readonly<Record<string, string>> = {
  // Common minerals (Warr 2021)
  quartz: "Qz",
  calcite: "Cal",
  dolomite: "Dol",
  halite: "Hl",
  gypsum: "Gp",
  anhydrite: "Anh",
  baryte: "Brt",
  fluorite: "Fl",
  pyrite: "Py",
  galena: "Gn",
  sphalerite: "Sp",
  chalcopyrite: "Ccp",
  hematite: "Hem",
  magnetite: "Mag",
  goethite: "Gth",
  rutile: "Rt",
  corundum: "Crn",
  kaolinite: "Kln",
  muscovite: "Ms",
  albite: "Ab",
  orthoclase: "Or",
  microcline: "Mc",
  siderite: "Sd",
  aragonite: "Arg",
  talc: "Tlc",
  forsterite: "Fo",
  // From memory of Warr (2021), Table 1.
  actinolite: "Act",
  almandine: "Alm",
  alunite: "Alu",
  analcime: "Anl",
  anatase: "Ant",
  andalusite: "And",
  andradite: "Adr",
  ankerite: "Ank",
  annite: "Ann",
  andesine: "Ads",
  anorthite: "An",
  anthophyllite: "Ath",
  arsenopyrite: "Apy",
  augite: "Aug",
  beryl: "Brl",
  boehmite: "Bhm",
  brookite: "Brk",
  cassiterite: "Cst",
  celestine: "Clt",
  cerussite: "Cer",
  chromite: "Chr",
  chrysotile: "Ctl",
  chamosite: "Chm",
  cinnabar: "Cin",
  clinochlore: "Clc",
  clinozoisite: "Czo",
  coesite: "Coe",
  copper: "Cu",
  cordierite: "Crd",
  covellite: "Cv",
  cristobalite: "Crs",
  cuprite: "Cpr",
  diaspore: "Dsp",
  dickite: "Dck",
  diopside: "Di",
  dravite: "Drv",
  enstatite: "En",
  epidote: "Ep",
  fayalite: "Fa",
  ferberite: "Fbr",
  fluorapatite: "Fap",
  gold: "Au",
  graphite: "Gr",
  grossular: "Grs",
  grunerite: "Gru",
  hedenbergite: "Hd",
  illite: "Ilt",
  labradorite: "Lbr",
  ilmenite: "Ilm",
  jarosite: "Jrs",
  kyanite: "Ky",
  laumontite: "Lmt",
  lepidocrocite: "Lpc",
  lizardite: "Lz",
  "magnesio-hornblende": "Mhb",
  magnesite: "Mgs",
  marcasite: "Mrc",
  molybdenite: "Mol",
  montmorillonite: "Mnt",
  oligoclase: "Olg",
  vermiculite: "Vrm",
  nepheline: "Nph",
  pentlandite: "Pn",
  phlogopite: "Phl",
  prehnite: "Prh",
  pyrope: "Prp",
  pyrophyllite: "Prl",
  pyrrhotite: "Po",
  rhodochrosite: "Rds",
  riebeckite: "Rbk",
  sanidine: "Sa",
  scheelite: "Sch",
  sillimanite: "Sil",
  smithsonite: "Smt",
  spessartine: "Sps",
  spinel: "Spl",
  sylvite: "Syl",
  titanite: "Ttn",
  tremolite: "Tr",
  tridymite: "Trd",
  uraninite: "Urn",
  "xenotime-(y)": "Xtm-Y",
  zincite: "Znc",
  zircon: "Zrn",
  zoisite: "Zo",
};

/**
 * The label for a mineral: its IMA symbol, or — for a name not in the table (e.g. a structure an analyst
 * imported) — the first three letters with a trailing "*" so it is never mistaken for an IMA symbol.
 *
 * @param mineral - IMA mineral name, any case (a polytype suffix such as "-2h" is ignored)
 */
export function imaSymbol(mineral: string): string {
  const key = mineral.trim().toLowerCase();
  // A polytype suffix (graphite-2H, molybdenite-2H, muscovite-2M1) does not change the symbol.
  const known = IMA_SYMBOLS[key] ?? IMA_SYMBOLS[key.replace(/-\d+[a-z]\d*$/, "")];
  if (known) return known;
  const letters = key.replace(/[^a-z]/g, "");
  if (!letters) return "?";
  return `${letters[0].toUpperCase()}${letters.slice(1, 3)}*`;
}
