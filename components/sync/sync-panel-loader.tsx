"use client";

import dynamic from "next/dynamic";

/**
 * The sync panel reads this device's IndexedDB (Dexie, about 31 kB gzip), which exists in the browser alone: a
 * server render could only show an empty queue that is wrong until the device answers. So the panel loads in the
 * browser, after the page shell, with a placeholder that says what it is waiting for. The service worker precaches
 * its chunk, so this works offline too.
 */
export const SyncPanelLoader = dynamic(() => import("./sync-panel").then((m) => m.SyncPanel), {
  ssr: false,
  loading: () => (
    <p className="animate-pulse text-sm text-muted" role="status">
      Reading what is waiting on this device…
    </p>
  ),
});
