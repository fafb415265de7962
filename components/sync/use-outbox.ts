"use client";

import { useEffect, useState } from "react";
import { watchOutbox, type OutboxItem } from "@/lib/client/outbox";

/** A project's outbox, live, plus the browser's online flag. */
export function useOutbox(projectId: string) {
  const [state, setState] = useState<{ items: OutboxItem[]; meta: { lastSyncAt: number | null; lastResult: string | null } | null }>({ items: [], meta: null });
  const [online, setOnline] = useState(true);
  useEffect(() => watchOutbox(projectId, setState), [projectId]);
  useEffect(() => {
    const update = () => setOnline(navigator.onLine);
    update();
    window.addEventListener("online", update);
    window.addEventListener("offline", update);
    return () => {
      window.removeEventListener("online", update);
      window.removeEventListener("offline", update);
    };
  }, []);
  return { ...state, online };
}
