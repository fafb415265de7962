import { spawnSync } from "node:child_process";
import { randomBytes } from "node:crypto";
import { mkdirSync, mkdtempSync, readFileSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { gzipSync } from "node:zlib";
import { describe, expect, it } from "vitest";
import { firstLoadFiles, formatTable, parseClientReferenceManifest } from "@/lib/build/first-load";

// Shape of the files `next build` (16, Turbopack) writes: server/app/<route>/page_client-reference-manifest.js
// assigns globalThis.__RSC_MANIFEST[entry] = {...entryJSFiles}; build-manifest.json lists rootMainFiles.
const manifestSource = (entry: string, entryJSFiles: Record<string, string[]>) =>
  `globalThis.__RSC_MANIFEST = globalThis.__RSC_MANIFEST || {};\nglobalThis.__RSC_MANIFEST[${JSON.stringify(entry)}] = ${JSON.stringify({
    moduleLoading: { prefix: "" },
    clientModules: { "[project]/a.js": { id: 1, name: "*", chunks: ["/x}{.js"], async: false } },
    entryJSFiles,
  })};\n`;

describe("first-load JS from the build manifests", () => {
  it("reads the manifest as JSON (braces inside strings do not end the object)", () => {
    const m = parseClientReferenceManifest(manifestSource("/(app)/x/page", { "[project]/app/layout": ["static/chunks/a.js"] }));
    expect(Object.keys(m)).toEqual(["/(app)/x/page"]);
    expect(m["/(app)/x/page"].entryJSFiles).toEqual({ "[project]/app/layout": ["static/chunks/a.js"] });
  });

  it("refuses a file that is not a client reference manifest", () => {
    expect(() => parseClientReferenceManifest("module.exports = {}")).toThrow(/not a client reference manifest/);
  });

  it("a page loads the root main files plus every segment's chunks, each once, CSS left out", () => {
    const files = firstLoadFiles(["static/chunks/runtime.js", "static/chunks/shared.js"], {
      entryJSFiles: {
        "[project]/app/layout": ["static/chunks/shared.js"],
        "[project]/app/x/page": ["static/chunks/shared.js", "static/chunks/page.js", "static/chunks/page.css"],
      },
    });
    expect(files).toEqual(["static/chunks/runtime.js", "static/chunks/shared.js", "static/chunks/page.js"]);
  });

  it("the table lists the largest page first and marks pages over budget", () => {
    const t = formatTable([{ route: "/a", bytes: 1000, gzipBytes: 500 }, { route: "/b", bytes: 9000, gzipBytes: 3000 }], 1000);
    const rows = t.split("\n").slice(1);
    expect(rows[0]).toMatch(/^\/b\s+9\.0\s+3\.0\s+OVER$/);
    expect(rows[1]).toMatch(/^\/a\s+1\.0\s+0\.5\s+ok$/);
  });

  it("scripts/check-first-load.ts fails on a page over budget and names it; gzip sizes are zlib's", () => {
    const dist = mkdtempSync(join(tmpdir(), "first-load-"));
    mkdirSync(join(dist, "static/chunks"), { recursive: true });
    const small = Buffer.from("console.log(1);".repeat(100));
    const big = randomBytes(12_000); // incompressible: gzip ≈ raw size
    writeFileSync(join(dist, "static/chunks/runtime.js"), small);
    writeFileSync(join(dist, "static/chunks/big.js"), big);
    writeFileSync(join(dist, "build-manifest.json"), JSON.stringify({ rootMainFiles: ["static/chunks/runtime.js"] }));
    writeFileSync(join(dist, "app-path-routes-manifest.json"), JSON.stringify({ "/(app)/light/page": "/light", "/(app)/heavy/page": "/heavy" }));
    for (const [seg, chunks] of [["light", []], ["heavy", ["static/chunks/big.js"]]] as const) {
      mkdirSync(join(dist, "server/app/(app)", seg), { recursive: true });
      writeFileSync(join(dist, "server/app/(app)", seg, "page_client-reference-manifest.js"), manifestSource(`/(app)/${seg}/page`, { [`[project]/app/${seg}/page`]: [...chunks] }));
    }
    const jsonOut = join(dist, "sizes.json");
    const r = spawnSync("npx", ["tsx", "scripts/check-first-load.ts", dist, "--budget-kb=10", `--json=${jsonOut}`], { encoding: "utf8" });
    expect(r.status).toBe(1);
    expect(r.stderr).toContain("1 page(s) over the 10 kB budget: /heavy");
    const sizes = JSON.parse(readFileSync(jsonOut, "utf8")) as { route: string; gzipBytes: number }[];
    const g = (b: Buffer) => gzipSync(b, { level: 9 }).length;
    expect(sizes.find((s) => s.route === "/light")!.gzipBytes).toBe(g(small));
    expect(sizes.find((s) => s.route === "/heavy")!.gzipBytes).toBe(g(small) + g(big));

    const ok = spawnSync("npx", ["tsx", "scripts/check-first-load.ts", dist, "--budget-kb=200"], { encoding: "utf8" });
    expect(ok.status).toBe(0);
    expect(ok.stdout).toContain("All 2 pages within 200 kB gzip.");
  }, 60_000);
});
