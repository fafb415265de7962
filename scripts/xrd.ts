/**
 * Command-line entry of the diffraction core.
 *
 *   xrd identify FILE [--anode Cu|Co|Fe|Cr|Mo|Ag] [--wavelength Å] [--elements Si,O] [--json]
 *   xrd pattern FILE.cif [--anode Cu] [--wavelength Å] [--json]
 *
 * JSON contract (stable):
 *   identify → { wavelength, peaks:[{twoTheta,d,intensity,fwhm}], candidates:[{mineral,formula,score,confident}],
 *                phases:[{mineral,wtPercent,wtSigma,referenceId,series?,alternatives,rirWtPercent,evidence}],
 *                rwp, rexp, gof, unexplained:[{twoTheta,d,intensity}], quantification }
 *   pattern  → { lines:[{h,k,l,d,twoTheta,intensity,multiplicity}] }
 * Exit codes: 0 ok, 2 bad input or usage (one-line message on stderr, with the file's line number when known).
 */
import { readFileSync } from "node:fs";
import { pathToFileURL } from "node:url";
import { ANODES, isAnode, wavelengthsFor } from "@/lib/science/anodes";
import { CifError, computePattern, parseCif } from "@/lib/science/crystal";
import { identifyPhases } from "@/lib/science/identify";
import { identifyWholePattern } from "@/lib/science/wholepattern";
import { findLibraryPhase, REFERENCE_LIBRARY } from "@/lib/science/minerals";
import { parseScan, ScanParseError } from "@/lib/science/scan";
import { processScan } from "@/lib/science/signal";
import type { Anode } from "@/lib/science/types";

export const USAGE = `usage:
  xrd identify FILE [--anode Cu|Co|Fe|Cr|Mo|Ag] [--wavelength Å] [--elements Si,O,...] [--ka2 auto|yes|no] [--standard PHASE:WT] [--json]
      find candidate phases of a powder scan (XY/XYE, CSV or pdCIF) in the shipped reference library
      --elements lists every element the phases may contain (include O, H, C where they may occur)
      --standard PHASE:WT  an internal standard of known weight (e.g. corundum:20 = 20 wt% of the spiked specimen):
            weight fractions of the original specimen and its amorphous + unidentified part (Chung 1974)
      --ka2 whether the scan carries Kα2: auto (default) decides from the peak shapes, yes, or no (Kα1 only)
  xrd pattern FILE.cif [--anode Cu] [--wavelength Å] [--json]
      calculated powder pattern of a crystal structure (Bragg–Brentano, no monochromator, 2θ ≤ 90°)`;

/** Bad input or usage: reported on one line, exit code 2. */
export class CliError extends Error {
  constructor(
    message: string,
    readonly showUsage = false,
  ) {
    super(message);
    this.name = "CliError";
  }
}

interface Parsed {
  command: string;
  file: string;
  anode?: Anode;
  wavelength?: number;
  elements?: string[];
  /** Kα2 in the scan: decided from the profile (auto), or said (yes / no). */
  ka2?: "auto" | "yes" | "no";
  /** Internal standard mixed into the specimen: library id and wt% of the spiked specimen (Chung 1974). */
  standard?: { referenceId: string; wtPercent: number };
  json: boolean;
}

const SYMBOL = /^[A-Z][a-z]?$/;

