"use client";

import { useEffect, useMemo, useState } from "react";
import { Badge } from "@/components/ui/badge";
import { Button } from "@/components/ui/button";
import { discardPhoto, retryPhoto, watchPhotoQueue, type QueuedPhoto } from "@/lib/client/photo-queue";

const TONE = { queued: "brand", sending: "brand", failed: "danger" } as const;
const mb = (n: number) => `${(n / 1024 / 1024).toFixed(1)} MB`;

/** A project's photos waiting on this device, live. */
export function useQueuedPhotos(projectId: string): QueuedPhoto[] {
  const [items, setItems] = useState<QueuedPhoto[]>([]);
  useEffect(() => watchPhotoQueue(projectId, setItems), [projectId]);
  return items;
}

/** Photos waiting on this device: queued, sending (bytes the server confirmed), failed (why), with a thumbnail. */
export function QueuedPhotos({ items }: { items: QueuedPhoto[] }) {
  if (items.length === 0) return null;
  return (
    <section className="space-y-2" aria-labelledby="queued-photos">
      <h2 id="queued-photos" className="text-sm font-semibold">
        Photos on this device ({items.length})
      </h2>
      <ul className="space-y-3">
        {items.map((p) => (
          <QueuedPhotoRow key={p.clientPhotoId} p={p} />
        ))}
      </ul>
    </section>
  );
}

function QueuedPhotoRow({ p }: { p: QueuedPhoto }) {
  const url = useMemo(() => URL.createObjectURL(p.blob), [p.blob]);
  useEffect(() => () => URL.revokeObjectURL(url), [url]);
  return (
    <li className="flex gap-3 rounded-md border border-line p-3" data-testid="queued-photo">
      {/* eslint-disable-next-line @next/next/no-img-element -- a local blob: URL, not a served image */}
      {url && <img src={url} alt="" className="h-14 w-14 shrink-0 rounded object-cover" />}
      <div className="min-w-0 flex-1">
        <div className="flex flex-wrap items-center gap-2">
          <span className="font-medium">{p.label}</span>
          <Badge tone="oxide">not yet synced</Badge>
          <Badge tone={TONE[p.state]}>{p.state}</Badge>
        </div>
        <p className="text-xs text-muted">
          {p.name} · {mb(p.size)}
          {p.bytesSent > 0 && p.state !== "failed" ? ` · ${Math.round((p.bytesSent / p.size) * 100)} % on the server` : ""}
          {p.attempts > 0 ? ` · ${p.attempts} attempt${p.attempts > 1 ? "s" : ""}` : ""}
        </p>
        {p.lastError && <p className="mt-1 text-sm text-danger">Why: {p.lastError}</p>}
        {p.state === "failed" && (
          <div className="mt-2 flex gap-2">
            <Button type="button" variant="secondary" onClick={() => retryPhoto(p.clientPhotoId)}>
              Try again
            </Button>
            <Button type="button" variant="secondary" onClick={() => discardPhoto(p.clientPhotoId)}>
              Discard
            </Button>
          </div>
        )}
      </div>
    </li>
  );
}
