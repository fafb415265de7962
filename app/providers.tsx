"use client";

import { QueryClient, QueryClientProvider } from "@tanstack/react-query";
import { SerwistProvider } from "@serwist/turbopack/react";
import { useState } from "react";

export function Providers({ children }: { children: React.ReactNode }) {
  const [client] = useState(() => new QueryClient({ defaultOptions: { queries: { staleTime: 15_000, retry: 1 } } }));
  // Service worker (lib/pwa/sw.ts): installable app that reopens offline; no reload on reconnect (the outbox syncs instead).
  return (
    <SerwistProvider swUrl="/serwist/sw.js" reloadOnOnline={false} disable={process.env.NODE_ENV === "development"}>
      <QueryClientProvider client={client}>{children}</QueryClientProvider>
    </SerwistProvider>
  );
}
