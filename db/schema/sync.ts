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
