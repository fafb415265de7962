"use client";

import { useEffect, useState } from "react";
import { Button } from "@/components/ui/button";
import { topUpCodeBlock, watchCodeBlocks } from "@/lib/client/code-block";
import { blockCounts, type DeviceBlock } from "@/lib/outbox/code-block-math";

/** The sample codes reserved for this device: each block's range, used and left, and a button for another block. */
export function CodeBlockSummary({ projectId, userId, online }: { projectId: string; userId: string; online: boolean }) {
  const [blocks, setBlocks] = useState<DeviceBlock[] | null>(null);
  const [busy, setBusy] = useState(false);
  useEffect(() => watchCodeBlocks(projectId, userId, setBlocks), [projectId, userId]);
  if (!blocks) return null;
  const counts = blockCounts(blocks);
  return (
    <section className="space-y-2 rounded-md border border-line p-3" aria-labelledby="code-block-h" data-testid="code-blocks">
      <h2 id="code-block-h" className="text-sm font-semibold">
        Sample codes reserved for this device
      </h2>
      {blocks.length === 0 ? (
        <p className="text-sm text-muted">None yet: a block is reserved the next time this device is online.</p>
      ) : (
        <>
          <ul className="space-y-1 text-sm">
            {counts.rows.map((r) => (
              <li key={r.id} data-testid="code-block">
                <span className="font-mono">{r.range}</span> · {r.used} used · {r.left} left
              </li>
            ))}
          </ul>
          <p className="text-xs text-muted" data-testid="code-block-left">
            {counts.left} codes left in all. Samples saved without a connection take the next one; it is provisional until the sample reaches the
            server, and only this device can use it. Another block is reserved when few are left and the device is online.
          </p>
        </>
      )}
      <Button
        type="button"
        variant="secondary"
        disabled={!online || busy}
        onClick={async () => {
          setBusy(true);
          try {
            await topUpCodeBlock(projectId, userId, { force: true });
          } finally {
            setBusy(false);
          }
        }}
      >
        {busy ? "Reserving…" : "Reserve more codes"}
      </Button>
    </section>
  );
}
