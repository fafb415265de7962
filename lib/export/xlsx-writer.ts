/**
 * Register workbook (Office Open XML, .xlsx) written with exceljs's streaming WorkbookWriter: an "About"
 * sheet (project, filter, caveats), "Register" (one row per sample) and "Phases" (one row per sample
 * phase). Cells are typed: numbers as numbers, instants as dates (UTC), yes/no as booleans. Rows are
 * committed as they are written, so memory stays bounded; the phases sheet reads the register again.
 */
import ExcelJS from "exceljs";
import type { PassThrough } from "node:stream";
import { ASBESTOS_CAVEAT, CONFIRMED_VS_CANDIDATE, IDENTIFICATION_CAVEAT } from "./caveats";
import { describeFilter } from "./filter-text";
import { drained, fromNodeStream } from "./node-stream";
import { phaseNames, phaseSymbols } from "./phase-text";
import type { ExportRow, RegisterExport } from "./types";

type Kind = "text" | "number" | "date" | "boolean";
interface Col {
  header: string;
  key: string;
  width: number;
  kind: Kind;
  numFmt?: string;
  value: (r: ExportRow) => string | number | boolean | Date | null;
}

const date = (iso: string | null) => {
  if (!iso) return null;
  const d = new Date(iso);
  return Number.isNaN(d.getTime()) ? null : d;
};

/** Register sheet columns, in order. */
export const XLSX_REGISTER_COLUMNS: readonly Col[] = [
  { header: "Code", key: "code", width: 14, kind: "text", value: (r) => r.code },
  { header: "IGSN", key: "igsn", width: 16, kind: "text", value: (r) => r.igsn },
  { header: "Station", key: "station_code", width: 14, kind: "text", value: (r) => r.stationCode },
  { header: "Sample type", key: "sample_type", width: 14, kind: "text", value: (r) => r.sampleType },
  { header: "Lithology", key: "lithology", width: 16, kind: "text", value: (r) => r.lithology },
  { header: "Alteration", key: "alteration", width: 16, kind: "text", value: (r) => r.alteration },
  { header: "Alteration intensity", key: "alteration_intensity", width: 12, kind: "text", value: (r) => r.alterationIntensity },
  { header: "Collected (UTC)", key: "collected_at", width: 17, kind: "date", numFmt: "yyyy-mm-dd hh:mm", value: (r) => date(r.collectedAt) },
  { header: "Time zone", key: "collected_tz", width: 16, kind: "text", value: (r) => r.collectedTz },
  { header: "Collector", key: "collector", width: 16, kind: "text", value: (r) => r.collectorName },
  { header: "Latitude (WGS84 °)", key: "lat", width: 12, kind: "number", numFmt: "0.000000", value: (r) => r.lat ?? r.stationLat },
  { header: "Longitude (WGS84 °)", key: "lon", width: 12, kind: "number", numFmt: "0.000000", value: (r) => r.lon ?? r.stationLon },
  { header: "Position from", key: "position_source", width: 10, kind: "text", value: (r) => (r.lat != null && r.lon != null ? "sample" : r.stationLat != null ? "station" : null) },
  { header: "Elevation (m)", key: "elevation_m", width: 10, kind: "number", numFmt: "0.0", value: (r) => r.elevationM },
  { header: "Horizontal accuracy (m)", key: "horizontal_accuracy_m", width: 10, kind: "number", numFmt: "0.0", value: (r) => r.horizontalAccuracyM },
  { header: "Status", key: "status", width: 12, kind: "text", value: (r) => r.status },
  { header: "Suspected asbestos", key: "suspected_asbestos", width: 10, kind: "boolean", value: (r) => r.suspectedAsbestos },
  { header: "Weight (kg)", key: "weight_kg", width: 9, kind: "number", numFmt: "0.00", value: (r) => r.weightKg },
  { header: "Confirmed phases (wt%)", key: "confirmed_phases", width: 32, kind: "text", value: (r) => phaseNames(r.confirmed) || null },
  { header: "Confirmed (IMA symbols)", key: "confirmed_symbols", width: 20, kind: "text", value: (r) => phaseSymbols(r.confirmed) || null },
  { header: "Candidates — unconfirmed", key: "candidate_phases_unconfirmed", width: 28, kind: "text", value: (r) => phaseNames(r.candidates) || null },
  { header: "Description", key: "description", width: 40, kind: "text", value: (r) => r.description },
  { header: "Storage", key: "storage_location", width: 14, kind: "text", value: (r) => r.storageLocation },
];

const PHASE_COLUMNS = [
  { header: "Sample", key: "code", width: 14 },
  { header: "Mineral", key: "mineral", width: 16 },
  { header: "IMA symbol", key: "symbol", width: 8 },
  { header: "Group", key: "group", width: 14 },
  { header: "Status", key: "status", width: 22 },
  { header: "wt% (semi-quantitative)", key: "wt", width: 12, style: { numFmt: "0.0" } },
  { header: "Candidate rank", key: "rank", width: 8 },
  { header: "Scan", key: "scan", width: 38 },
  { header: "Hazard", key: "hazard", width: 16 },
];

