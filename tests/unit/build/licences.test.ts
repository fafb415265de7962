import { spawnSync } from "node:child_process";
import { readFileSync } from "node:fs";
import spdx from "spdx-license-list";
import { describe, expect, it } from "vitest";
import { expressionApproved, licenceRows } from "@/lib/build/licences";

const osi = (id: string) => spdx[id]?.osiApproved;

describe("runtime dependency licences", () => {
  // OSI approval as the SPDX License List records it (spdx-license-list 6.12.0).
  it("MIT, Apache-2.0 and MPL-2.0 are OSI-approved; Hippocratic-2.1 and CC-BY-4.0 are not", () => {
    for (const id of ["MIT", "Apache-2.0", "MPL-2.0", "BlueOak-1.0.0"]) expect(expressionApproved(id, osi), id).toBe(true);
    for (const id of ["Hippocratic-2.1", "CC-BY-4.0", "NoSuchLicence"]) expect(expressionApproved(id, osi), id).toBe(false);
  });

  it("SPDX expressions: OR needs one approved side, AND needs both, parentheses group (SPDX 2.3 Annex D)", () => {
    expect(expressionApproved("(MIT OR Hippocratic-2.1)", osi)).toBe(true);
    expect(expressionApproved("MIT AND Hippocratic-2.1", osi)).toBe(false);
    expect(expressionApproved("Apache-2.0 AND (Hippocratic-2.1 OR MIT)", osi)).toBe(true);
    expect(expressionApproved("GPL-2.0+", osi)).toBe(true);
  });

  it("dev-only packages are left out; a package without a licence is UNKNOWN and flagged", () => {
    const rows = licenceRows(
      {
        "": { version: "0.1.0" },
        "node_modules/a": { version: "1.0.0", license: "MIT" },
        "node_modules/tool": { version: "2.0.0", license: "MIT", dev: true },
        "node_modules/x/node_modules/b": { version: "3.0.0" },
      },
      osi,
      () => null,
    );
    expect(rows.map((r) => [r.name, r.licence, r.osiApproved])).toEqual([
      ["a", "MIT", true],
      ["b", "UNKNOWN", false],
    ]);
  });

  it("THIRD-PARTY-LICENSES.md is current with package-lock.json and flags react-leaflet", () => {
    const r = spawnSync("npx", ["tsx", "scripts/licences.ts", "--check"], { encoding: "utf8" });
    expect(r.stderr + r.stdout).toContain("is current");
    expect(r.status).toBe(0);
    expect(readFileSync("THIRD-PARTY-LICENSES.md", "utf8")).toMatch(/^\| react-leaflet \| [\d.]+ \| Hippocratic-2\.1 \| \*\*no\*\* \|/m);
  }, 60_000);
});
