/**
 * Register report for consultants (PDF, pdfkit): project summary, a map figure (offline basemap and
 * phase-map symbols), the confirmed phases with semi-quantitative wt%, the register table, methods
 * (anodes, processing parameters, reference structures with their published sources) and the cautions
 * of automated identification (common practice). Pages are written as they fill, so the register is streamed.
 */
import { existsSync } from "node:fs";
import path from "node:path";
import type { PassThrough } from "node:stream";
import PDFDocument from "pdfkit";
import sharp, { type OverlayOptions } from "sharp";
import { formatDateTime, formatLocalDate } from "@/lib/dates";
import { phaseGlyphSvg, phaseSymbol } from "@/lib/phase-map";
import { ASBESTOS_CAVEAT, CONFIRMED_VS_CANDIDATE, IDENTIFICATION_CAVEAT, SILICA_CAVEAT, isAsbestiform } from "./caveats";
import { describeFilter } from "./filter-text";
import { drained, fromNodeStream } from "./node-stream";
import { processingSentences } from "./methods-text";
import { formatWt, phaseNames } from "./phase-text";
import { renderStaticMap } from "./static-map";
import type { ExportRow, RegisterExport, RegisterReportData } from "./types";

/** Register rows listed in the report; the CSV/XLSX exports carry every row. */
export const PDF_MAX_ROWS = 2000;

/**
 * DejaVu Sans, shipped with the app (assets/fonts/dejavu, licence beside it) and embedded as a subset: it has the
 * Greek (Kα, 2θ) and the dashes the report uses. The system copy (Debian fonts-dejavu-core) and the base-14
 * Helvetica are fallbacks for a checkout without the assets folder. The path is built from the working directory
 * at run time (the app runs from the repository root), marked so the build's file tracing does not follow it.
 */
const FONT_DIRS = [path.join(/* turbopackIgnore: true */ process.cwd(), "assets", "fonts", "dejavu"), "/usr/share/fonts/truetype/dejavu"];
function fonts(): { regular: string; bold: string; unicode: boolean } {
  for (const dir of FONT_DIRS) {
    const regular = `${dir}/DejaVuSans.ttf`;
    const bold = `${dir}/DejaVuSans-Bold.ttf`;
    if (existsSync(regular) && existsSync(bold)) return { regular, bold, unicode: true };
  }
  return { regular: "Helvetica", bold: "Helvetica-Bold", unicode: false };
}

/** Base-14 fonts cover WinAnsi only: spell out what they cannot draw. */
function winAnsi(s: string): string {
  return s
    .replace(/α/g, "alpha")
    .replace(/β/g, "beta")
    .replace(/θ/g, "theta")
    .replace(/[₀-₉]/g, (c) => String(c.charCodeAt(0) - 0x2080))
    .replace(/[^\u0000-\u00ff–—‘’“”•…€]/g, "?");
}

const MARGIN = 40;

interface Ctx {
  doc: PDFKit.PDFDocument;
  t: (s: string) => string;
  bold: string;
  regular: string;
  /** Root of the tagged structure (Document): headings, paragraphs, tables and figures in reading order. */
  s: PDFKit.PDFStructureElement;
}

function heading(c: Ctx, text: string, size = 13) {
  const { doc } = c;
  if (doc.y > doc.page.height - MARGIN - 60) doc.addPage();
  doc.moveDown(0.6).font(c.bold).fontSize(size).fillColor("#1F2933").text(c.t(text), MARGIN, doc.y, { structParent: c.s, structType: "H2" }).moveDown(0.3).font(c.regular).fontSize(9);
}

function para(c: Ctx, text: string, opts: PDFKit.Mixins.TextOptions = {}) {
  c.doc.font(c.regular).fontSize(9).fillColor("#1F2933").text(c.t(text), MARGIN, c.doc.y, { width: c.doc.page.width - 2 * MARGIN, structParent: c.s, structType: "P", ...opts });
}

