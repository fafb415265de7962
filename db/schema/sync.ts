import { index, integer, primaryKey, text } from "drizzle-orm/sqlite-core";
import { sqliteTable } from "drizzle-orm/sqlite-core";
import { user } from "./auth";
import { createdAt } from "./columns";
import { projects } from "./projects";

/**
 * Creates replayed by clients that lost the answer (offline outbox): one row per (user, key) with the
 * request's hash and the response that was sent, so a replay gets the same record and the same body.
 * Key semantics follow the IETF HTTPAPI draft "The Idempotency-Key HTTP Header Field" (Jena & Dalal).
 */
export const idempotencyKeys = sqliteTable(
  "idempotency_keys",
  {
    userId: text("user_id")
      .notNull()
      .references(() => user.id, { onDelete: "cascade" }),
    key: text("key").notNull(),
    projectId: text("project_id")
      .notNull()
      .references(() => projects.id, { onDelete: "cascade" }),
    /** What was created, e.g. "station.create". */
    scope: text("scope").notNull(),
    /** SHA-256 of the validated request (canonical JSON). */
    requestHash: text("request_hash").notNull(),
    entityId: text("entity_id").notNull(),
    status: integer("status").notNull(),
    /** The response body as sent (JSON). */
    response: text("response").notNull(),
    createdAt: createdAt(),
  },
  (t) => [primaryKey({ columns: [t.userId, t.key] }), index("idempotency_keys_entity_idx").on(t.entityId)],
);

/**
 * Blocks of sample codes reserved for one device while it is online, so that samples taken without a connection get
 * their final code (and a printed label) in the field. Reserving advances the project's sample sequence by the block
 * size, so the server's own generator never issues these codes; each code has a row in `reserved_sample_codes`.
 */
export const sampleCodeBlocks = sqliteTable(
  "sample_code_blocks",
  {
    id: text("id")
      .primaryKey()
      .$defaultFn(() => crypto.randomUUID()),
    projectId: text("project_id")
      .notNull()
      .references(() => projects.id, { onDelete: "cascade" }),
    /** The id the device made for itself (kept on the device). */
    deviceId: text("device_id").notNull(),
    /** A name for the device as it reported it, e.g. "Android phone". */
    deviceLabel: text("device_label"),
    userId: text("user_id")
      .notNull()
      .references(() => user.id, { onDelete: "cascade" }),
    firstSeq: integer("first_seq").notNull(),
    lastSeq: integer("last_seq").notNull(),
    firstCode: text("first_code").notNull(),
    lastCode: text("last_code").notNull(),
    size: integer("size").notNull(),
    createdAt: createdAt(),
  },
  (t) => [index("sample_code_blocks_device_idx").on(t.projectId, t.deviceId, t.userId)],
);

/** One reserved code: who may use it (through its block) and the sample that took it. */
export const reservedSampleCodes = sqliteTable(
  "reserved_sample_codes",
  {
    projectId: text("project_id")
      .notNull()
      .references(() => projects.id, { onDelete: "cascade" }),
    code: text("code").notNull(),
    blockId: text("block_id")
      .notNull()
      .references(() => sampleCodeBlocks.id, { onDelete: "cascade" }),
    seq: integer("seq").notNull(),
    /** The sample created with this code; null while unused. */
    sampleId: text("sample_id"),
    usedAt: integer("used_at", { mode: "timestamp_ms" }),
  },
  (t) => [primaryKey({ columns: [t.projectId, t.code] }), index("reserved_sample_codes_block_idx").on(t.blockId)],
);
