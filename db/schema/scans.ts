import { sql } from "drizzle-orm";
import { check, index, integer, real, sqliteTable, text, uniqueIndex } from "drizzle-orm/sqlite-core";
import { user } from "./auth";
import { createdAt, id } from "./columns";
import { samples } from "./field";
import { projects } from "./projects";
import type { PhaseFitData } from "../../lib/science/types";
import { SCAN_STATUSES, ANODES, REFERENCE_HAZARDS, PHASE_STATUSES } from "../../lib/vocabulary";
export { SCAN_STATUSES, ANODES, REFERENCE_HAZARDS, PHASE_STATUSES } from "../../lib/vocabulary";



export const scans = sqliteTable(
  "scans",
  {
    id: id(),
    projectId: text("project_id")
      .notNull()
      .references(() => projects.id, { onDelete: "cascade" }),
    sampleId: text("sample_id")
      .notNull()
      .references(() => samples.id, { onDelete: "cascade" }),
    fileKey: text("file_key").notNull(),
    originalName: text("original_name").notNull(),
    sha256: text("sha256").notNull(),
    format: text("format").notNull(),
    anode: text("anode", { enum: ANODES }),
    /** Kα1 (or the single wavelength) in Å used for d. */
    wavelengthA: real("wavelength_a").notNull(),
    wavelength2A: real("wavelength2_a"),
    instrument: text("instrument"),
    /** kV, mA, slits, monochromator… as read from the file or the form. */
    settingsJson: text("settings_json", { mode: "json" }).$type<Record<string, unknown>>(),
    twoThetaStart: real("two_theta_start"),
    twoThetaEnd: real("two_theta_end"),
    stepDeg: real("step_deg"),
    pointCount: integer("point_count"),
    status: text("status", { enum: SCAN_STATUSES }).notNull().default("uploaded"),
    error: text("error"),
    currentRunId: text("current_run_id"),
    analystNote: text("analyst_note"),
    uploadedBy: text("uploaded_by").references(() => user.id, { onDelete: "set null" }),
    signedOffBy: text("signed_off_by").references(() => user.id, { onDelete: "set null" }),
    signedOffAt: integer("signed_off_at", { mode: "timestamp_ms" }),
    /**
     * What the sign-off confirmed, with the whole-pattern fit it rests on (lib/dal/scan-review.ts SignOffRecord):
     * run, Rwp/Rexp/χ², quantification method and each confirmed phase's wt% ± σ. Null before sign-off and for
     * scans signed off before it existed.
     */
    signOffJson: text("sign_off_json", { mode: "json" }).$type<Record<string, unknown>>(),
    createdAt: createdAt(),
  },
  (t) => [
    index("scans_sample_idx").on(t.sampleId),
    index("scans_project_status_idx").on(t.projectId, t.status),
    check("scans_wavelength_ck", sql`${t.wavelengthA} > 0.1 AND ${t.wavelengthA} < 5`),
  ],
);

/** One processing + identification of a scan; re-processing adds a run and keeps the old ones. */
export const processingRuns = sqliteTable(
  "processing_runs",
  {
    id: id(),
    scanId: text("scan_id")
      .notNull()
      .references(() => scans.id, { onDelete: "cascade" }),
    paramsJson: text("params_json", { mode: "json" }).$type<Record<string, unknown>>().notNull(),
    softwareVersion: text("software_version").notNull(),
    status: text("status", { enum: ["queued", "running", "done", "failed"] }).notNull().default("queued"),
    error: text("error"),
    /** Background, processed profile etc. for the diffractogram (JSON arrays). */
    profileJson: text("profile_json", { mode: "json" }).$type<Record<string, unknown>>(),
    unexplainedJson: text("unexplained_json", { mode: "json" }).$type<unknown[]>(),
    durationMs: integer("duration_ms"),
    createdBy: text("created_by").references(() => user.id, { onDelete: "set null" }),
    createdAt: createdAt(),
  },
  (t) => [index("runs_scan_idx").on(t.scanId, t.createdAt)],
);

export const peaks = sqliteTable(
  "peaks",
  {
    id: id(),
    runId: text("run_id")
      .notNull()
      .references(() => processingRuns.id, { onDelete: "cascade" }),
    twoTheta: real("two_theta").notNull(),
    d: real("d").notNull(),
    height: real("height").notNull(),
    area: real("area"),
    fwhm: real("fwhm"),
    fwhmEsd: real("fwhm_esd"),
    relIntensity: real("rel_intensity").notNull(),
    crystalliteNm: real("crystallite_nm"),
  },
  (t) => [index("peaks_run_idx").on(t.runId, t.twoTheta)],
);


