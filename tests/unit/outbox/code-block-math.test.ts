/**
 * Bookkeeping of a device's reserved sample codes (lib/outbox/code-block-math.ts). The rules are our own design
 * (issue 10): codes are used in sequence order, oldest block first; a code is never given twice; top up when few
 * are left (threshold "common practice", our own default).
 */
import { describe, expect, test } from "vitest";
import { blockCounts, needsTopUp, nextUnusedCode, TOP_UP_WHEN_LEFT, type DeviceBlock } from "@/lib/outbox/code-block-math";

const block = (id: string, from: number, n: number, taken: number, createdAt: number): DeviceBlock => {
  const codes = Array.from({ length: n }, (_, i) => `AB-${String(from + i).padStart(6, "0")}`);
  return { id, firstCode: codes[0], lastCode: codes[n - 1], codes, taken: codes.slice(0, taken), createdAt };
};

describe("reserved code bookkeeping", () => {
  test("the next code is the first unused one of the oldest block that has one", () => {
    const older = block("a", 1, 3, 3, 1);
    const newer = block("b", 21, 3, 1, 2);
    expect(nextUnusedCode([newer, older])).toEqual({ blockId: "b", code: "AB-000022" });
    expect(nextUnusedCode([block("a", 1, 3, 0, 1)])).toEqual({ blockId: "a", code: "AB-000001" });
  });

  test("taking codes one by one never repeats a code and stops when all are used", () => {
    const b = block("a", 1, 4, 0, 1);
    const seen: string[] = [];
    for (;;) {
      const n = nextUnusedCode([b]);
      if (!n) break;
      seen.push(n.code);
      b.taken.push(n.code);
    }
    expect(seen).toEqual(b.codes);
    expect(new Set(seen).size).toBe(4);
  });

  test("range, used and left per block and in all; top up at the threshold", () => {
    const c = blockCounts([block("a", 1, 20, 12, 1), block("b", 41, 20, 0, 2)]);
    expect(c.rows.map((r) => [r.range, r.used, r.left])).toEqual([
      ["AB-000001–AB-000020", 12, 8],
      ["AB-000041–AB-000060", 0, 20],
    ]);
    expect([c.used, c.left]).toEqual([12, 28]);
    expect(needsTopUp([])).toBe(true);
    expect(needsTopUp([block("a", 1, 20, 20 - TOP_UP_WHEN_LEFT, 1)])).toBe(true);
    expect(needsTopUp([block("a", 1, 20, 20 - TOP_UP_WHEN_LEFT - 1, 1)])).toBe(false);
  });
});
