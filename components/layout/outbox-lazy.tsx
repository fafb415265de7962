"use client";

import dynamic from "next/dynamic";

/**
 * The project shell's outbox badge and auto-sync, loaded after the page is interactive: they need the device
 * outbox (Dexie over IndexedDB, the record schemas), about 65 kB gzip that no page needs for its first paint.
 * Both only read IndexedDB, which exists in the browser alone, so nothing is lost on the server render.
 */
export const OutboxBadge = dynamic(() => import("@/components/sync/sync-panel").then((m) => m.OutboxBadge), { ssr: false });
export const OutboxAutoSync = dynamic(() => import("@/components/sync/sync-panel").then((m) => m.OutboxAutoSync), { ssr: false });