/** Draws a simple table; returns when done. Rows that do not fit go to the next page under a repeated header. */
async function table(c: Ctx, head: string[], widths: number[], rows: AsyncIterable<string[][]> | string[][][], fontSize = 8, onPage?: () => Promise<void>) {
  const { doc } = c;
  const total = widths.reduce((a, b) => a + b, 0);
  const scale = (doc.page.width - 2 * MARGIN) / total;
  const w = widths.map((x) => x * scale);
  const pad = 2.5;
  // Table > TR > TH/TD (ISO 32000-1 §14.8.4.3.4); the repeated header on a new page is an artifact, not a row.
  const tableStruct = doc.struct("Table");
  c.s.add(tableStruct);
  const drawRow = (cells: string[], bold: boolean, shade: boolean, repeat = false) => {
    doc.font(bold ? c.bold : c.regular).fontSize(fontSize);
    const h = Math.max(...cells.map((cell, i) => doc.heightOfString(c.t(cell), { width: w[i] - 2 * pad }))) + 2 * pad;
    if (doc.y + h > doc.page.height - MARGIN) {
      doc.addPage();
      if (!bold) drawRow(head, true, true, true);
    }
    const y = doc.y;
    if (shade) {
      doc.markContent("Artifact");
      doc.rect(MARGIN, y, doc.page.width - 2 * MARGIN, h).fill(bold ? "#E7EAEE" : "#F6F7F9");
      doc.endMarkedContent();
    }
    let x = MARGIN;
    doc.fillColor("#1F2933");
    const tr = repeat ? null : doc.struct("TR");
    if (tr) tableStruct.add(tr);
    if (repeat) doc.markContent("Artifact");
    cells.forEach((cell, i) => {
      doc.font(bold ? c.bold : c.regular).fontSize(fontSize).text(c.t(cell), x + pad, y + pad, { width: w[i] - 2 * pad, lineBreak: true, ...(tr && { structParent: tr, structType: bold ? "TH" : "TD" }) });
      x += w[i];
    });
    if (repeat) doc.endMarkedContent();
    doc.y = y + h;
    doc.x = MARGIN;
  };
  drawRow(head, true, true);
  let n = 0;
  for await (const page of rows as AsyncIterable<string[][]>) {
    for (const r of page) drawRow(r, false, n++ % 2 === 1);
    await onPage?.();
  }
}

async function legendImage(minerals: { mineral: string; group: string | null }[]): Promise<Buffer | null> {
  if (minerals.length === 0) return null;
  const cell = 180;
  const ROW = 40;
  const perRow = 4;
  const rows = Math.ceil((minerals.length + 2) / perRow);
  const comps: OverlayOptions[] = [];
  const labels: string[] = [];
  const items = [
    ...minerals.map((m) => ({ ...m, confirmed: true, label: "" })),
    { mineral: "quartz", group: "silica", confirmed: true, label: "confirmed = filled" },
    { mineral: "quartz", group: "silica", confirmed: false, label: "candidate = dashed outline" },
  ];
  items.forEach((m, i) => {
    const s = phaseSymbol(m.mineral, m.group);
    const g = phaseGlyphSvg({ symbol: s.symbol, colour: s.colour, shape: s.shape, confirmed: m.confirmed }, { radius: 10 });
    const x = (i % perRow) * cell;
    const y = Math.floor(i / perRow) * ROW;
    comps.push({ input: Buffer.from(g.svg), left: x, top: y });
    const text = m.label || `${s.mineral} (${s.groupLabel.toLowerCase()})`;
    labels.push(`<text x="${x + g.size + 2}" y="${y + g.size / 2 + 4}" font-family="DejaVu Sans,Helvetica,Arial,sans-serif" font-size="13" fill="#1F2933">${text.replace(/[&<>]/g, "")}</text>`);
  });
  const width = perRow * cell;
  const height = rows * ROW;
  comps.push({ input: Buffer.from(`<svg xmlns="http://www.w3.org/2000/svg" width="${width}" height="${height}">${labels.join("")}</svg>`), left: 0, top: 0 });
  return sharp({ create: { width, height, channels: 3, background: "#FFFFFF" } }).composite(comps).png().toBuffer();
}

