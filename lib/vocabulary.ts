/** Controlled vocabularies shared by the database schema, validation and the UI (no imports). */

export const PROJECT_ROLES = ["lead", "field_geologist", "lab_analyst", "consultant"] as const;
export type ProjectRole = (typeof PROJECT_ROLES)[number];

export const SAMPLE_TYPES = [
  "hand_sample",
  "chip",
  "channel",
  "float",
  "core",
  "soil",
  "stream_sediment",
  "other",
] as const;
export type SampleType = (typeof SAMPLE_TYPES)[number];

/** Lifecycle of a physical sample, field to storage. */
export const SAMPLE_STATUSES = [
  "planned",
  "collected",
  "dispatched",
  "received",
  "prepared",
  "scanned",
  "processed",
  "confirmed",
  "reported",
  "stored",
  "returned",
  "discarded",
] as const;
export type SampleStatus = (typeof SAMPLE_STATUSES)[number];

export const LOCATION_SOURCES = ["device_gnss", "external_gnss", "map", "photo_exif", "legacy", "other"] as const;

export const ELEVATION_REFS = ["msl", "ellipsoid"] as const;

export const STRUCTURE_KINDS = ["planar", "linear"] as const;

export const STRUCTURE_FEATURES = [
  "bedding",
  "foliation",
  "cleavage",
  "joint",
  "fault",
  "vein",
  "contact",
  "dyke",
  "lineation",
  "fold_hinge",
  "slickenline",
  "other",
] as const;

/** The features a plane or a line may record (the form offers one list or the other). */
export const PLANAR_FEATURES = ["bedding", "foliation", "cleavage", "joint", "fault", "vein", "contact", "dyke", "other"] as const;
export const LINEAR_FEATURES = ["lineation", "fold_hinge", "slickenline", "other"] as const;
export const STRUCTURE_QUALITIES = ["good", "fair", "poor"] as const;

export const SUBMISSION_STATUSES = ["draft", "sent", "received", "in_progress", "reported", "closed"] as const;

export const PRIORITIES = ["routine", "high", "urgent"] as const;

/** Analyses offered on the submission form; free text is accepted too. */
export const REQUESTED_ANALYSES = ["XRD bulk", "XRD clay fraction", "XRD oriented clay mount", "XRD glycolated clay mount", "XRD heated clay mount"] as const;

/** What the lab found for each sample of a submission at intake. */
export const INTAKE_CONDITIONS = ["received", "missing", "damaged", "extra"] as const;
export type IntakeCondition = (typeof INTAKE_CONDITIONS)[number];

/**
 * Custody and review events of a physical sample. The sample's status follows them (lib/custody.ts
 * CUSTODY_EVENT_STATUS); nothing else writes it. "received_directly" is an in-house lab taking a sample without a
 * submission (who and why are recorded); "processed", "confirmed", "reopened" and "reported" are review events
 * written by processing, sign-off, reopening a sign-off and the submission report.
 */
export const CUSTODY_EVENTS = [
  "collected",
  "dispatched",
  "received",
  "received_directly",
  "prepared",
  "scanned",
  "processed",
  "confirmed",
  "reopened",
  "reported",
  "stored",
  "returned",
  "discarded",
  "transferred",
] as const;

export const SCAN_STATUSES = ["uploaded", "processing", "processed", "failed", "signed_off"] as const;

export const ANODES = ["Cu", "Co", "Fe", "Cr", "Mo", "Ag"] as const;

export const REFERENCE_HAZARDS = ["asbestos", "crystalline_silica"] as const;

export const PHASE_STATUSES = ["candidate", "accepted", "rejected"] as const;