/** Parse the arguments after the script name. */
export function parseArgs(argv: readonly string[]): Parsed {
  const [command, ...rest] = argv;
  if (command !== "identify" && command !== "pattern") {
    throw new CliError(command ? `unknown command "${command}"` : "no command given", true);
  }
  const out: Parsed = { command, file: "", json: false };
  const allowed = command === "identify" ? ["--anode", "--wavelength", "--elements", "--ka2", "--standard", "--json"] : ["--anode", "--wavelength", "--json"];
  for (let i = 0; i < rest.length; i++) {
    const arg = rest[i];
    const [flag, inline] = arg.startsWith("--") && arg.includes("=") ? [arg.slice(0, arg.indexOf("=")), arg.slice(arg.indexOf("=") + 1)] : [arg, undefined];
    if (!flag.startsWith("--")) {
      if (out.file) throw new CliError(`unexpected argument "${arg}" (one FILE only)`, true);
      out.file = arg;
      continue;
    }
    if (!allowed.includes(flag)) throw new CliError(`unknown option "${flag}" for ${command}`, true);
    if (flag === "--json") {
      out.json = true;
      continue;
    }
    const value = inline ?? rest[++i];
    if (value === undefined || value.startsWith("--")) throw new CliError(`${flag} needs a value`);
    if (flag === "--anode") {
      const a = value.charAt(0).toUpperCase() + value.slice(1).toLowerCase();
      if (!isAnode(a)) throw new CliError(`--anode "${value}" is not one of ${ANODES.join(", ")}`);
      out.anode = a;
    } else if (flag === "--wavelength") {
      const w = Number(value);
      if (!(Number.isFinite(w) && w > 0.1 && w < 5)) throw new CliError(`--wavelength "${value}" must be a number of ångström between 0.1 and 5`);
      out.wavelength = w;
    } else if (flag === "--standard") {
      const m = /^([a-z0-9-]+):(\d+(?:\.\d+)?)$/i.exec(value.trim());
      const phase = m ? findLibraryPhase(m[1]) : undefined;
      const wt = m ? Number(m[2]) : NaN;
      if (!m || !phase || !(wt > 0 && wt < 100))
        throw new CliError(`--standard "${value}" must be PHASE:WT with a library phase (e.g. corundum:20) and 0 < WT < 100 wt% of the spiked specimen`);
      out.standard = { referenceId: phase.id, wtPercent: wt };
    } else if (flag === "--ka2") {
      const k = value.toLowerCase();
      if (k !== "auto" && k !== "yes" && k !== "no") throw new CliError(`--ka2 "${value}" must be auto, yes or no`);
      out.ka2 = k;
    } else {
      const list = value.split(",").map((s) => s.trim()).filter(Boolean);
      const bad = list.find((s) => !SYMBOL.test(s.charAt(0).toUpperCase() + s.slice(1).toLowerCase()));
      if (list.length === 0 || bad !== undefined) throw new CliError(`--elements "${value}": "${bad ?? ""}" is not an element symbol`);
      out.elements = list.map((s) => s.charAt(0).toUpperCase() + s.slice(1).toLowerCase());
    }
  }
  if (!out.file) throw new CliError(`${command} needs a FILE`, true);
  return out;
}

function readText(file: string): string {
  try {
    return readFileSync(file, "utf8");
  } catch (e) {
    const code = (e as NodeJS.ErrnoException).code;
    throw new CliError(`${file}: cannot read file${code ? ` (${code})` : ""}`);
  }
}

const r = (x: number, digits: number): number => Math.round(x * 10 ** digits) / 10 ** digits;

/** Result of `identify` in the stable JSON shape (fields after `phases` were added by the whole-pattern fit). */
export interface IdentifyJson {
  wavelength: number;
  peaks: { twoTheta: number; d: number; intensity: number; fwhm: number }[];
  candidates: { mineral: string; formula: string; score: number; confident: boolean }[];
  phases: {
    mineral: string;
    wtPercent: number | null;
    wtSigma: number | null;
    referenceId: string;
    series?: string;
    alternatives: string[];
    rirWtPercent: number | null;
    evidence: { aloneLines: { twoTheta: number; d: number; hkl: [number, number, number] }[]; profileShare: number; deltaBic: number };
  }[];
  rwp: number;
  rexp: number;
  gof: number;
  unexplained: { twoTheta: number; d: number; intensity: number }[];
  quantification: { method: string; semiQuantitative: boolean; amorphousWtPercent: number | null; notes: string[] };
}

