/**
 * Mineral series whose members a powder pattern alone separates poorly. Names follow common practice and the
 * nomenclature reports: biotite as the field name of dark trioctahedral micas between annite and phlogopite
 * (Rieder et al. 1998, Can. Mineral. 36, 905); the feldspar, pyroxene, olivine, garnet, spinel and apatite group
 * names of Deer, Howie & Zussman (2013, "An Introduction to the Rock-Forming Minerals", 3rd edn); tremolite–
 * actinolite (Hawthorne et al. 2012, Am. Mineral. 97, 2031).
 *
 * `report: "always"`: the series name is what a powder pattern supports even when one structure fits best (biotite
 * compositions vary continuously; K-feldspar polymorphs differ by Al/Si order), so it is always the reported name.
 * `report: "series"`: members differ so little in cell and intensities that a fit which cannot choose reports the
 * series name. `report: "member"`: the cell parameter identifies the member (garnets, spinels, olivines,
 * carbonates differ by up to several percent), so the member needing the least cell change is reported and the
 * others are listed as alternatives.
 */

export interface MineralSeries {
  name: string;
  members: readonly string[];
  report: "always" | "series" | "member";
  /** Two members selected together are always one reported phase (polytypes that a rock sample rarely resolves). */
  mergeAlways?: boolean;
}

export const MINERAL_SERIES: readonly MineralSeries[] = [
  { name: "biotite", members: ["annite", "phlogopite", "siderophyllite", "eastonite"], report: "always" },
  { name: "K-feldspar", members: ["orthoclase", "microcline", "sanidine"], report: "always" },
  { name: "plagioclase", members: ["albite", "oligoclase", "andesine", "labradorite", "bytownite", "anorthite"], report: "series" },
  { name: "tremolite-actinolite", members: ["tremolite", "actinolite"], report: "series" },
  { name: "white mica", members: ["muscovite", "illite", "phengite"], report: "member" },
  { name: "chlorite", members: ["clinochlore", "chamosite"], report: "member" },
  { name: "kaolin group", members: ["kaolinite", "dickite", "nacrite", "halloysite"], report: "member", mergeAlways: true },
  { name: "calcic amphibole", members: ["tremolite", "actinolite", "magnesio-hornblende", "hornblende", "pargasite"], report: "member" },
  { name: "garnet", members: ["almandine", "pyrope", "spessartine", "grossular", "andradite", "uvarovite"], report: "member" },
  { name: "spinel group", members: ["magnetite", "chromite", "spinel", "hercynite", "franklinite"], report: "member" },
  { name: "olivine", members: ["forsterite", "fayalite"], report: "member" },
  { name: "clinopyroxene", members: ["diopside", "hedenbergite", "augite"], report: "member" },
  { name: "apatite", members: ["fluorapatite", "hydroxylapatite", "chlorapatite"], report: "member" },
  { name: "calcite group", members: ["calcite", "magnesite", "siderite", "rhodochrosite", "smithsonite"], report: "member" },
];

/** The series a mineral belongs to (the first listed when several apply). */
export function seriesOf(mineral: string): MineralSeries | undefined {
  const m = mineral.toLowerCase();
  return MINERAL_SERIES.find((s) => s.members.includes(m));
}

/** The series shared by all the given minerals, if any (preferring one that reports its own name). */
export function commonSeries(minerals: readonly string[]): MineralSeries | undefined {
  const lower = minerals.map((m) => m.toLowerCase());
  const shared = MINERAL_SERIES.filter((s) => lower.every((m) => s.members.includes(m)));
  return shared.find((s) => s.report !== "member") ?? shared[0];
}
