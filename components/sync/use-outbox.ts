"use client";

import { useEffect, useState } from "react";
import { useOnline } from "@/components/ui/use-online";
import { watchOutbox, type OutboxItem } from "@/lib/client/outbox";

/** A project's outbox, live, plus the browser's online flag. */
export function useOutbox(projectId: string) {
  const [state, setState] = useState<{ items: OutboxItem[]; meta: { lastSyncAt: number | null; lastResult: string | null } | null }>({ items: [], meta: null });
  const online = useOnline();
  useEffect(() => watchOutbox(projectId, setState), [projectId]);
  return { ...state, online };
}
