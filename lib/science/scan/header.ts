import type { ScanMeta } from "@/lib/science/types";
import { parseAnode } from "@/lib/science/anodes";

/** Most header settings kept per file, so a pathological header cannot grow the metadata without bound. */
const MAX_SETTINGS = 200;
const KV = /^([A-Za-z\u00c0-\u024f\u0370-\u03ff][\w\u00c0-\u024f\u0370-\u03ff .()/°\-α]{0,60}?)\s*[:=]\s*(.*)$/;

/** A fresh metadata object for a format. */
export function emptyMeta(format: ScanMeta["format"]): ScanMeta {
  return { format, settings: {} };
}

function leadingNumber(value: string): number | undefined {
  const m = /^[+-]?(\d+\.?\d*|\.\d+)([eE][+-]?\d+)?/.exec(value.trim().replace(/^(\d+),(\d+)/, "$1.$2"));
  if (!m) return undefined;
  const v = Number(m[0]);
  return Number.isFinite(v) ? v : undefined;
}

/** Wavelength text to Å: accepts "1.5406", "1.5406 Å", "1.5406 A", "0.15406 nm". */
function wavelengthA(value: string): number | undefined {
  const v = leadingNumber(value);
  if (v === undefined || !(v > 0)) return undefined;
  return /\bnm\b/i.test(value) ? v * 10 : v;
}

/**
 * Record one header `key: value` (or `key = value`) pair in `meta`. Recognises wavelength/lambda (Kα1 and Kα2),
 * anode/target/tube, instrument/diffractometer, sample, and keeps everything else in `meta.settings`
 * (numbers as numbers when the whole value is numeric: kV, mA, step, time…).
 * @returns true if the pair was recognised as a key/value line
 */
export function applyHeaderPair(meta: ScanMeta, rawKey: string, rawValue: string): boolean {
  const key = rawKey.trim().toLowerCase().replace(/\s+/g, " ");
  const value = rawValue.trim().replace(/^["']|["']$/g, "");
  if (!key || !value) return false;
  const compact = key.replace(/[\s_\-()]/g, "");
  if (/^(wavelength|lambda|λ|wl)(1|a1|alpha1|kα1|ka1|kalpha1)?(å|a|angstrom)?$/.test(compact) || /^(kalpha1|kα1|ka1|alpha1)$/.test(compact)) {
    const w = wavelengthA(value);
    if (w !== undefined) meta.wavelength = w;
  } else if (/^(wavelength|lambda|λ|wl)(2|a2|alpha2|kα2|ka2|kalpha2)(å|a|angstrom)?$/.test(compact) || /^(kalpha2|kα2|ka2|alpha2)$/.test(compact)) {
    const w = wavelengthA(value);
    if (w !== undefined) meta.wavelength2 = w;
  } else if (/^(anode|target|tube|anodematerial|tubeanode|radiation|source|tubetarget)$/.test(compact)) {
    const a = parseAnode(value);
    if (a) meta.anode = a;
    else setSetting(meta, key, value);
  } else if (/^(intensity|y|count|counts|data)?units?$|^(intensity|y)unit(s)?$/.test(compact)) {
    const u = value.toLowerCase().replace(/\s+/g, "");
    if (/^(cps|counts?\/s(ec)?|cts\/s(ec)?|c\/s|1\/s|counts?persec(ond)?)$/.test(u)) meta.intensityUnit = "cps";
    else if (/^(counts?|cts)$/.test(u)) meta.intensityUnit = "counts";
    setSetting(meta, "intensityUnit", value);
  } else if (/^(instrument|diffractometer|device)$/.test(compact)) {
    meta.instrument = value.slice(0, 200);
  } else if (/^(sample|sampleid|sampleno|specimen|samplename)$/.test(compact)) {
    meta.sampleId = value.slice(0, 200);
  } else {
    setSetting(meta, canonicalSettingKey(compact) ?? key, value);
  }
  return true;
}

function canonicalSettingKey(compact: string): string | undefined {
  if (/^(kv|voltage|tension|generatorvoltage)$/.test(compact)) return "kV";
  if (/^(ma|current|generatorcurrent)$/.test(compact)) return "mA";
  if (/^(step|stepsize|stepwidth|increment|inc)$/.test(compact)) return "step";
  if (/^(time|timeperstep|steptime|counttime|countingtime|countingtimeperstep|stepcounttime)(s|sec|seconds)?$/.test(compact)) return "timePerStep";
  return undefined;
}

function setSetting(meta: ScanMeta, key: string, value: string): void {
  if (Object.keys(meta.settings).length >= MAX_SETTINGS && !(key in meta.settings)) return;
  const trimmed = value.slice(0, 500);
  const n = /^[+-]?(\d+\.?\d*|\.\d+)([eE][+-]?\d+)?$/.test(trimmed) ? Number(trimmed) : NaN;
  meta.settings[key] = Number.isFinite(n) ? n : leadingNumberWithUnit(trimmed) ?? trimmed;
}

/** "40 kV" → 40 when the unit is one of the usual ones; else undefined. */
function leadingNumberWithUnit(value: string): number | undefined {
  const m = /^([+-]?(?:\d+\.?\d*|\.\d+))\s*(kv|ma|s|sec|°|deg|degrees)$/i.exec(value);
  return m ? Number(m[1]) : undefined;
}

/**
 * Parse a comment or header line (comment marker already removed) as `key: value`.
 * @returns true if it was a key/value line
 */
export function applyHeaderLine(meta: ScanMeta, text: string): boolean {
  const trimmed = text.trim();
  // Several pairs on one line, set apart by wide gaps: "Anode: Cu   K-Alpha1: 1.540562 A   K-Alpha2: 1.544390 A".
  const parts = trimmed.split(/\t+|\s{2,}/);
  if (parts.length >= 2) {
    const pairs = parts.map((part) => KV.exec(part));
    if (pairs.every((p) => p !== null)) {
      let any = false;
      for (const p of pairs) any = applyHeaderPair(meta, (p as RegExpExecArray)[1], (p as RegExpExecArray)[2]) || any;
      return any;
    }
  }
  const m = KV.exec(trimmed);
  if (!m) return false;
  return applyHeaderPair(meta, m[1], m[2]);
}
