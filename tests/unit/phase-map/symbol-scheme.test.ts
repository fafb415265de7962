import { describe, expect, test } from "vitest";
import { GROUP_SYMBOLS, IMA_SYMBOLS, MINERAL_CLASSES, SHAPES, TOL_MUTED, TOL_PALE_GREY, contrastRatio, groupStyle, imaSymbol, labelColourOn, phaseSymbol, relativeLuminance } from "@/lib/phase-map";
import { LIBRARY_PHASES } from "@/lib/science/minerals";

describe("palette", () => {
  test("the nine class colours are Paul Tol's muted scheme", () => {
    // Tol, "Colour Schemes", SRON/EPS/TN/09-002 issue 3.2 (2021), muted qualitative scheme and its pale grey.
    expect(Object.values(TOL_MUTED)).toEqual(["#CC6677", "#332288", "#DDCC77", "#117733", "#88CCEE", "#882255", "#44AA99", "#999933", "#AA4499"]);
    expect(TOL_PALE_GREY).toBe("#DDDDDD");
    expect(new Set(Object.values(MINERAL_CLASSES).map((c) => c.colour))).toEqual(new Set(Object.values(TOL_MUTED)));
  });

  test("WCAG 2.1 luminance and contrast match the published reference points", () => {
    // WCAG 2.1 definition: white has luminance 1, black 0, their contrast is 21:1.
    expect(relativeLuminance("#FFFFFF")).toBeCloseTo(1, 10);
    expect(relativeLuminance("#000000")).toBe(0);
    expect(contrastRatio("#000000", "#FFFFFF")).toBeCloseTo(21, 10);
    // WebAIM contrast checker (from memory): #767676 on white is 4.54:1, the lightest grey passing AA.
    expect(contrastRatio("#767676", "#FFFFFF")).toBeCloseTo(4.54, 2);
  });

  test("the label drawn on every class colour reaches WCAG AA for large bold text (3:1)", () => {
    // WCAG 2.1 SC 1.4.3: 3:1 for large text (≥ 14 pt bold); our map labels are short bold symbols.
    for (const { colour } of Object.values(MINERAL_CLASSES)) expect(contrastRatio(colour, labelColourOn(colour))).toBeGreaterThanOrEqual(3);
  });

  test("the label on every class colour reaches 4.5:1 for small text (WCAG 2.2 SC 1.4.3; phase chips are 12 px)", () => {
    for (const { colour } of Object.values(MINERAL_CLASSES)) expect(contrastRatio(colour, labelColourOn(colour)), colour).toBeGreaterThanOrEqual(4.5);
  });
});

describe("symbol scheme", () => {
  test("no two groups share colour and shape; every shape is a known one", () => {
    const seen = new Set<string>();
    for (const [g, s] of Object.entries(GROUP_SYMBOLS)) {
      const style = groupStyle(g);
      expect(SHAPES).toContain(style.shape);
      const key = `${style.colour}/${style.shape}`;
      expect(seen.has(key), `${g} repeats ${key}`).toBe(false);
      seen.add(key);
      expect(style.colour).toBe(MINERAL_CLASSES[s.cls].colour);
    }
  });

  test("deterministic: the same input always gives the same symbol; case and spaces do not matter", () => {
    expect(phaseSymbol("Quartz", "Silica")).toEqual(phaseSymbol("quartz", "silica"));
    expect(phaseSymbol(" pyrite ", "sulfide")).toEqual({ mineral: "pyrite", symbol: "Py", group: "sulfide", groupLabel: "Sulfide", cls: "sulfide", colour: TOL_MUTED.wine, shape: "circle" });
    expect(groupStyle("borate")).toEqual(groupStyle("borate"));
  });

  test("an unknown group is pale grey (never a class colour) with a stable shape", () => {
    const s = groupStyle("borate");
    expect(s.colour).toBe(TOL_PALE_GREY);
    expect(s.cls).toBeNull();
    expect(SHAPES).toContain(s.shape);
    expect(groupStyle(null).label).toBe("Unknown group");
  });

  test("every reference phase shipped in the library has a known group and an IMA symbol", () => {
    for (const p of LIBRARY_PHASES) {
      expect(GROUP_SYMBOLS[p.group ?? ""], `${p.mineral} group ${p.group}`).toBeDefined();
      expect(imaSymbol(p.mineral), `${p.mineral} symbol`).not.toMatch(/\*$/);
    }
  });

  test("IMA symbols are unique and follow Warr (2021) for the common minerals of the phase maps", () => {
    const symbols = Object.values(IMA_SYMBOLS);
    expect(new Set(symbols).size).toBe(symbols.length);
    // Warr (2021) Mineral. Mag. 85, 291–320.
    const expected: Record<string, string> = {
      quartz: "Qz", calcite: "Cal", dolomite: "Dol", halite: "Hl", gypsum: "Gp", anhydrite: "Anh", baryte: "Brt", fluorite: "Fl",
      pyrite: "Py", galena: "Gn", sphalerite: "Sp", chalcopyrite: "Ccp", hematite: "Hem", magnetite: "Mag", goethite: "Gth",
      rutile: "Rt", corundum: "Crn", kaolinite: "Kln", muscovite: "Ms", albite: "Ab", orthoclase: "Or", microcline: "Mc",
      siderite: "Sd", aragonite: "Arg", talc: "Tlc", forsterite: "Fo",
    };
    for (const [m, sym] of Object.entries(expected)) expect(imaSymbol(m)).toBe(sym);
  });

  test("a mineral outside the table gets a starred label that is not an IMA symbol", () => {
    expect(imaSymbol("Wulfenite")).toBe("Wul*");
    expect(Object.values(IMA_SYMBOLS)).not.toContain(imaSymbol("wulfenite"));
    expect(imaSymbol("123")).toBe("?");
    expect(imaSymbol("graphite-2H")).toBe("Gr");
  });
});