function runIdentify(args: Parsed): { json: IdentifyJson; text: string } {
  const text = readText(args.file);
  let scan;
  try {
    scan = parseScan(text, { wavelength: args.wavelength, anode: args.anode });
  } catch (e) {
    if (e instanceof ScanParseError || e instanceof RangeError || e instanceof TypeError) throw new CliError(`${args.file}: ${e.message}`);
    throw e;
  }
  let processed;
  try {
    processed = processScan(scan, { anode: args.anode, wavelength: args.wavelength, kAlpha2: { mode: args.ka2 ?? "auto" } });
  } catch (e) {
    if (e instanceof RangeError || e instanceof TypeError) throw new CliError(`${args.file}: ${e.message}`);
    throw e;
  }
  const n = scan.twoTheta.length;
  const elements = args.elements ? { allowed: args.elements } : undefined;
  // The peak-list search ranks candidates for the analyst; the whole-pattern fit decides the phases.
  const result = identifyPhases(processed.peaks, REFERENCE_LIBRARY, {
    wavelength: processed.wavelength,
    twoThetaRange: [scan.twoTheta[0], scan.twoTheta[n - 1]],
    elements,
  });
  const fit = identifyWholePattern(processed, REFERENCE_LIBRARY, { elements, ...(args.standard ? { internalStandard: args.standard } : {}) });
  const fitted = new Map(fit.phases.map((p) => [p.referenceId, p]));
  const listed = new Set(result.candidates.map((c) => c.referenceId));
  const json: IdentifyJson = {
    wavelength: processed.wavelength,
    peaks: processed.peaks.map((p) => ({ twoTheta: r(p.twoTheta, 4), d: r(p.d, 5), intensity: r(p.intensity, 2), fwhm: r(p.fwhm, 4) })),
    candidates: [
      ...fit.phases.filter((p) => !listed.has(p.referenceId)).map((p) => ({ mineral: p.mineral, formula: p.formula, score: r(p.evidence.profileShare, 4), confident: true })),
      ...result.candidates.map((c) => ({ mineral: c.mineral, formula: c.formula, score: c.score, confident: fitted.has(c.referenceId) })),
    ],
    phases: fit.phases.map((p) => ({
      mineral: p.mineral,
      wtPercent: p.wtPercent,
      wtSigma: p.wtSigma,
      referenceId: p.referenceId,
      ...(p.series ? { series: p.series } : {}),
      alternatives: p.alternatives.map((a) => a.mineral),
      rirWtPercent: p.rirWtPercent,
      evidence: {
        aloneLines: p.evidence.aloneLines.map((l) => ({ twoTheta: l.twoTheta, d: l.d, hkl: l.hkl })),
        profileShare: r(p.evidence.profileShare, 4),
        deltaBic: r(p.evidence.deltaBic, 1),
      },
    })),
    rwp: fit.stats.rwp,
    rexp: fit.stats.rexp,
    gof: fit.stats.gof,
    unexplained: fit.unexplained,
    quantification: {
      method: fit.quantification.method,
      semiQuantitative: fit.quantification.semiQuantitative,
      amorphousWtPercent: fit.quantification.amorphousWtPercent,
      notes: fit.quantification.notes,
    },
  };
  const out: string[] = [];
  out.push(`${args.file}: ${n} points, ${scan.twoTheta[0]}–${scan.twoTheta[n - 1]}° 2θ, λ = ${processed.wavelength} Å`);
  for (const w of processed.warnings) out.push(`note: ${w}`);
  out.push("", `Peaks (${json.peaks.length})`, "     2θ (°)      d (Å)   I (%)   FWHM (°)");
  for (const p of json.peaks) out.push(`${p.twoTheta.toFixed(3).padStart(11)} ${p.d.toFixed(4).padStart(10)} ${p.intensity.toFixed(1).padStart(7)} ${p.fwhm.toFixed(3).padStart(10)}`);
  out.push("", "Candidates (ranked; confident = kept by the whole-pattern fit)", "  score  confident  mineral               formula");
  if (json.candidates.length === 0) out.push("  (none)");
  for (const c of json.candidates.slice(0, 15))
    out.push(`  ${c.score.toFixed(2).padStart(5)}  ${(c.confident ? "yes" : "no").padEnd(9)}  ${c.mineral.padEnd(20)}  ${c.formula}`);
  out.push("", `Whole-pattern fit: Rwp ${fit.stats.rwp} %, Rexp ${fit.stats.rexp} %, χ² ${fit.stats.gof}`);
  out.push("", "Phases");
  if (fit.noConfidentMatch) out.push("  no confident match (amorphous material, a phase not in the library, or too few peaks)");
  for (const p of json.phases)
    out.push(
      `  ${p.mineral.padEnd(20)} ${p.wtPercent === null ? "wt% n/a" : `${p.wtPercent.toFixed(1).padStart(5)} ± ${(p.wtSigma ?? 0).toFixed(1)} wt%`}  ${p.evidence.aloneLines.length} lines of its own, ${(100 * p.evidence.profileShare).toFixed(0)} % of the profile${p.alternatives.length ? `; a pattern alone cannot tell it from ${p.alternatives.join(", ")}` : ""}`,
    );
  if (fit.quantification.amorphousWtPercent !== null) out.push(`  amorphous + unidentified: ${fit.quantification.amorphousWtPercent.toFixed(1)} wt% (internal standard)`);
  for (const note of fit.quantification.notes) out.push(`  note: ${note}`);
  if (fit.unexplained.length > 0) out.push(`  unexplained peaks at d = ${fit.unexplained.map((p) => p.d.toFixed(3)).join(", ")} Å`);
  for (const p of fit.phases) {
    const hazards = findLibraryPhase(p.referenceId)?.hazards ?? [];
    if (hazards.includes("crystalline_silica"))
      out.push(`caution: ${p.mineral} is crystalline silica; respirable dust is a health hazard — follow local regulations for handling and grinding.`);
    if (hazards.includes("asbestos"))
      out.push(`caution: ${p.mineral} may be an asbestos-group mineral; confirm by accredited methods and handle per local regulations.`);
    if (hazards.includes("radioactive")) out.push(`caution: ${p.mineral} is radioactive; follow local radiation-protection rules.`);
  }
  out.push(
    "",
    `Fitted phases and ranked candidates are suggestions, not an identification; wt% are ${fit.quantification.semiQuantitative ? "semi-quantitative" : "quantitative"} (${fit.quantification.method}${fit.quantification.semiQuantitative ? "; assumes no amorphous or unidentified content" : ""}).`,
  );
  return { json, text: out.join("\n") };
}