export const referencePhases = sqliteTable(
  "reference_phases",
  {
    id: id(),
    /** Lowercase IMA name, e.g. "quartz". */
    mineral: text("mineral").notNull(),
    formula: text("formula").notNull(),
    mineralGroup: text("mineral_group"),
    crystalSystem: text("crystal_system").notNull(),
    spaceGroup: text("space_group").notNull(),
    cellA: real("cell_a").notNull(),
    cellB: real("cell_b").notNull(),
    cellC: real("cell_c").notNull(),
    cellAlpha: real("cell_alpha").notNull(),
    cellBeta: real("cell_beta").notNull(),
    cellGamma: real("cell_gamma").notNull(),
    /** Comma-separated element symbols, e.g. "O,Si". */
    elements: text("elements").notNull(),
    hazard: text("hazard", { enum: REFERENCE_HAZARDS }),
    citation: text("citation").notNull(),
    cifText: text("cif_text").notNull(),
    /** Computed pattern for Cu Kα1: [{h,k,l,d,intensity,multiplicity}]. */
    patternJson: text("pattern_json", { mode: "json" }).$type<unknown[]>().notNull(),
    rir: real("rir"),
    /**
     * Whole-pattern fit data (lib/science/types.ts PhaseFitData): cellVolume, cellMass, absoluteScale and the
     * optional texture, broadening, variable001, d001Range. Null for rows stored before it existed.
     */
    fitJson: text("fit_json", { mode: "json" }).$type<PhaseFitData>(),
    builtin: integer("builtin", { mode: "boolean" }).notNull().default(false),
    importedBy: text("imported_by").references(() => user.id, { onDelete: "set null" }),
    createdAt: createdAt(),
  },
  (t) => [uniqueIndex("reference_mineral_uq").on(t.mineral, t.builtin, t.cellA), index("reference_mineral_idx").on(t.mineral)],
);


/** A candidate or analyst-chosen phase for a run; confirmed when accepted and the scan is signed off. */
export const phaseResults = sqliteTable(
  "phase_results",
  {
    id: id(),
    runId: text("run_id")
      .notNull()
      .references(() => processingRuns.id, { onDelete: "cascade" }),
    scanId: text("scan_id")
      .notNull()
      .references(() => scans.id, { onDelete: "cascade" }),
    referencePhaseId: text("reference_phase_id")
      .notNull()
      .references(() => referencePhases.id, { onDelete: "restrict" }),
    /** Rank in the peak-list search (null when the search did not list the phase). */
    rank: integer("rank"),
    score: real("score"),
    confident: integer("confident", { mode: "boolean" }).notNull().default(false),
    /** Whole-pattern weight % (Hill & Howard) for fitted phases; null otherwise. */
    wtPercent: real("wt_percent"),
    /** Standard uncertainty of wt_percent. */
    wtSigma: real("wt_sigma"),
    /** Selected by the whole-pattern fit of this run (the deciding step); still a candidate until signed off. */
    fitted: integer("fitted", { mode: "boolean" }).notNull().default(false),
    /**
     * The fit's account of the phase (lib/jobs/analyse-scan.ts StoredFit): scale, profile parameters, RIR
     * cross-check, evidence (stand-alone lines, share of the profile, ΔBIC) and look-alike phases. Null unless fitted.
     */
    fitJson: text("fit_json", { mode: "json" }).$type<Record<string, unknown>>(),
    matchedJson: text("matched_json", { mode: "json" }).$type<unknown[]>(),
    source: text("source", { enum: ["auto", "manual"] }).notNull().default("auto"),
    status: text("status", { enum: PHASE_STATUSES }).notNull().default("candidate"),
    decidedBy: text("decided_by").references(() => user.id, { onDelete: "set null" }),
    decidedAt: integer("decided_at", { mode: "timestamp_ms" }),
    note: text("note"),
    createdAt: createdAt(),
  },
  (t) => [
    index("phase_results_run_idx").on(t.runId, t.rank),
    index("phase_results_scan_status_idx").on(t.scanId, t.status),
    index("phase_results_reference_idx").on(t.referencePhaseId),
    check("phase_results_wt_ck", sql`${t.wtPercent} IS NULL OR ${t.wtPercent} BETWEEN 0 AND 100`),
  ],
);

/**
 * Every sign-off of a scan, versioned (1, 2, …): what it confirmed (the SignOffRecord of lib/dal/scan-review.ts, with
 * the fit it rests on and each phase's wt% or why it has none), who signed and when, and — when it was reopened —
 * who reopened it, when and why. Rows are never deleted; the map and exports use the scan's current (latest) sign-off.
 */
export const scanSignOffs = sqliteTable(
  "scan_sign_offs",
  {
    id: id(),
    scanId: text("scan_id")
      .notNull()
      .references(() => scans.id, { onDelete: "cascade" }),
    projectId: text("project_id")
      .notNull()
      .references(() => projects.id, { onDelete: "cascade" }),
    version: integer("version").notNull(),
    runId: text("run_id").notNull(),
    recordJson: text("record_json", { mode: "json" }).$type<Record<string, unknown>>().notNull(),
    note: text("note"),
    signedBy: text("signed_by").references(() => user.id, { onDelete: "set null" }),
    signedAt: integer("signed_at", { mode: "timestamp_ms" }).notNull(),
    reopenedAt: integer("reopened_at", { mode: "timestamp_ms" }),
    reopenedBy: text("reopened_by").references(() => user.id, { onDelete: "set null" }),
    reopenReason: text("reopen_reason"),
  },
  (t) => [uniqueIndex("scan_sign_offs_version_uq").on(t.scanId, t.version)],
);
