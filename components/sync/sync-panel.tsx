"use client";

import { useEffect, useState } from "react";
import { ConflictPanel, type ConflictField } from "@/components/stations/conflict-panel";
import { Badge } from "@/components/ui/badge";
import { Button } from "@/components/ui/button";
import { setCodeBlockUser, topUpCodeBlock } from "@/lib/client/code-block";
import { discard, keepMine, requeue, setOutboxUser, syncProject, watchOutbox, type OutboxItem } from "@/lib/client/outbox";
import { CodeBlockSummary } from "./code-block-summary";
import { QueuedPhotos, useQueuedPhotos } from "./queued-photos";
import { useOutbox } from "./use-outbox";
import { formatDateTime } from "@/lib/dates";

const FIELDS: ConflictField[] = [
  "code",
  "name",
  "sampleType",
  "lithology",
  "description",
  "lat",
  "lon",
  "elevationM",
  "horizontalAccuracyM",
  "locationSource",
  "collectedAt",
  "stationId",
  "storageLocation",
  // structural measurements
  "feature",
  "dipDirection",
  "dip",
  "trend",
  "plunge",
  "rake",
  "generation",
  "quality",
  "note",
].map((key) => ({ key, label: key.replace(/([A-Z])/g, " $1").replace(/^./, (c) => c.toUpperCase()).replace(/ M$/, " (m)") }));

const STATE_LABEL: Record<OutboxItem["state"], string> = { queued: "queued", sending: "sending", failed: "failed", conflict: "conflict" };
const TONE = { queued: "brand", sending: "brand", failed: "danger", conflict: "oxide" } as const;

/** The outbox of one project: what is waiting on this device, what failed and why, conflicts side by side, last sync. */
export function SyncPanel({ projectId, userId, canReserve = false }: { projectId: string; userId: string; canReserve?: boolean }) {
  const { items, meta, online } = useOutbox(projectId);
  const [busy, setBusy] = useState(false);
  const photos = useQueuedPhotos(projectId);
  const count = (s: OutboxItem["state"]) => items.filter((i) => i.state === s).length + photos.filter((p) => p.state === s).length;

  async function syncNow() {
    setBusy(true);
    try {
      await syncProject(projectId, { force: true });
    } finally {
      setBusy(false);
    }
  }

  return (
    <div className="space-y-4" data-testid="sync-panel">
      <div className="flex flex-wrap items-center gap-3">
        <Badge tone={online ? "ok" : "danger"}>{online ? "online" : "offline"}</Badge>
        <span className="text-sm" data-testid="sync-counts">
          {count("queued")} queued · {count("sending")} sending · {count("failed")} failed · {count("conflict")} {count("conflict") === 1 ? "conflict" : "conflicts"}
        </span>
        <Button type="button" onClick={syncNow} disabled={busy || !online}>
          {busy ? "Syncing…" : "Sync now"}
        </Button>
      </div>
      <p className="text-sm text-muted" data-testid="last-sync">
        Last successful sync: {meta?.lastSyncAt ? formatDateTime(meta.lastSyncAt, Intl.DateTimeFormat().resolvedOptions().timeZone) : "not yet on this device"}
        {meta?.lastResult ? ` (${meta.lastResult})` : ""}
      </p>
      <QueuedPhotos items={photos} />
      {items.length === 0 && photos.length === 0 ? (
        <p className="text-sm" data-testid="outbox-empty">
          Nothing waiting: everything saved on this device has reached the server.
        </p>
      ) : (
        <ul className="space-y-3">
          {items.map((item) => (
            <li key={item.opId} className="rounded-md border border-line p-3" data-testid="outbox-item">
              <div className="flex flex-wrap items-center gap-2">
                <span className="font-medium">{item.label}</span>
                <Badge tone="oxide">not yet synced</Badge>
                <Badge tone={TONE[item.state]}>{STATE_LABEL[item.state]}</Badge>
                <span className="text-xs text-muted">
                  {item.action === "create" ? "new" : "edit"} · saved {formatDateTime(item.createdAt)}
                  {item.attempts > 0 ? ` · ${item.attempts} attempt${item.attempts > 1 ? "s" : ""}` : ""}
                </span>
              </div>
              {item.userId && item.userId !== userId && <p className="mt-1 text-sm text-muted">Saved on this device by another account; it is sent when that account signs in here.</p>}
              {item.lastError && item.state !== "conflict" && <p className="mt-1 text-sm text-danger">Why: {item.lastError}</p>}
              {item.state === "failed" && (
                <div className="mt-2 flex gap-2">
                  <Button type="button" variant="secondary" onClick={() => requeue(item.opId)}>
                    Try again
                  </Button>
                  <Button type="button" variant="secondary" onClick={() => discard(item.opId)}>
                    Discard
                  </Button>
                </div>
              )}
              {item.state === "conflict" && item.serverRecord && (
                <div className="mt-2">
                  <ConflictPanel fields={FIELDS.filter((f) => f.key in item.body)} mine={item.body} theirs={item.serverRecord} onKeepMine={() => keepMine(item)} onTakeTheirs={() => discard(item.opId)} kept="device" />
                </div>
              )}
            </li>
          ))}
        </ul>
      )}
      {canReserve && <CodeBlockSummary projectId={projectId} userId={userId} online={online} />}
    </div>
  );
}

/** Sends the outbox when the connection returns, and every minute while online. Mounted once in the project shell. */
export function OutboxAutoSync({ projectId, userId, canReserve = false }: { projectId: string; userId: string; canReserve?: boolean }) {
  useEffect(() => {
    setOutboxUser(userId);
    setCodeBlockUser(userId);
    const run = () => {
      if (!navigator.onLine) return;
      void syncProject(projectId).catch(() => undefined);
      // Sample codes for offline work: reserve a block for this device when it has few left.
      if (canReserve) void topUpCodeBlock(projectId, userId);
      warmFieldScreens(projectId);
    };
    run();
    window.addEventListener("online", run);
    const t = window.setInterval(run, 60_000);
    return () => {
      window.removeEventListener("online", run);
      window.clearInterval(t);
    };
  }, [projectId, userId, canReserve]);
  return null;
}

/** Asks the service worker to cache the field screens of the project while online, so they open without signal. */
function warmFieldScreens(projectId: string) {
  const base = `/projects/${projectId}`;
  const urlsToCache = ["/projects", base, `${base}/samples`, `${base}/samples/new`, `${base}/stations`, `${base}/map`, `${base}/sync`, `/api/projects/${projectId}/stations`];
  navigator.serviceWorker?.controller?.postMessage({ type: "CACHE_URLS", payload: { urlsToCache } });
}

/** "n not yet synced" in the project header, linking to the sync panel. */
export function OutboxBadge({ projectId }: { projectId: string }) {
  const [n, setN] = useState(0);
  useEffect(() => watchOutbox(projectId, ({ items }) => setN(items.length)), [projectId]);
  const photos = useQueuedPhotos(projectId).length;
  if (n + photos === 0) return null;
  return (
    <a href={`/projects/${projectId}/sync`} data-testid="outbox-badge">
      <Badge tone="oxide">{n + photos} not yet synced</Badge>
    </a>
  );
}
