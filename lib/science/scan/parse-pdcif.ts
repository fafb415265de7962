import type { Scan, ScanMeta } from "@/lib/science/types";
import { parseAnode } from "@/lib/science/anodes";
import { PointCollector, type ScanLimits } from "./collector";
import { ScanParseError } from "./errors";
import { emptyMeta } from "./header";
import { CifTokenizer, type CifToken } from "./cif-tokens";
import { CellKind, readCifNumber } from "./numbers";

/** 2θ tags, in order of preference (pdCIF dictionary; DDLm `.` spellings are normalised to `_`). */
const X_TAGS = ["_pd_meas_2theta_scan", "_pd_meas_angle_2theta", "_pd_proc_2theta_corrected"];
/** Intensity tags, in order of preference. */
const Y_TAGS = ["_pd_meas_counts_total", "_pd_meas_intensity_total", "_pd_proc_intensity_total", "_pd_proc_intensity_net"];
const RANGE_PREFIXES = ["_pd_meas_2theta_range_", "_pd_proc_2theta_range_"];
/** d-spacing column (pdCIF core dictionary), read as 2θ with the wavelength when no 2θ column is present. */
const D_TAG = "_pd_proc_d_spacing";
/** Loops longer than this keep no string values unless they hold scan data (bounds memory on large files). */
const MAX_STRING_LOOP_VALUES = 10_000;

function normTag(tag: string): string {
  return tag.toLowerCase().replace(/\./g, "_");
}

interface NumericColumn {
  values: number[];
  su: number[];
  lines: number[];
}

interface Loop {
  tags: string[];
  line: number;
  numeric: Map<string, NumericColumn>;
  strings: Map<string, string[]>;
  rows: number;
}

interface Block {
  name: string;
  line: number;
  items: Map<string, { text: string; line: number; quoted: boolean }>;
  loops: Loop[];
}

function isScanTag(tag: string): boolean {
  return X_TAGS.includes(tag) || tag === D_TAG || Y_TAGS.includes(tag) || (tag.endsWith("_su") && Y_TAGS.includes(tag.slice(0, -3)));
}

function readBlocks(text: string): Block[] {
  const tok = new CifTokenizer(text);
  const blocks: Block[] = [];
  let block: Block | null = null;
  let pending: CifToken | null = null;
  const take = (): CifToken | null => {
    if (pending) {
      const t = pending;
      pending = null;
      return t;
    }
    return tok.next();
  };
  for (let t = take(); t; t = take()) {
    if (t.type === "data") {
      block = { name: t.text, line: t.line, items: new Map(), loops: [] };
      blocks.push(block);
      continue;
    }
    if (t.type === "global" || t.type === "save" || t.type === "stop") continue;
    if (!block) throw new ScanParseError("CIF_SYNTAX", `"${t.text.slice(0, 40)}" before the first data_ block`, { line: t.line });
    if (t.type === "tag") {
      const v = take();
      if (!v || v.type !== "value") {
        throw new ScanParseError("CIF_SYNTAX", `tag ${t.text} has no value`, { line: t.line, field: t.text });
      }
      block.items.set(normTag(t.text), { text: v.text, line: v.line, quoted: v.quoted });
      continue;
    }
    if (t.type === "loop") {
      const loop: Loop = { tags: [], line: t.line, numeric: new Map(), strings: new Map(), rows: 0 };
      let h = take();
      while (h && h.type === "tag") {
        loop.tags.push(normTag(h.text));
        h = take();
      }
      if (loop.tags.length === 0) throw new ScanParseError("CIF_SYNTAX", "loop_ without tags", { line: t.line });
      const width = loop.tags.length;
      const numeric = loop.tags.map((tag) => isScanTag(tag));
      const hasScanData = numeric.some(Boolean);
      for (let k = 0; k < width; k++) {
        if (numeric[k]) loop.numeric.set(loop.tags[k], { values: [], su: [], lines: [] });
        else loop.strings.set(loop.tags[k], []);
      }
      let k = 0;
      let count = 0;
      while (h && h.type === "value") {
        const tag = loop.tags[k];
        if (numeric[k]) {
          const col = loop.numeric.get(tag) as NumericColumn;
          const [kind, v, su] = h.quoted ? [CellKind.NotNumeric, NaN, NaN] : readCifNumber(h.text);
          if (kind === CellKind.NotNumeric) {
            throw new ScanParseError("NOT_NUMERIC", `"${h.text.slice(0, 40)}" is not a number`, {
              line: h.line,
              column: k + 1,
              field: tag,
            });
          }
          if (kind === CellKind.NonFinite) {
            throw new ScanParseError("NOT_FINITE", `"${h.text.slice(0, 40)}" is not a finite number`, {
              line: h.line,
              column: k + 1,
              field: tag,
            });
          }
          col.values.push(v);
          col.su.push(su);
          col.lines.push(h.line);
        } else if (hasScanData || count < MAX_STRING_LOOP_VALUES) {
          (loop.strings.get(tag) as string[]).push(h.text);
        }
        count++;
        k++;
        if (k === width) {
          k = 0;
          loop.rows++;
        }
        h = take();
      }
      if (k !== 0) {
        throw new ScanParseError(
          "CIF_INCONSISTENT",
          `loop with ${width} tags has ${count} values, not a multiple of ${width}`,
          { line: loop.line, field: loop.tags[0] },
        );
      }
      block.loops.push(loop);
      pending = h;
      continue;
    }
    throw new ScanParseError("CIF_SYNTAX", `value "${t.text.slice(0, 40)}" without a tag`, { line: t.line });
  }
  return blocks;
}

