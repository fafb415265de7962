import { sql } from "drizzle-orm";
import { check, index, integer, primaryKey, sqliteTable, text, uniqueIndex } from "drizzle-orm/sqlite-core";
import { user } from "./auth";
import { createdAt, id, updatedAt } from "./columns";
import { ANODES, PROJECT_ROLES } from "../../lib/vocabulary";
export { PROJECT_ROLES, type ProjectRole } from "../../lib/vocabulary";



export const organisations = sqliteTable("organisations", {
  id: id(),
  name: text("name").notNull(),
  createdAt: createdAt(),
});

export const projects = sqliteTable(
  "projects",
  {
    id: id(),
    organisationId: text("organisation_id")
      .notNull()
      .references(() => organisations.id, { onDelete: "restrict" }),
    /** Prefix of sample codes, e.g. "KRV" → KRV-000123. */
    code: text("code").notNull(),
    name: text("name").notNull(),
    description: text("description"),
    region: text("region"),
    /** Last sample sequence number issued; codes are never reused. */
    sampleSeq: integer("sample_seq").notNull().default(0),
    stationSeq: integer("station_seq").notNull().default(0),
    submissionSeq: integer("submission_seq").notNull().default(0),
    labEmail: text("lab_email"),
    /**
     * The project's lab is in-house: a lab member may take a sample without a submission by recording an explicit
     * "received directly" custody event (who and why). Otherwise scans need a recorded intake.
     */
    labInHouse: integer("lab_in_house", { mode: "boolean" }).notNull().default(false),
    /** Postal address of the lab, printed on the manifest. */
    labAddress: text("lab_address"),
    /** IANA zone dates are shown in (pages, exports' local dates), e.g. "Europe/Madrid"; null = UTC. */
    timeZone: text("time_zone"),
    /** Anode the scan upload form starts with (Cu, Co, …). */
    defaultAnode: text("default_anode", { enum: ANODES }),
    /** Instrument name the scan upload form starts with. */
    defaultInstrument: text("default_instrument"),
    /**
     * How new sample codes are issued (lib/validation/project.ts): tokens {code} (project code), {yyyy} (year) and
     * {seq:N} (sequence, N digits). Null = "{code}-{seq:6}", e.g. APR-000042.
     */
    sampleCodePattern: text("sample_code_pattern"),
    /** Archived projects are read-only and listed apart. */
    archivedAt: integer("archived_at", { mode: "timestamp_ms" }),
    createdBy: text("created_by").references(() => user.id, { onDelete: "set null" }),
    /** Optimistic concurrency for settings edits. */
    version: integer("version").notNull().default(1),
    createdAt: createdAt(),
    updatedAt: updatedAt(),
  },
  (t) => [
    uniqueIndex("projects_code_uq").on(t.code),
    check("projects_code_ck", sql`${t.code} GLOB '[A-Z][A-Z0-9]*' AND length(${t.code}) BETWEEN 2 AND 8`),
  ],
);

export const projectMembers = sqliteTable(
  "project_members",
  {
    projectId: text("project_id")
      .notNull()
      .references(() => projects.id, { onDelete: "cascade" }),
    userId: text("user_id")
      .notNull()
      .references(() => user.id, { onDelete: "cascade" }),
    role: text("role", { enum: PROJECT_ROLES }).notNull(),
    createdAt: createdAt(),
  },
  (t) => [
    primaryKey({ columns: [t.projectId, t.userId] }),
    index("project_members_user_idx").on(t.userId),
    check("project_members_role_ck", sql`${t.role} IN ('lead','field_geologist','lab_analyst','consultant')`),
  ],
);

export const invitations = sqliteTable(
  "invitations",
  {
    id: id(),
    projectId: text("project_id")
      .notNull()
      .references(() => projects.id, { onDelete: "cascade" }),
    email: text("email").notNull(),
    role: text("role", { enum: PROJECT_ROLES }).notNull(),
    tokenHash: text("token_hash").notNull(),
    invitedBy: text("invited_by").references(() => user.id, { onDelete: "set null" }),
    expiresAt: integer("expires_at", { mode: "timestamp_ms" }).notNull(),
    acceptedAt: integer("accepted_at", { mode: "timestamp_ms" }),
    createdAt: createdAt(),
  },
  (t) => [uniqueIndex("invitations_token_uq").on(t.tokenHash), index("invitations_project_idx").on(t.projectId)],
);

/**
 * Single-use links to set a password: "invite" for an account a site admin created, "reset" when a site admin sends a
 * reset. The token is stored as its SHA-256; the plain token exists only in the e-mail.
 */
export const passwordTokens = sqliteTable(
  "password_tokens",
  {
    id: id(),
    userId: text("user_id")
      .notNull()
      .references(() => user.id, { onDelete: "cascade" }),
    purpose: text("purpose", { enum: ["invite", "reset"] }).notNull(),
    tokenHash: text("token_hash").notNull(),
    expiresAt: integer("expires_at", { mode: "timestamp_ms" }).notNull(),
    usedAt: integer("used_at", { mode: "timestamp_ms" }),
    createdBy: text("created_by").references(() => user.id, { onDelete: "set null" }),
    createdAt: createdAt(),
  },
  (t) => [uniqueIndex("password_tokens_token_uq").on(t.tokenHash), index("password_tokens_user_idx").on(t.userId)],
);
