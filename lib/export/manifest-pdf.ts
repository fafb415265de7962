/**
 * The submission manifest as a PDF (pdfkit): what the e-mail to the lab carries as an attachment and what the lab
 * prints for the bench — the same content as the printable packing list page (header, hazards, one line per bag with
 * a check box, QA/QC, signature blocks, seals, safety notes). Returns the whole file (a manifest is a few pages).
 */
import { existsSync } from "node:fs";
import PDFDocument from "pdfkit";

export interface ManifestPdfInput {
  project: { code: string; name: string };
  submission: {
    code: string;
    requestedAnalysis: string;
    priority: string;
    hazards: string | null;
    qaqcNote: string | null;
    notes: string | null;
    labEmail: string | null;
    labAddress: string | null;
    waybill: string | null;
    /** Already formatted for the reader (project zone). */
    sentAt: string | null;
    preparedBy: string | null;
  };
  samples: { code: string; sampleType: string; stationCode: string | null; weightKg: number | null; suspectedAsbestos: boolean }[];
  seals: string[];
  /** Safety notes printed at the end (they defer to local regulations). */
  cautions: string[];
  /** When the file was made, already formatted. */
  printedAt: string;
}

const MARGIN = 40;

/** A TrueType font with Greek and symbols when the system has one (Debian: fonts-dejavu-core); else Helvetica. */
function fonts(): { regular: string; bold: string; unicode: boolean } {
  const dir = "/usr/share/fonts/truetype/dejavu";
  if (existsSync(`${dir}/DejaVuSans.ttf`) && existsSync(`${dir}/DejaVuSans-Bold.ttf`)) return { regular: `${dir}/DejaVuSans.ttf`, bold: `${dir}/DejaVuSans-Bold.ttf`, unicode: true };
  return { regular: "Helvetica", bold: "Helvetica-Bold", unicode: false };
}

/** Base-14 fonts draw WinAnsi only. */
const winAnsi = (s: string) => s.replace(/µ/g, "u").replace(/[^\u0000-\u00ff–—‘’“”•…€]/g, "?");

