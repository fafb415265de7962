// Sums vitest JSON reports into one plain line: "N passed, N failed". Exits 1 when a report is missing or any test failed.
import { existsSync, readFileSync } from "node:fs";

let passed = 0;
let failed = 0;
let missing = false;
for (const file of process.argv.slice(2)) {
  if (!existsSync(file)) {
    console.error(`missing test report ${file}`);
    missing = true;
    continue;
  }
  const r = JSON.parse(readFileSync(file, "utf8"));
  passed += r.numPassedTests;
  failed += r.numFailedTests + (r.numTotalTestSuites > 0 && r.success === false && r.numFailedTests === 0 ? 1 : 0);
}
console.log(`${passed} passed, ${failed} failed`);
process.exit(failed > 0 || missing ? 1 : 0);
