import { sql } from "drizzle-orm";
import { integer, text } from "drizzle-orm/sqlite-core";

/** Text primary key filled with a random UUID. */
export const id = () => text("id").primaryKey().$defaultFn(() => crypto.randomUUID());

/** Millisecond timestamp defaulting to now. */
export const createdAt = () =>
  integer("created_at", { mode: "timestamp_ms" })
    .notNull()
    .default(sql`(cast(unixepoch('subsecond') * 1000 as integer))`);

export const updatedAt = () =>
  integer("updated_at", { mode: "timestamp_ms" })
    .notNull()
    .default(sql`(cast(unixepoch('subsecond') * 1000 as integer))`)
    .$onUpdate(() => new Date());