export function manifestPdf(input: ManifestPdfInput): Promise<Buffer> {
  const f = fonts();
  const t = f.unicode ? (s: string) => s : winAnsi;
  const doc = new PDFDocument({ size: "A4", margin: MARGIN, font: f.regular, info: { Title: `Manifest ${input.submission.code}`, Author: "Lithodex", Subject: input.project.name } });
  const chunks: Buffer[] = [];
  const done = new Promise<Buffer>((resolve, reject) => {
    doc.on("data", (c: Buffer) => chunks.push(c));
    doc.on("end", () => resolve(Buffer.concat(chunks)));
    doc.on("error", reject);
  });
  const width = doc.page.width - 2 * MARGIN;
  const s = input.submission;
  const listed = input.samples;

  doc.font(f.regular).fontSize(8).fillColor("#5F6B6D").text(t("SAMPLE SUBMISSION — PACKING LIST AND CHAIN-OF-CUSTODY FORM"), MARGIN, MARGIN);
  doc.font(f.bold).fontSize(20).fillColor("#17313A").text(t(s.code));
  doc.font(f.regular).fontSize(10).text(t(`${input.project.name} (${input.project.code})`));
  doc.moveDown(0.5);
  const facts: [string, string][] = [
    ["Lab", [s.labEmail, s.labAddress].filter(Boolean).join(" · ") || "—"],
    ["Analysis", s.requestedAnalysis],
    ["Priority", s.priority],
    ["Waybill", s.waybill ?? "________________"],
    ["Dispatched", s.sentAt ?? "—"],
    ["Prepared by", s.preparedBy ?? "—"],
    ["Printed", input.printedAt],
  ];
  for (const [k, v] of facts) {
    const y = doc.y;
    doc.font(f.bold).fontSize(9).text(t(k), MARGIN, y, { width: 90 });
    doc.font(f.regular).fontSize(9).text(t(v), MARGIN + 95, y, { width: width - 95 });
  }
  const flagged = listed.filter((x) => x.suspectedAsbestos).map((x) => x.code);
  if (s.hazards || flagged.length) {
    doc.moveDown(0.6);
    const y = doc.y;
    doc.font(f.bold).fontSize(10).fillColor("#A4262C").text(t("Hazards"), MARGIN + 6, y + 6, { width: width - 12 });
    doc.font(f.regular).fontSize(9).fillColor("#17313A").text(t(s.hazards ?? `Suspected asbestos: ${flagged.join(", ")}`), { width: width - 12 });
    doc.rect(MARGIN, y, width, doc.y - y + 6).lineWidth(1.5).stroke("#A4262C");
    doc.y += 8;
  }
  doc.moveDown(0.6);

  // The table: #, sample, type, station, weight, hazard, lab check.
  const cols = [24, 110, 95, 95, 60, 105, 26].map((w) => (w * width) / 515);
  const head = ["#", "Sample", "Type", "Station", "Weight", "Hazard", "Lab ✓"];
  const row = (cells: string[], bold: boolean) => {
    doc.font(bold ? f.bold : f.regular).fontSize(9);
    const h = Math.max(...cells.map((c, i) => doc.heightOfString(t(c), { width: cols[i] - 4 }))) + 6;
    if (doc.y + h > doc.page.height - MARGIN) {
      doc.addPage();
      if (!bold) row(head, true);
    }
    const y = doc.y;
    if (bold) doc.rect(MARGIN, y, width, h).fill("#E7EAEE");
    let x = MARGIN;
    doc.fillColor("#17313A");
    cells.forEach((c, i) => {
      doc.font(bold ? f.bold : f.regular).fontSize(9).text(t(c), x + 2, y + 3, { width: cols[i] - 4 });
      x += cols[i];
    });
    doc.moveTo(MARGIN, y + h).lineTo(MARGIN + width, y + h).lineWidth(0.3).stroke("#B8C0C4");
    doc.y = y + h;
    doc.x = MARGIN;
  };
  row(head, true);
  listed.forEach((x, i) =>
    row([String(i + 1), x.code, x.sampleType, x.stationCode ?? "—", x.weightKg != null ? `${x.weightKg.toFixed(2)} kg` : "—", x.suspectedAsbestos ? "SUSPECTED ASBESTOS" : "", f.unicode ? "☐" : "[ ]"], false),
  );
  const total = listed.reduce((a, x) => a + (x.weightKg ?? 0), 0);
  doc.font(f.bold).fontSize(9).text(t(`${listed.length} bags, approx. ${total.toFixed(2)} kg`), MARGIN, doc.y + 4, { width, align: "right" });

  doc.moveDown(0.8).font(f.bold).fontSize(10).text("QA/QC", MARGIN);
  doc.font(f.regular).fontSize(9).text(t(s.qaqcNote ?? "No QA/QC samples declared on this submission."), { width });
  if (s.notes) {
    doc.moveDown(0.4).font(f.bold).fontSize(10).text("Notes");
    doc.font(f.regular).fontSize(9).text(t(s.notes), { width });
  }
  // Signature blocks.
  if (doc.y > doc.page.height - MARGIN - 120) doc.addPage();
  doc.moveDown(0.8);
  const top = doc.y;
  const bw = (width - 16) / 3;
  ["Dispatched by (field)", "Courier", "Received by (lab)"].forEach((title, i) => {
    const x = MARGIN + i * (bw + 8);
    doc.rect(x, top, bw, 90).lineWidth(0.6).stroke("#17313A");
    doc.font(f.bold).fontSize(9).fillColor("#17313A").text(t(title), x + 6, top + 6, { width: bw - 12 });
    ["Name", "Date and time", "Signature"].forEach((l, j) => {
      const ly = top + 30 + j * 20;
      doc.font(f.regular).fontSize(8).text(t(l), x + 6, ly, { width: 60 });
      doc.moveTo(x + 66, ly + 9).lineTo(x + bw - 6, ly + 9).lineWidth(0.4).stroke("#17313A");
    });
  });
  doc.y = top + 100;
  doc.x = MARGIN;
  doc.font(f.regular).fontSize(8).text(t(`Seal / tamper-tag numbers: ${input.seals.length ? input.seals.join(", ") : "______________________"} · Condition on receipt: ______________ · Lab batch: ______________`), MARGIN, doc.y, { width });
  doc.moveDown(0.6);
  for (const c of input.cautions) doc.font(f.regular).fontSize(7.5).fillColor("#5F6B6D").text(t(c), { width }).moveDown(0.3);
  doc.end();
  return done;
}