function itemNumber(blocks: Block[], first: Block, tag: string): number | undefined {
  for (const b of [first, ...blocks]) {
    const it = b.items.get(tag);
    if (it) {
      const [kind, v] = readCifNumber(it.text);
      if (kind === CellKind.Number) return v;
    }
  }
  return undefined;
}

function itemText(blocks: Block[], first: Block, tag: string): string | undefined {
  for (const b of [first, ...blocks]) {
    const it = b.items.get(tag);
    if (it && it.text !== "?" && it.text !== ".") return it.text;
  }
  return undefined;
}

function fillMeta(meta: ScanMeta, blocks: Block[], block: Block): void {
  // Wavelength: single item, or a loop of _diffrn_radiation_wavelength (Kα1 first, Kα2 second by convention).
  const wl = itemNumber(blocks, block, "_diffrn_radiation_wavelength");
  if (wl !== undefined && wl > 0) meta.wavelength = wl;
  else {
    for (const b of [block, ...blocks]) {
      const loop = b.loops.find((l) => l.strings.has("_diffrn_radiation_wavelength"));
      if (!loop) continue;
      const vals = (loop.strings.get("_diffrn_radiation_wavelength") as string[])
        .map((s) => readCifNumber(s))
        .filter(([k, v]) => k === CellKind.Number && v > 0)
        .map(([, v]) => v);
      if (vals[0] !== undefined) meta.wavelength = vals[0];
      if (vals[1] !== undefined) meta.wavelength2 = vals[1];
      break;
    }
  }
  for (const tag of ["_diffrn_radiation_target", "_diffrn_source_target", "_diffrn_radiation_type"]) {
    const t = itemText(blocks, block, tag);
    const anode = t ? parseAnode(t) : undefined;
    if (anode) {
      meta.anode = anode;
      break;
    }
  }
  const instrument = itemText(blocks, block, "_diffrn_measurement_device_type") ?? itemText(blocks, block, "_pd_instr_location");
  if (instrument) meta.instrument = instrument.trim().slice(0, 200);
  const sample = itemText(blocks, block, "_pd_spec_id") ?? itemText(blocks, block, "_pd_block_id");
  if (sample) meta.sampleId = sample.trim().slice(0, 200);
  const settings: [string, string][] = [
    ["_diffrn_source_voltage", "kV"],
    ["_diffrn_source_current", "mA"],
    ["_pd_meas_step_count_time", "timePerStep"],
    ["_pd_meas_2theta_range_inc", "step"],
    ["_pd_proc_2theta_range_inc", "step"],
  ];
  for (const [tag, key] of settings) {
    const v = itemNumber(blocks, block, tag);
    if (v !== undefined && !(key in meta.settings)) meta.settings[key] = v;
  }
  meta.settings.block = block.name.slice(0, 200);
}

