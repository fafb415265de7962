/**
 * Bookkeeping of a device's reserved sample codes, pure (no browser or framework imports): which code comes next,
 * how many are left, and when to ask the server for another block.
 */

/** Header naming the device a request comes from (the id the device made for itself, kept on it). */
export const DEVICE_HEADER = "lithodex-device";

/** Codes in one block: enough for a field day without signal, few enough not to leave long gaps (common practice). */
export const CODE_BLOCK_DEFAULT_SIZE = 20;
export const CODE_BLOCK_MIN_SIZE = 5;
export const CODE_BLOCK_MAX_SIZE = 100;
/** Unused reserved codes one device may hold in a project; another block is refused past this. */
export const CODE_BLOCK_MAX_UNUSED = 200;

export interface DeviceBlock {
  id: string;
  firstCode: string;
  lastCode: string;
  codes: string[];
  /** Codes this device has given to samples (in the order taken). */
  taken: string[];
  createdAt: number;
}

/** Top up when this few codes are left, so a day without signal still has codes (common practice; our own default). */
export const TOP_UP_WHEN_LEFT = 5;

/** The next unused code, from the oldest block first (codes in sequence order); null when none is left. */
export function nextUnusedCode(blocks: DeviceBlock[]): { blockId: string; code: string } | null {
  const ordered = [...blocks].sort((a, b) => a.createdAt - b.createdAt);
  for (const b of ordered) {
    const taken = new Set(b.taken);
    const code = b.codes.find((c) => !taken.has(c));
    if (code) return { blockId: b.id, code };
  }
  return null;
}

/** Range, used and left of each block and in all. */
export function blockCounts(blocks: DeviceBlock[]) {
  const rows = blocks.map((b) => {
    const used = b.codes.filter((c) => b.taken.includes(c)).length;
    return { id: b.id, range: `${b.firstCode}–${b.lastCode}`, size: b.codes.length, used, left: b.codes.length - used };
  });
  return { rows, used: rows.reduce((s, r) => s + r.used, 0), left: rows.reduce((s, r) => s + r.left, 0) };
}

/** Whether to reserve another block now. */
export function needsTopUp(blocks: DeviceBlock[], threshold = TOP_UP_WHEN_LEFT): boolean {
  return blockCounts(blocks).left <= threshold;
}