/** Result of `pattern` in the stable JSON shape. */
export interface PatternJson {
  lines: { h: number; k: number; l: number; d: number; twoTheta: number; intensity: number; multiplicity: number }[];
}

function runPattern(args: Parsed): { json: PatternJson; text: string } {
  const text = readText(args.file);
  const wavelength = args.wavelength ?? wavelengthsFor(args.anode ?? "Cu").kAlpha1;
  let lines;
  try {
    lines = computePattern(parseCif(text), { wavelength, minIntensity: 0.5 });
  } catch (e) {
    if (e instanceof CifError || e instanceof RangeError || e instanceof TypeError) throw new CliError(`${args.file}: ${e.message}`);
    throw e;
  }
  const json: PatternJson = {
    lines: lines.map((l) => ({ h: l.h, k: l.k, l: l.l, d: r(l.d, 5), twoTheta: r(l.twoTheta, 4), intensity: r(l.intensity, 2), multiplicity: l.multiplicity })),
  };
  const out = [`${args.file}: λ = ${wavelength} Å, ${json.lines.length} lines (I ≥ 0.5)`, "    h   k   l      d (Å)     2θ (°)   I (%)   m"];
  for (const l of json.lines)
    out.push(`${[l.h, l.k, l.l].map((v) => String(v).padStart(4)).join("")} ${l.d.toFixed(5).padStart(10)} ${l.twoTheta.toFixed(3).padStart(10)} ${l.intensity.toFixed(1).padStart(7)} ${String(l.multiplicity).padStart(3)}`);
  out.push("", "Calculated for Bragg–Brentano geometry, no monochromator, random orientation.");
  return { json, text: out.join("\n") };
}

/**
 * Run the CLI.
 * @returns exit code and the text for stdout / stderr
 */
export function runCli(argv: readonly string[]): { code: number; stdout: string; stderr: string } {
  if (argv.length === 0 || argv[0] === "--help" || argv[0] === "-h" || argv[0] === "help") return { code: argv.length === 0 ? 2 : 0, stdout: argv.length ? `${USAGE}\n` : "", stderr: argv.length ? "" : `${USAGE}\n` };
  try {
    const args = parseArgs(argv);
    const { json, text } = args.command === "identify" ? runIdentify(args) : runPattern(args);
    return { code: 0, stdout: `${args.json ? JSON.stringify(json, null, 2) : text}\n`, stderr: "" };
  } catch (e) {
    if (e instanceof CliError) return { code: 2, stdout: "", stderr: `xrd: ${e.message.replace(/\s*\n\s*/g, " ")}\n${e.showUsage ? `${USAGE}\n` : ""}` };
    throw e;
  }
}

if (process.argv[1] && import.meta.url === pathToFileURL(process.argv[1]).href) {
  const { code, stdout, stderr } = runCli(process.argv.slice(2));
  if (stdout) process.stdout.write(stdout);
  if (stderr) process.stderr.write(stderr);
  process.exitCode = code;
}
