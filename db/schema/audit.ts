import { index, integer, sqliteTable, text } from "drizzle-orm/sqlite-core";
import { user } from "./auth";
import { createdAt, id } from "./columns";
import { projects } from "./projects";

/**
 * Every change: who, when, what, before and after. Append-only: the DAL has no update or delete path, and database
 * triggers (migration 0006) refuse UPDATE and DELETE.
 */
export const auditLog = sqliteTable(
  "audit_log",
  {
    id: id(),
    projectId: text("project_id").references(() => projects.id, { onDelete: "cascade" }),
    actorId: text("actor_id").references(() => user.id, { onDelete: "set null" }),
    action: text("action").notNull(),
    entity: text("entity").notNull(),
    entityId: text("entity_id").notNull(),
    beforeJson: text("before_json", { mode: "json" }),
    afterJson: text("after_json", { mode: "json" }),
    createdAt: createdAt(),
  },
  (t) => [index("audit_project_idx").on(t.projectId, t.createdAt), index("audit_entity_idx").on(t.entity, t.entityId), index("audit_project_actor_idx").on(t.projectId, t.actorId)],
);

/** Read-only, time-limited link to a filtered register. The token is stored hashed. */
export const shareLinks = sqliteTable(
  "share_links",
  {
    id: id(),
    projectId: text("project_id")
      .notNull()
      .references(() => projects.id, { onDelete: "cascade" }),
    tokenHash: text("token_hash").notNull().unique(),
    filterJson: text("filter_json", { mode: "json" }).$type<Record<string, unknown>>().notNull(),
    label: text("label"),
    expiresAt: integer("expires_at", { mode: "timestamp_ms" }).notNull(),
    revokedAt: integer("revoked_at", { mode: "timestamp_ms" }),
    createdBy: text("created_by").references(() => user.id, { onDelete: "set null" }),
    createdAt: createdAt(),
  },
  (t) => [index("share_links_project_idx").on(t.projectId)],
);

/** An uploaded MBTiles package serving a project's own basemap. */
export const tilePackages = sqliteTable(
  "tile_packages",
  {
    id: id(),
    projectId: text("project_id")
      .notNull()
      .references(() => projects.id, { onDelete: "cascade" }),
    name: text("name").notNull(),
    storageKey: text("storage_key").notNull(),
    format: text("format").notNull(),
    minZoom: integer("min_zoom"),
    maxZoom: integer("max_zoom"),
    bounds: text("bounds"),
    attribution: text("attribution"),
    uploadedBy: text("uploaded_by").references(() => user.id, { onDelete: "set null" }),
    createdAt: createdAt(),
  },
  (t) => [index("tile_packages_project_idx").on(t.projectId)],
);
