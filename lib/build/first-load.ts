/**
 * First-load JavaScript of each App Router page, from the manifests `next build` writes (Next 16, Turbopack):
 * - `build-manifest.json` → `rootMainFiles`: the runtime and framework chunks every page loads;
 * - `server/app/<route>/page_client-reference-manifest.js` → `entryJSFiles`: for each segment of the page
 *   (root layout, nested layouts, the page, its boundaries) the chunks the browser loads with its HTML.
 * A page's first load is the union of both. `polyfillFiles` load only in browsers without ES modules
 * (`nomodule`) and are left out, as Next's own figure did. Pure: no file system here (scripts/check-first-load.ts reads).
 */

export interface RscManifest {
  entryJSFiles?: Record<string, string[]>;
}

export interface PageChunks {
  /** App route as the app-path-routes manifest names it, e.g. "/projects/[projectId]/samples/[sampleId]". */
  route: string;
  files: string[];
}

/** Evaluates nothing: the manifest file is `globalThis.__RSC_MANIFEST["<entry>"] = <JSON>;` — the JSON is read as JSON. */
export function parseClientReferenceManifest(source: string): Record<string, RscManifest> {
  const out: Record<string, RscManifest> = {};
  const re = /globalThis\.__RSC_MANIFEST\[("(?:[^"\\]|\\.)*")\]\s*=\s*/g;
  let m: RegExpExecArray | null;
  while ((m = re.exec(source))) {
    const start = re.lastIndex;
    const end = matchingBrace(source, start);
    out[JSON.parse(m[1]) as string] = JSON.parse(source.slice(start, end + 1)) as RscManifest;
    re.lastIndex = end + 1;
  }
  if (Object.keys(out).length === 0) throw new Error("not a client reference manifest (no __RSC_MANIFEST assignment)");
  return out;
}

function matchingBrace(s: string, start: number): number {
  if (s[start] !== "{") throw new Error(`expected "{" at offset ${start} of the client reference manifest`);
  let depth = 0;
  let inString = false;
  for (let i = start; i < s.length; i++) {
    const c = s[i];
    if (inString) {
      if (c === "\\") i++;
      else if (c === '"') inString = false;
    } else if (c === '"') inString = true;
    else if (c === "{") depth++;
    else if (c === "}" && --depth === 0) return i;
  }
  throw new Error("unterminated object in the client reference manifest");
}

/** The chunks one page loads first: root main files plus every segment entry of its manifest, without repeats, in order. */
export function firstLoadFiles(rootMainFiles: string[], manifest: RscManifest): string[] {
  const files = new Set<string>(rootMainFiles);
  for (const list of Object.values(manifest.entryJSFiles ?? {})) for (const f of list) files.add(f);
  return [...files].filter((f) => f.endsWith(".js"));
}

export interface PageSize {
  route: string;
  bytes: number;
  gzipBytes: number;
}

export const KB = 1000;

/** Plain-text table, largest first, with the budget verdict per row. */
export function formatTable(rows: PageSize[], budgetGzipBytes: number): string {
  const sorted = [...rows].sort((a, b) => b.gzipBytes - a.gzipBytes);
  const width = Math.max(5, ...sorted.map((r) => r.route.length));
  const lines = [`${"Route".padEnd(width)}  ${"raw kB".padStart(8)}  ${"gzip kB".padStart(8)}  budget`];
  for (const r of sorted) {
    lines.push(
      `${r.route.padEnd(width)}  ${(r.bytes / KB).toFixed(1).padStart(8)}  ${(r.gzipBytes / KB).toFixed(1).padStart(8)}  ${r.gzipBytes > budgetGzipBytes ? "OVER" : "ok"}`,
    );
  }
  return lines.join("\n");
}
