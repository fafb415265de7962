/**
 * Hostile job for tests of the pool's limits: spins the CPU for `spinMs`, or grows the heap by `allocateMb`.
 * Not reachable from any route.
 */
export default function hostile(input: { spinMs?: number; allocateMb?: number }): { spunMs: number; allocatedMb: number } {
  const started = Date.now();
  const hold: number[][] = [];
  if (input.allocateMb) {
    // ~8 bytes per number in a packed array: grow until the requested size (or the worker's heap limit) is reached.
    for (let mb = 0; mb < input.allocateMb; mb++) hold.push(new Array(131_072).fill(mb + 0.5));
  }
  while (input.spinMs && Date.now() - started < input.spinMs) {
    // busy loop on purpose
  }
  return { spunMs: Date.now() - started, allocatedMb: hold.length };
}