/**
 * Read an IUCr powder CIF (pdCIF): the first data block with a loop of 2θ (`_pd_meas_2theta_scan`,
 * `_pd_meas_angle_2theta`, `_pd_proc_2theta_corrected`) and intensity (`_pd_meas_counts_total`,
 * `_pd_meas_intensity_total`, `_pd_proc_intensity_total`), or intensity only with
 * `_pd_meas_2theta_range_min/max/inc`. Standard uncertainties in parentheses become `esd`. Wavelength from
 * `_diffrn_radiation_wavelength`, anode from `_diffrn_radiation_target`/`_diffrn_source_target`/`_diffrn_radiation_type`.
 * @throws ScanParseError with line and field
 */
export function parsePdCif(text: string, limits: ScanLimits): Scan {
  const blocks = readBlocks(text);
  if (blocks.length === 0) throw new ScanParseError("CIF_NO_DATA", "no data_ block found");
  for (const block of blocks) {
    for (const loop of block.loops) {
      const yTag = Y_TAGS.find((t) => loop.numeric.has(t));
      if (!yTag) continue;
      const xTag = X_TAGS.find((t) => loop.numeric.has(t)) ?? (loop.numeric.has(D_TAG) ? D_TAG : undefined);
      const ycol = loop.numeric.get(yTag) as NumericColumn;
      const sucol = loop.numeric.get(`${yTag}_su`);
      const meta = emptyMeta("pdcif");
      fillMeta(meta, blocks, block);
      meta.settings.intensityTag = yTag;
      const points = new PointCollector(limits);
      const n = ycol.values.length;
      const esdAt = (i: number) => (sucol ? sucol.values[i] : ycol.su[i]);
      // esd only when every point carries one.
      let allSu = n > 0;
      for (let i = 0; i < n && allSu; i++) if (Number.isNaN(esdAt(i))) allSu = false;
      if (xTag) {
        const xcol = loop.numeric.get(xTag) as NumericColumn;
        meta.settings.twoThetaTag = xTag;
        for (let i = 0; i < n; i++) points.push(xcol.values[i], ycol.values[i], allSu ? esdAt(i) : NaN, ycol.lines[i]);
      } else {
        const prefix = RANGE_PREFIXES.find((p) => itemNumber([block], block, `${p}min`) !== undefined);
        if (!prefix) {
          throw new ScanParseError(
            "CIF_NO_DATA",
            `loop with ${yTag} has no 2θ column and the block has no _pd_meas_2theta_range_min/max/inc`,
            { line: loop.line, field: yTag },
          );
        }
        const min = itemNumber([block], block, `${prefix}min`) as number;
        const max = itemNumber([block], block, `${prefix}max`);
        const inc = itemNumber([block], block, `${prefix}inc`);
        if (inc === undefined || !(inc > 0)) {
          throw new ScanParseError("CIF_INCONSISTENT", `${prefix}inc must be a positive step`, { field: `${prefix}inc` });
        }
        if (max !== undefined) {
          const expected = Math.round((max - min) / inc) + 1;
          if (Math.abs((max - min) / inc + 1 - n) > 0.5) {
            throw new ScanParseError(
              "CIF_INCONSISTENT",
              `range ${min}–${max}° step ${inc}° implies ${expected} points but the loop has ${n}`,
              { line: loop.line, field: yTag },
            );
          }
        }
        meta.settings.twoThetaTag = `${prefix}min/max/inc`;
        for (let i = 0; i < n; i++) points.push(min + i * inc, ycol.values[i], allSu ? esdAt(i) : NaN, ycol.lines[i]);
      }
      return points.finish(meta, {
        x: xTag ?? "twoTheta",
        y: yTag,
        e: sucol ? `${yTag}_su` : "esd",
        ...(xTag === D_TAG ? { xIsD: true, headerLine: loop.line } : {}),
      });
    }
  }
  throw new ScanParseError(
    "CIF_NO_DATA",
    "no loop with powder intensities (_pd_meas_counts_total, _pd_meas_intensity_total or _pd_proc_intensity_total)",
  );
}