async function produce(exp: RegisterExport, out: PassThrough): Promise<void> {
  const f = fonts();
  const doc = new PDFDocument({
    size: "A4",
    margin: MARGIN,
    font: f.regular,
    bufferPages: false,
    info: { Title: `${exp.project.code} sample register report`, Author: "Lithodex", Subject: exp.project.name, CreationDate: exp.generatedAt },
    // Document language and the title in the viewer's window bar (PDF 1.7 §14.9.2, ViewerPreferences DisplayDocTitle).
    lang: "en",
    displayTitle: true,
    // Tagged PDF (ISO 32000-1 §14.8): structure tree with headings, paragraphs, tables and figures with alternative text.
    tagged: true,
    pdfVersion: "1.7",
  });
  const root = doc.struct("Document");
  doc.addStructure(root);
  const c: Ctx = { doc, t: f.unicode ? (s) => s : winAnsi, bold: f.bold, regular: f.regular, s: root };
  doc.pipe(out);
  const report: RegisterReportData = await exp.report();

  // Title and summary.
  const P = { structParent: root, structType: "P" };
  doc.font(c.bold).fontSize(18).fillColor("#1F2933").text(c.t(`${exp.project.name}`), MARGIN, MARGIN, { structParent: root, structType: "H1" });
  doc.font(c.regular).fontSize(10).fillColor("#52606D").text(c.t(`Sample register report · ${exp.project.code}${exp.project.region ? ` · ${exp.project.region}` : ""}`), P);
  doc.text(c.t(`Generated ${formatDateTime(exp.generatedAt, exp.project.timeZone)} · ${exp.source.kind === "member" ? `exported by ${exp.source.name}` : `read-only link${exp.source.label ? ` "${exp.source.label}"` : ""}`}`), P);
  doc.text(c.t(`Filter: ${describeFilter(exp.filter)}`), P);
  if (exp.project.description) para(c, exp.project.description);
  heading(c, "Summary");
  const t = report.totals;
  await table(c, ["Samples", "With a position", "Stations", "With confirmed phases", "With candidates only"], [1, 1, 1, 1.3, 1.3], [[[String(t.samples), String(t.located), String(t.stations), String(t.withConfirmed), String(t.withCandidatesOnly)]]], 9);
  doc.moveDown(0.5);
  doc.font(c.bold).fontSize(9).fillColor("#8A3B12").text(c.t("Limits of automated identification"), MARGIN, doc.y, { structParent: root, structType: "H3" });
  para(c, `${IDENTIFICATION_CAVEAT} ${CONFIRMED_VS_CANDIDATE}`);

  // Map figure.
  heading(c, "Figure 1. Stations and phases");
  const showCandidates = exp.filter.phase !== "confirmed";
  const { png } = await renderStaticMap(report.stations, { width: 1030, height: 640, candidates: showCandidates, mineral: exp.filter.mineral ?? null });
  const figW = doc.page.width - 2 * MARGIN;
  if (doc.y + figW * (640 / 1030) > doc.page.height - MARGIN) doc.addPage();
  root.add(
    doc.struct("Figure", { alt: `Map of the ${report.stations.length} stations in this selection with their ${showCandidates ? "confirmed and candidate" : "confirmed"} phases; the tables below list the same phases.` }, () => {
      doc.image(png, MARGIN, doc.y, { width: figW });
    }),
  );
  doc.y += figW * (640 / 1030) + 4;
  para(
    c,
    `Each station shows its phases as ring segments (share by mean wt% where estimated) around the dominant phase; ${showCandidates ? "confirmed phases are filled, candidates dashed outlines" : "confirmed phases only"}. Colours by mineral class (Paul Tol's colour-blind-safe muted scheme), shapes by mineral group, labels are IMA mineral symbols (Warr 2021). Numbers are groups of nearby stations.`,
  );
  const legend = await legendImage(report.phaseSummary.slice(0, 22).map((p) => ({ mineral: p.mineral, group: p.group })));
  if (legend) {
    const meta = await sharp(legend).metadata();
    const h = (figW * (meta.height ?? 1)) / (meta.width ?? 1);
    if (doc.y + h > doc.page.height - MARGIN) doc.addPage();
    root.add(
      doc.struct("Figure", { alt: "Legend: symbol of each mineral on the map (colour by class, shape by group)." }, () => {
        doc.image(legend, MARGIN, doc.y + 4, { width: figW });
      }),
    );
    doc.y += h + 8;
  }

  // Confirmed phases.
  heading(c, "Confirmed phases (semi-quantitative)");
  if (report.phaseSummary.length === 0) para(c, "No phase has been confirmed for these samples yet.");
  else
    await table(
      c,
      ["Mineral", "IMA", "Group", "Samples", "Mean wt%", "Range wt%"],
      [2, 0.8, 1.5, 0.9, 0.9, 1.2],
      [report.phaseSummary.map((p) => [p.mineral + (isAsbestiform(p) ? " (!)" : ""), p.symbol, p.group ?? "—", String(p.samples), formatWt(p.wtMean) || "—", p.wtMin != null ? `${formatWt(p.wtMin)}–${formatWt(p.wtMax)}` : "—"])],
    );
  if (report.candidateSummary.length) {
    doc.moveDown(0.4);
    para(c, `Unconfirmed candidates (not identifications): ${report.candidateSummary.map((x) => `${x.mineral}${isAsbestiform(x) ? " (!)" : ""} (${x.samples})`).join(", ")}.`);
  }

  // Register table, streamed.
  heading(c, "Register");
  let listed = 0;
  async function* registerRows(): AsyncGenerator<string[][]> {
    for await (const page of exp.pages()) {
      const rows: string[][] = [];
      for (const r of page as ExportRow[]) {
        if (listed >= PDF_MAX_ROWS) break;
        listed++;
        rows.push([r.code, r.stationCode ?? "—", r.sampleType.replace(/_/g, " "), r.lithology ?? "—", r.collectedAt ? formatLocalDate(r.collectedAt, r.collectedTz ?? exp.project.timeZone) : "—", phaseNames(r.confirmed) || "—", phaseNames(r.candidates) || "—"]);
      }
      yield rows;
      if (listed >= PDF_MAX_ROWS) return;
    }
  }
  await table(c, ["Code", "Station", "Type", "Lithology", "Collected (local date)", "Confirmed phases (wt%)", "Candidates (unconfirmed)"], [1.25, 1.1, 0.9, 1, 0.85, 2.1, 1.6], registerRows(), 7.5, () => drained(out));
  if (t.samples > listed) para(c, `The table lists the first ${listed} of ${t.samples} samples; the CSV and XLSX exports hold every row.`);

  // Methods.
  heading(c, "Methods");
  const m = report.methods;
  para(c, `X-ray powder diffraction of the signed-off scans: ${m.anodes.length ? m.anodes.map((a) => `${a.anode ?? "unknown anode"} Kα1 λ = ${a.wavelengthA.toFixed(5)} Å (${a.scans} scan${a.scans === 1 ? "" : "s"})`).join("; ") : "no signed-off scan in this selection"}.${m.instruments.length ? ` Instruments: ${m.instruments.join(", ")}.` : ""}`);
  if (m.processing.length) {
    doc.moveDown(0.3);
    para(c, "Processing of the current runs, as recorded with each run:");
    for (const p of m.processing) para(c, `• ${p.runs} run${p.runs === 1 ? "" : "s"} (software ${p.softwareVersion}): ${processingSentences(p.params).join(" ")}`);
  }
  doc.moveDown(0.3);
  para(c, "Phases were identified against calculated powder patterns of these reference structures; quantities are RIR (reference intensity ratio) estimates.");
  if (m.references.length)
    await table(c, ["Mineral", "Formula", "Space group", "Structure reference"], [1.2, 1.4, 1, 4], [m.references.map((r) => [r.mineral, r.formula, r.spaceGroup, `${r.citation}${r.builtin ? "" : " (imported by the lab)"}`])]);

  // Cautions.
  heading(c, "Cautions");
  para(c, IDENTIFICATION_CAVEAT);
  doc.moveDown(0.3);
  para(c, CONFIRMED_VS_CANDIDATE);
  const asbestos = [...new Set([...report.phaseSummary, ...report.candidateSummary].filter(isAsbestiform).map((p) => p.mineral))];
  if (asbestos.length) {
    doc.moveDown(0.3);
    doc.font(c.bold).fontSize(9).fillColor("#A4161A").text(c.t(`Possible asbestiform minerals in this selection (confirmed or candidate): ${asbestos.join(", ")}.`), MARGIN, doc.y, { structParent: root, structType: "P" });
    para(c, ASBESTOS_CAVEAT);
  }
  if (report.phaseSummary.some((p) => p.hazard === "crystalline_silica" || ["quartz", "cristobalite"].includes(p.mineral))) {
    doc.moveDown(0.3);
    para(c, SILICA_CAVEAT);
  }
  doc.end();
}

/** The report as chunks. */
export function writeRegisterPdf(exp: RegisterExport): AsyncGenerator<Uint8Array> {
  return fromNodeStream((out) => produce(exp, out));
}
