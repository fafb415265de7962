import { sql } from "drizzle-orm";
import { check, index, integer, primaryKey, real, sqliteTable, text, uniqueIndex } from "drizzle-orm/sqlite-core";
import { user } from "./auth";
import { createdAt, id, updatedAt } from "./columns";
import { samples } from "./field";
import { projects } from "./projects";
import { SUBMISSION_STATUSES, PRIORITIES, CUSTODY_EVENTS, SAMPLE_STATUSES } from "../../lib/vocabulary";
export { SUBMISSION_STATUSES, PRIORITIES, CUSTODY_EVENTS } from "../../lib/vocabulary";



export const submissions = sqliteTable(
  "submissions",
  {
    id: id(),
    projectId: text("project_id")
      .notNull()
      .references(() => projects.id, { onDelete: "cascade" }),
    code: text("code").notNull(),
    requestedAnalysis: text("requested_analysis").notNull(),
    priority: text("priority", { enum: PRIORITIES }).notNull().default("routine"),
    hazards: text("hazards"),
    notes: text("notes"),
    labEmail: text("lab_email"),
    status: text("status", { enum: SUBMISSION_STATUSES }).notNull().default("draft"),
    waybill: text("waybill"),
    /** QA/QC samples inserted in the batch (duplicates, standards, blanks), as the packing list states them. */
    qaqcNote: text("qaqc_note"),
    /** The lab's own batch / job number, given at intake. */
    labReference: text("lab_reference"),
    receivedAt: integer("received_at", { mode: "timestamp_ms" }),
    /** Set once when every sample has signed-off results (the leads are e-mailed then). */
    reportedAt: integer("reported_at", { mode: "timestamp_ms" }),
    createdBy: text("created_by").references(() => user.id, { onDelete: "set null" }),
    sentAt: integer("sent_at", { mode: "timestamp_ms" }),
    /** Who recorded the dispatch: that person may not record the receipt (separation of duties). */
    sentBy: text("sent_by").references(() => user.id, { onDelete: "set null" }),
    /** Last time the submission e-mail went to the lab (dispatch or resend); resends are throttled from it. */
    lastMailedAt: integer("last_mailed_at", { mode: "timestamp_ms" }),
    /** How many times the submission e-mail was sent (dispatch counts as the first). */
    mailCount: integer("mail_count").notNull().default(0),
    createdAt: createdAt(),
    updatedAt: updatedAt(),
  },
  (t) => [
    uniqueIndex("submissions_project_code_uq").on(t.projectId, t.code),
    index("submissions_project_status_idx").on(t.projectId, t.status),
    check("submissions_priority_ck", sql`${t.priority} IN ('routine','high','urgent')`),
  ],
);

export const submissionSamples = sqliteTable(
  "submission_samples",
  {
    submissionId: text("submission_id")
      .notNull()
      .references(() => submissions.id, { onDelete: "cascade" }),
    sampleId: text("sample_id")
      .notNull()
      .references(() => samples.id, { onDelete: "cascade" }),
    /** received | missing | damaged | extra, recorded at intake. */
    intakeCondition: text("intake_condition"),
  },
  (t) => [primaryKey({ columns: [t.submissionId, t.sampleId] }), index("submission_samples_sample_idx").on(t.sampleId)],
);


/** One hand-over or handling step of a physical sample. Append-only. */
export const custodyEvents = sqliteTable(
  "custody_events",
  {
    id: id(),
    sampleId: text("sample_id")
      .notNull()
      .references(() => samples.id, { onDelete: "cascade" }),
    submissionId: text("submission_id").references(() => submissions.id, { onDelete: "set null" }),
    event: text("event", { enum: CUSTODY_EVENTS }).notNull(),
    actorId: text("actor_id").references(() => user.id, { onDelete: "set null" }),
    actorName: text("actor_name"),
    occurredAt: text("occurred_at").notNull(),
    location: text("location"),
    sealNumber: text("seal_number"),
    condition: text("condition"),
    weightKg: real("weight_kg"),
    note: text("note"),
    /** Courier waybill / consignment number of a dispatch. */
    waybill: text("waybill"),
    /** Who took the sample over (courier, lab reception, store), when the event is a hand-over. */
    handedTo: text("handed_to"),
    /**
     * The sample's status once this event was recorded: the status is derived from the events (the latest one's
     * status_after), samples.status only caches it. Null for events recorded before this column existed.
     */
    statusAfter: text("status_after", { enum: SAMPLE_STATUSES }),
    /** The scan a review event (processed, confirmed, reopened) belongs to. */
    scanId: text("scan_id"),
    createdAt: createdAt(),
  },
  (t) => [
    index("custody_sample_idx").on(t.sampleId, t.occurredAt),
    index("custody_submission_idx").on(t.submissionId),
  ],
);

/**
 * A lab link: lets an outside lab without an account open one submission's manifest, record its intake and upload
 * scans for exactly the samples on it. Signed by its randomness (256 bits) and stored hashed (SHA-256), like share
 * links; it expires and can be revoked. A resend of the submission e-mail replaces the active link.
 */
export const labLinks = sqliteTable(
  "lab_links",
  {
    id: id(),
    projectId: text("project_id")
      .notNull()
      .references(() => projects.id, { onDelete: "cascade" }),
    submissionId: text("submission_id")
      .notNull()
      .references(() => submissions.id, { onDelete: "cascade" }),
    tokenHash: text("token_hash").notNull().unique(),
    /** The address the link was e-mailed to. */
    sentTo: text("sent_to").notNull(),
    expiresAt: integer("expires_at", { mode: "timestamp_ms" }).notNull(),
    revokedAt: integer("revoked_at", { mode: "timestamp_ms" }),
    revokedBy: text("revoked_by").references(() => user.id, { onDelete: "set null" }),
    lastUsedAt: integer("last_used_at", { mode: "timestamp_ms" }),
    createdBy: text("created_by").references(() => user.id, { onDelete: "set null" }),
    createdAt: createdAt(),
  },
  (t) => [index("lab_links_submission_idx").on(t.submissionId)],
);
