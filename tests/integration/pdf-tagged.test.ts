import { execFileSync } from "node:child_process";
import { existsSync, mkdtempSync, readFileSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { beforeAll, describe, expect, test } from "vitest";
import { GET as exportRoute } from "@/app/api/projects/[projectId]/exports/[format]/route";
import { POST as createRoute } from "@/app/api/projects/[projectId]/samples/route";
import { call, makeWorld, type World } from "../helpers/app";
import { addScan } from "../helpers/phase-fixtures";

/*
 * The register report is a tagged PDF (ISO 32000-1 §14.8), checked with poppler (Debian poppler-utils):
 * `pdfinfo` reports "Tagged: yes" and the PDF version, `pdfinfo -struct-text` prints the structure tree with the
 * text of each element (H1 title, H2 sections, a Table of TR rows with TH/TD cells, Figures), in reading order.
 * Invented samples.
 */
const hasPoppler = existsSync("/usr/bin/pdfinfo");
let w: World;
let file: string;

beforeAll(async () => {
  w = await makeWorld();
  const r = await call(createRoute, { method: "POST", params: { projectId: w.projectId }, cookie: w.cookies.lead, body: { code: "TAG-001", sampleType: "hand_sample", lithology: "gossan", lat: 37.71, lon: -6.61, collectedAt: "2026-03-14T10:05:00Z" } });
  expect(r.status).toBe(201);
  await addScan(w.projectId, r.json.id, { signedOff: true, phases: [{ mineral: "quartz", status: "accepted", rank: 1, wt: 70 }, { mineral: "goethite", status: "accepted", rank: 2, wt: 30 }] });
  const res = await exportRoute(new Request(`http://localhost:3000/api/projects/x/exports/pdf`, { headers: new Headers({ cookie: w.cookies.consultant }) }), {
    params: Promise.resolve({ projectId: w.projectId, format: "pdf" }),
  });
  expect(res.status).toBe(200);
  file = join(mkdtempSync(join(tmpdir(), "lithodex-pdf-")), "report.pdf");
  writeFileSync(file, Buffer.from(await res.arrayBuffer()));
}, 60_000);

describe.skipIf(!hasPoppler)("register report: tagged PDF", () => {
  test("pdfinfo: Tagged yes, PDF 1.7, title shown", () => {
    const info = execFileSync("/usr/bin/pdfinfo", [file]).toString();
    expect(info).toMatch(/^Tagged:\s+yes$/m);
    expect(info).toMatch(/^PDF version:\s+1\.7$/m);
    expect(info).toMatch(/^Title:\s+TP\d+ sample register report$/m);
  });

  test("structure tree: H1 title, H2 sections in order, a table with header and data cells, figures", () => {
    const tree = execFileSync("/usr/bin/pdfinfo", ["-struct-text", file]).toString();
    expect(tree).toMatch(/^Document/m);
    expect(tree).toMatch(/H1[^\n]*\n\s*"[^"]+"/);
    const sections = [...tree.matchAll(/H2[^\n]*\n\s*"([^"]+)"/g)].map((m) => m[1].trim());
    expect(sections).toEqual(["Summary", "Figure 1. Stations and phases", "Confirmed phases (semi-quantitative)", "Register", "Methods", "Cautions"]);
    expect(tree).toMatch(/Table[\s\S]*TR[\s\S]*TH[\s\S]*"Mineral/);
    expect(tree).toMatch(/TD[^\n]*\n\s*"TAG-001/);
    expect((tree.match(/^\s*Figure/gm) ?? []).length).toBeGreaterThanOrEqual(1);
  });

  test("the document declares its language (/Lang in the catalog)", () => {
    // pdfkit writes the catalog uncompressed (no object streams), so the key is readable in the file itself.
    const raw = readFileSync(file).toString("latin1");
    expect(raw).toMatch(/\/Lang \(en\)/);
  });
});
