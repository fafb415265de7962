"use client";

/** Caches of the service worker (lib/pwa/sw.ts) that hold signed-in pages and project lists. */
export const PRIVATE_CACHES = ["pages", "reference-lists"] as const;

/**
 * On sign-out: forget the signed-in pages and project lists the service worker kept for offline use, so the next
 * person on a shared device does not see them. Map tiles and static files stay (nothing personal in them).
 */
export async function clearPrivateCaches(): Promise<void> {
  if (typeof caches === "undefined") return;
  await Promise.allSettled(PRIVATE_CACHES.map((name) => caches.delete(name)));
}