/** Bytes a worksheet may have waiting for the zip compressor before the writer pauses. */
const SHEET_BACKLOG = 1 << 20;

/**
 * exceljs 4.4's worksheet stream (StreamBuf) ignores backpressure: rows written faster than the zip
 * deflates them pile up, uncompressed, in the PassThrough it is piped into. Wait until that backlog is
 * small again. Reads stream internals (`writableLength`, or `_writableState.length` in the
 * readable-stream copy archiver uses); re-check when upgrading exceljs.
 */
async function sheetBackpressure(ws: unknown): Promise<void> {
  const pipes = (ws as { stream?: { pipes?: { writableLength?: number; _writableState?: { length: number } }[] } }).stream?.pipes ?? [];
  const backlog = () => pipes.reduce((n, p) => n + (p.writableLength ?? p._writableState?.length ?? 0), 0);
  while (backlog() > SHEET_BACKLOG) await new Promise((r) => setTimeout(r, 1));
}

async function produce(exp: RegisterExport, out: PassThrough): Promise<void> {
  const wb = new ExcelJS.stream.xlsx.WorkbookWriter({ stream: out, useStyles: true, useSharedStrings: false });
  wb.creator = "Lithodex";
  wb.created = exp.generatedAt;

  const about = wb.addWorksheet("About");
  about.columns = [
    { key: "k", width: 22 },
    { key: "v", width: 110 },
  ];
  const info: [string, string | Date][] = [
    ["Project", `${exp.project.name} (${exp.project.code})`],
    ["Region", exp.project.region ?? "—"],
    ["Exported (UTC)", exp.generatedAt],
    [exp.source.kind === "member" ? "Exported by" : "Shared link", exp.source.kind === "member" ? exp.source.name : `${exp.source.label ?? "read-only link"}, valid until ${exp.source.expiresAt.toISOString()}`],
    ["Filter", describeFilter(exp.filter)],
    ["Confirmed vs candidate", CONFIRMED_VS_CANDIDATE],
    ["Limits of automated identification", IDENTIFICATION_CAVEAT],
    ["Asbestiform minerals", ASBESTOS_CAVEAT],
    ["Coordinates", "WGS84 decimal degrees; a sample without its own position shows its station's (column 'Position from')."],
  ];
  for (const [k, v] of info) {
    const row = about.addRow({ k, v });
    row.getCell(1).font = { bold: true };
    if (v instanceof Date) row.getCell(2).numFmt = "yyyy-mm-dd hh:mm:ss";
    row.getCell(2).alignment = { wrapText: true, vertical: "top" };
    row.commit();
  }
  about.commit();

  let written = 0;
  const reg = wb.addWorksheet("Register", { views: [{ state: "frozen", ySplit: 1 }] });
  reg.columns = XLSX_REGISTER_COLUMNS.map((c) => ({ header: c.header, key: c.key, width: c.width, ...(c.numFmt ? { style: { numFmt: c.numFmt } } : {}) }));
  reg.getRow(1).font = { bold: true };
  // The header row is text: without this it inherits each column's number format, and readers that go by the
  // style (GDAL's XLSX driver) read "Collected (UTC)" as the date 1899-12-30 and lose the header row.
  reg.getRow(1).eachCell((c) => (c.numFmt = "@"));
  reg.getRow(1).commit();
  for await (const page of exp.pages()) {
    for (const r of page) {
      const values: Record<string, string | number | boolean | Date | null> = {};
      for (const c of XLSX_REGISTER_COLUMNS) {
        // Text is stored as text, unchanged: an XLSX string cell (t="inlineStr"/"s") is never evaluated, so no
        // formula guard (that is a CSV concern, lib/csv/formula-guard) and no visible apostrophe.
        values[c.key] = c.value(r);
      }
      reg.addRow(values).commit();
      if (++written % 200 === 0) await sheetBackpressure(reg);
    }
    await sheetBackpressure(reg);
    await drained(out);
  }
  reg.commit();

  const ph = wb.addWorksheet("Phases", { views: [{ state: "frozen", ySplit: 1 }] });
  ph.columns = PHASE_COLUMNS;
  ph.getRow(1).font = { bold: true };
  ph.getRow(1).commit();
  for await (const page of exp.pages()) {
    for (const r of page) {
      for (const p of [...r.confirmed, ...r.candidates]) {
        ph.addRow({
          code: r.code,
          mineral: p.mineral,
          symbol: p.symbol,
          group: p.group,
          status: p.kind === "confirmed" ? "confirmed" : "candidate (unconfirmed)",
          wt: p.wtPercent,
          rank: p.rank,
          scan: p.scanId,
          hazard: p.hazard,
        }).commit();
        if (++written % 200 === 0) await sheetBackpressure(ph);
      }
    }
    await sheetBackpressure(ph);
    await drained(out);
  }
  ph.commit();
  await wb.commit();
}

/** The workbook as chunks. */
export function writeRegisterXlsx(exp: RegisterExport): AsyncGenerator<Uint8Array> {
  return fromNodeStream((out) => produce(exp, out));
}
