"use client";

import { useSyncExternalStore } from "react";

const noop = () => () => {};

/** The device's IANA time zone; "UTC" during server rendering so hydration matches, the real zone right after. */
export function useDeviceZone(): string {
  return useSyncExternalStore(
    noop,
    () => Intl.DateTimeFormat().resolvedOptions().timeZone || "UTC",
    () => "UTC",
  );
}
