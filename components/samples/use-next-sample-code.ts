"use client";

import { useEffect, useState } from "react";
import { useOnline } from "@/components/ui/use-online";
import { peekReservedCode } from "@/lib/client/offline-save";

/**
 * What the code field of a new sample says before saving. Offline: this device's next reserved code, exactly the one
 * an empty field will take (provisional until synced), so it can go on the bag first. Online: no number is promised —
 * the server issues the next free project code at the moment of saving, and other devices reserving blocks move the
 * sequence on, so a number shown when the page opened could be wrong.
 */
export function useNextSampleCode(projectId: string, userId: string | undefined): { online: boolean; placeholder: string; hint: string } {
  const online = useOnline();
  const [reserved, setReserved] = useState<string | null>(null);
  useEffect(() => {
    if (online || !userId) return;
    let live = true;
    peekReservedCode(projectId, userId)
      .then((code) => live && setReserved(code))
      .catch(() => live && setReserved(null));
    return () => {
      live = false;
    };
  }, [online, projectId, userId]);
  if (online) return { online, placeholder: "", hint: "Leave empty and the server issues the next project code (shown once saved), or type a pre-printed tag number." };
  return reserved
    ? { online, placeholder: reserved, hint: `Leave empty to use ${reserved}, reserved for this device (provisional until synced; see Sync), or type a pre-printed tag number.` }
    : { online, placeholder: "", hint: "No codes reserved on this device: leave empty and the server issues a code on sync, or type the pre-printed tag number." };
}
