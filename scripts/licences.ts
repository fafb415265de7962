/**
 * Writes THIRD-PARTY-LICENSES.md from package-lock.json (see lib/build/licences.ts).
 *   npx tsx scripts/licences.ts           write the file
 *   npx tsx scripts/licences.ts --check   exit 1 when the committed file differs from what the lockfile gives
 *   --lock=PATH                           read another lockfile (default: the repository's package-lock.json)
 */
import { existsSync, readFileSync, writeFileSync } from "node:fs";
import { join } from "node:path";
import spdx from "spdx-license-list";
import { licenceRows, licencesMarkdown, type LockPackage } from "../lib/build/licences";

const root = join(import.meta.dirname, "..");
const out = join(root, "THIRD-PARTY-LICENSES.md");
const lockPath = process.argv.find((a) => a.startsWith("--lock="))?.slice("--lock=".length) ?? join(root, "package-lock.json");
const lock = JSON.parse(readFileSync(lockPath, "utf8")) as { packages: Record<string, LockPackage> };

/**
 * Packages whose package.json has no licence field: the licence stated in the package itself (LICENSE file or the
 * README's licence section), read from node_modules when installed. Checked by hand: png-js 1.1.0 ships an MIT
 * LICENSE file; combine-errors 3.0.3's Readme says "## License MIT". Nothing is assumed for others.
 */
function fallback(name: string): { licence: string; source: string } | null {
  const dir = join(root, "node_modules", name);
  for (const f of ["LICENSE", "LICENSE.md", "LICENSE.txt", "license"]) {
    const p = join(dir, f);
    if (existsSync(p) && /^\s*MIT License/.test(readFileSync(p, "utf8"))) return { licence: "MIT", source: `${f} file says MIT` };
  }
  for (const f of ["README.md", "Readme.md", "readme.md", "README.markdown"]) {
    const p = join(dir, f);
    const m = existsSync(p) ? /^#+\s*Licen[cs]e\s*\n+\s*(MIT|ISC|BSD-[23]-Clause|Apache-2\.0)\s*$/im.exec(readFileSync(p, "utf8")) : null;
    if (m) return { licence: m[1], source: `${f} licence section says ${m[1]}` };
  }
  return null;
}

const rows = licenceRows(lock.packages, (id) => spdx[id]?.osiApproved, fallback);
const md = licencesMarkdown(rows);
if (process.argv.includes("--check")) {
  const current = existsSync(out) ? readFileSync(out, "utf8") : "";
  if (current !== md) {
    console.error("THIRD-PARTY-LICENSES.md is out of date with package-lock.json: run npm run licences and commit it.");
    process.exit(1);
  }
  console.log(`THIRD-PARTY-LICENSES.md is current (${rows.length} runtime packages, ${rows.filter((r) => !r.osiApproved).length} not OSI-approved).`);
} else {
  writeFileSync(out, md);
  console.log(`Wrote THIRD-PARTY-LICENSES.md: ${rows.length} runtime packages, ${rows.filter((r) => !r.osiApproved).length} not OSI-approved.`);
}
