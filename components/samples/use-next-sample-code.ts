"use client";

import { useEffect, useState } from "react";
import { useOnline } from "@/components/ui/use-online";
import { peekReservedCode } from "@/lib/client/offline-save";

/**
 * The code a new sample saved now would take, for the code field's placeholder and hint, so it can be written on the
 * bag before saving: online, the next project code when the page was served (the server issues it; it moves on if
 * someone else saves first); offline, this device's next reserved code (provisional until synced).
 */
export function useNextSampleCode(projectId: string, userId: string | undefined, nextCode: string | undefined): { online: boolean; placeholder: string; hint: string } {
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
  if (online) {
    return {
      online,
      placeholder: nextCode ?? "",
      hint: nextCode
        ? `Leave empty for the next project code, ${nextCode} (the server issues it; it moves on if someone else saves first), or type a pre-printed tag number.`
        : "Leave empty for the next project code, or type a pre-printed tag number.",
    };
  }
  return reserved
    ? { online, placeholder: reserved, hint: `Leave empty to use ${reserved}, reserved for this device (provisional until synced; see Sync), or type a pre-printed tag number.` }
    : { online, placeholder: "", hint: "No codes reserved on this device: leave empty and the server issues a code on sync, or type the pre-printed tag number." };
}
