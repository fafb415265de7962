/**
 * Lithodex's own phase-map symbol scheme: every mineral group gets a shape and a colour, every mineral
 * an IMA symbol as its label. Colours encode the chemical class (nine classes ↔ the nine colours of Paul
 * Tol's colour-blind-safe "muted" scheme, see ./palette); shapes tell the groups of one class apart.
 * Confidence is encoded by fill, never by colour: a confirmed phase is drawn filled, a candidate as an
 * outline only (dashed). Pure and deterministic: the same group always gets the same symbol.
 */
import { imaSymbol } from "./ima-symbols";
import { TOL_MUTED, TOL_PALE_GREY } from "./palette";

/** Glyph shapes, all drawn to the same visual size. */
export const SHAPES = ["circle", "square", "triangle", "diamond", "triangle-down", "pentagon", "hexagon", "star"] as const;
export type Shape = (typeof SHAPES)[number];

/** Chemical classes of the scheme (our grouping, after the usual Strunz-style classes; common practice). */
export const MINERAL_CLASSES = {
  silica: { label: "Silica minerals", colour: TOL_MUTED.cyan },
  framework: { label: "Feldspars, feldspathoids, zeolites", colour: TOL_MUTED.sand },
  sheet: { label: "Sheet silicates and clays", colour: TOL_MUTED.green },
  silicate: { label: "Chain, ring and orthosilicates", colour: TOL_MUTED.teal },
  carbonate: { label: "Carbonates", colour: TOL_MUTED.olive },
  sulfate: { label: "Sulfates", colour: TOL_MUTED.purple },
  sulfide: { label: "Sulfides and native elements", colour: TOL_MUTED.wine },
  oxide: { label: "Oxides and hydroxides", colour: TOL_MUTED.rose },
  other: { label: "Halides, phosphates, tungstates, accessory silicates", colour: TOL_MUTED.indigo },
} as const;
export type MineralClass = keyof typeof MINERAL_CLASSES;

/** Mineral group (as in reference_phases.mineral_group) → class and shape. Each pair is used once. */
export const GROUP_SYMBOLS: Readonly<Record<string, { cls: MineralClass; shape: Shape; label: string }>> = {
  silica: { cls: "silica", shape: "circle", label: "Silica" },

  feldspar: { cls: "framework", shape: "circle", label: "Feldspar" },
  feldspathoid: { cls: "framework", shape: "square", label: "Feldspathoid" },
  zeolite: { cls: "framework", shape: "triangle", label: "Zeolite" },

  mica: { cls: "sheet", shape: "circle", label: "Mica" },
  clay: { cls: "sheet", shape: "square", label: "Clay" },
  chlorite: { cls: "sheet", shape: "triangle", label: "Chlorite" },
  serpentine: { cls: "sheet", shape: "diamond", label: "Serpentine" },
  talc: { cls: "sheet", shape: "triangle-down", label: "Talc" },
  pyrophyllite: { cls: "sheet", shape: "pentagon", label: "Pyrophyllite" },
  prehnite: { cls: "sheet", shape: "hexagon", label: "Prehnite" },

  amphibole: { cls: "silicate", shape: "circle", label: "Amphibole" },
  pyroxene: { cls: "silicate", shape: "square", label: "Pyroxene" },
  garnet: { cls: "silicate", shape: "triangle", label: "Garnet" },
  olivine: { cls: "silicate", shape: "diamond", label: "Olivine" },
  epidote: { cls: "silicate", shape: "triangle-down", label: "Epidote" },
  aluminosilicate: { cls: "silicate", shape: "pentagon", label: "Al₂SiO₅" },
  cyclosilicate: { cls: "silicate", shape: "hexagon", label: "Ring silicate" },
  tourmaline: { cls: "silicate", shape: "star", label: "Tourmaline" },

  carbonate: { cls: "carbonate", shape: "circle", label: "Carbonate" },
  sulfate: { cls: "sulfate", shape: "circle", label: "Sulfate" },

  sulfide: { cls: "sulfide", shape: "circle", label: "Sulfide" },
  "native element": { cls: "sulfide", shape: "star", label: "Native element" },

  oxide: { cls: "oxide", shape: "circle", label: "Oxide" },
  hydroxide: { cls: "oxide", shape: "square", label: "Hydroxide" },

  halide: { cls: "other", shape: "circle", label: "Halide" },
  phosphate: { cls: "other", shape: "square", label: "Phosphate" },
  tungstate: { cls: "other", shape: "triangle", label: "Tungstate" },
  titanite: { cls: "other", shape: "diamond", label: "Titanite" },
  zircon: { cls: "other", shape: "triangle-down", label: "Zircon" },
};

/** How one phase is drawn. */
export interface PhaseSymbol {
  /** Lowercase mineral name. */
  mineral: string;
  /** IMA symbol (label). */
  symbol: string;
  /** Mineral group key, or null when unknown. */
  group: string | null;
  groupLabel: string;
  cls: MineralClass | null;
  /** Fill/stroke colour "#RRGGBB". */
  colour: string;
  shape: Shape;
}

/** FNV-1a 32-bit hash (Fowler–Noll–Vo; public-domain algorithm) — a stable pick for unknown groups. */
function fnv1a(s: string): number {
  let h = 0x811c9dc5;
  for (let i = 0; i < s.length; i++) {
    h ^= s.charCodeAt(i);
    h = Math.imul(h, 0x01000193) >>> 0;
  }
  return h;
}

/**
 * Style of a mineral group. A group outside {@link GROUP_SYMBOLS} (e.g. from an imported structure) is
 * drawn in Tol's pale grey with a shape picked by a stable hash of its name, so it never borrows a known
 * group's colour.
 *
 * @param group - mineral group, any case; null/empty for unknown
 */
export function groupStyle(group: string | null | undefined): { colour: string; shape: Shape; cls: MineralClass | null; label: string } {
  const key = group?.trim().toLowerCase() ?? "";
  const known = GROUP_SYMBOLS[key];
  if (known) return { colour: MINERAL_CLASSES[known.cls].colour, shape: known.shape, cls: known.cls, label: known.label };
  return { colour: TOL_PALE_GREY, shape: SHAPES[fnv1a(key) % SHAPES.length], cls: null, label: key ? key[0].toUpperCase() + key.slice(1) : "Unknown group" };
}

/**
 * The symbol of one phase: group shape and colour, IMA symbol label.
 *
 * @param mineral - IMA mineral name (any case)
 * @param group - its mineral group (reference_phases.mineral_group), or null
 */
export function phaseSymbol(mineral: string, group: string | null | undefined): PhaseSymbol {
  const style = groupStyle(group);
  return {
    mineral: mineral.trim().toLowerCase(),
    symbol: imaSymbol(mineral),
    group: group?.trim().toLowerCase() || null,
    groupLabel: style.label,
    cls: style.cls,
    colour: style.colour,
    shape: style.shape,
  };
}
