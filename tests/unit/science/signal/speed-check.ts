/**
 * Speed check (a script, not a test): parse + process of a 4,000-point synthetic Cu scan.
 * Run: npx tsx tests/unit/science/signal/speed-check.ts
 */
import { parseScan, writeXy } from "@/lib/science/scan";
import { processScan } from "@/lib/science/signal";
import { synthScan } from "./synthetic";

const { scan } = synthScan({
  start: 5,
  step: 0.02,
  points: 4000,
  ratio: 0.5,
  background: (x) => 150 + 600 * Math.exp(-x / 8),
  peaks: [
    { twoTheta: 20.86, area: 300, fwhm: 0.1, eta: 0.5 },
    { twoTheta: 26.64, area: 1500, fwhm: 0.1, eta: 0.5 },
    { twoTheta: 29.4, area: 800, fwhm: 0.12, eta: 0.4 },
    { twoTheta: 36.54, area: 150, fwhm: 0.1, eta: 0.5 },
    { twoTheta: 39.46, area: 250, fwhm: 0.11, eta: 0.5 },
    { twoTheta: 43.16, area: 280, fwhm: 0.11, eta: 0.5 },
    { twoTheta: 47.5, area: 260, fwhm: 0.12, eta: 0.5 },
    { twoTheta: 48.5, area: 270, fwhm: 0.12, eta: 0.5 },
    { twoTheta: 50.14, area: 220, fwhm: 0.12, eta: 0.5 },
    { twoTheta: 59.96, area: 150, fwhm: 0.14, eta: 0.5 },
    { twoTheta: 68.14, area: 120, fwhm: 0.15, eta: 0.5 },
    { twoTheta: 75.66, area: 60, fwhm: 0.17, eta: 0.5 },
  ],
});
const text = writeXy(scan);
const run = () => processScan(parseScan(text));
for (let i = 0; i < 20; i++) run(); // warm-up (JIT)
// The machine is shared: report CPU time of this process (user + system) as well as wall time.
const wall: number[] = [];
const cpu: number[] = [];
let peaks = 0;
for (let i = 0; i < 100; i++) {
  const c = process.cpuUsage();
  const t = performance.now();
  peaks = run().peaks.length;
  wall.push(performance.now() - t);
  const d = process.cpuUsage(c);
  cpu.push((d.user + d.system) / 1000);
}
const med = (a: number[]) => [...a].sort((x, y) => x - y)[a.length >> 1];
const min = (a: number[]) => Math.min(...a);
console.log(
  `parse+process, ${scan.twoTheta.length} points, ${peaks} peaks, after warm-up: ` +
    `wall median ${med(wall).toFixed(2)} ms (min ${min(wall).toFixed(2)}), CPU median ${med(cpu).toFixed(2)} ms (min ${min(cpu).toFixed(2)})`,
);
