"use client";

import Link from "next/link";
import { useState } from "react";
import { Button, buttonClass } from "@/components/ui/button";
import { Card } from "@/components/ui/card";
import { inputClass } from "@/components/ui/field";
import { CSV_ENCODINGS, CSV_ENCODING_LABELS, decodeCsvBytes, type CsvEncoding } from "@/lib/csv/decode";
import type { ColumnMapping, CsvImportError, CsvImportRow } from "@/lib/csv";
import { SAMPLE_CSV_COLUMNS, type SampleCsvField } from "@/lib/csv/sample-columns";
import { ApiError, fetchJson } from "@/lib/client/fetch-json";
import { SAMPLE_TYPE_LABELS, formatDate } from "@/lib/format";
import { cn } from "@/lib/utils";

interface Preview {
  headers: string[];
  mapping: ColumnMapping;
  delimiter: string;
  decimalComma: boolean;
  rowCount: number;
  validRowCount: number;
  rows: CsvImportRow[];
  errors: CsvImportError[];
  errorCount: number;
}

type Decimal = "auto" | "point" | "comma";
const MAX_BYTES = 12_000_000;

function decimalOption(d: Decimal): boolean | "auto" {
  return d === "auto" ? "auto" : d === "comma";
}

function Step({ n, title, active, children }: { n: number; title: string; active: boolean; children: React.ReactNode }) {
  return (
    <Card className={cn(!active && "opacity-60")}>
      <h2 className="mb-3 flex items-center gap-2 font-semibold">
        <span className="flex h-6 w-6 items-center justify-center rounded-full bg-brand text-xs text-white" aria-hidden="true">
          {n}
        </span>
        {title}
      </h2>
      {children}
    </Card>
  );
}

/** Upload → preview and column mapping → errors by line → commit (all rows or none). */
export function ImportWizard({ projectId }: { projectId: string }) {
  const [file, setFile] = useState<{ name: string; text: string; bytes: Uint8Array; encoding: CsvEncoding; warning: string | null } | null>(null);
  // "detect": BOM, UTF-8 validity, then a charset detector (lib/csv/decode); otherwise the encoding chosen here.
  const [encodingChoice, setEncodingChoice] = useState<CsvEncoding | "detect">("detect");
  const [decimal, setDecimal] = useState<Decimal>("auto");
  const [timeZone, setTimeZone] = useState("");
  // Zone suggestions are filled on first focus (server and browser may know different zone lists).
  const [zones, setZones] = useState<string[]>([]);
  const [mapping, setMapping] = useState<ColumnMapping | null>(null);
  const [preview, setPreview] = useState<Preview | null>(null);
  const [busy, setBusy] = useState<"preview" | "commit" | null>(null);
  const [problem, setProblem] = useState<string | null>(null);
  const [done, setDone] = useState<{ imported: number; firstCode: string | null; lastCode: string | null } | null>(null);

  async function runPreview(text: string, map: ColumnMapping | null, dec: Decimal, tz = timeZone) {
    setBusy("preview");
    setProblem(null);
    try {
      const p = await fetchJson<Preview>(`/api/projects/${projectId}/samples/import?mode=preview`, {
        method: "POST",
        json: { csv: text, decimalComma: decimalOption(dec), timeZone: tz.trim() || null, ...(map && { mapping: map }) },
      });
      setPreview(p);
      setMapping(p.mapping);
    } catch (err) {
      setPreview(null);
      setProblem(err instanceof ApiError ? [err.message, ...Object.values(err.fields ?? {}).flat()].join(" ") : "The preview failed; check your connection and try again.");
    } finally {
      setBusy(null);
    }
  }

  async function onFile(f: File | undefined) {
    setDone(null);
    setPreview(null);
    setMapping(null);
    if (!f) return setFile(null);
    if (f.size > MAX_BYTES) {
      setFile(null);
      return setProblem(`${f.name} is ${(f.size / 1e6).toFixed(1)} MB; import at most ${MAX_BYTES / 1e6} MB at a time (split the file).`);
    }
    await readBytes(f.name, new Uint8Array(await f.arrayBuffer()), encodingChoice);
  }

  async function readBytes(name: string, bytes: Uint8Array, choice: CsvEncoding | "detect") {
    const decoded = decodeCsvBytes(bytes, choice === "detect" ? null : choice);
    if (!decoded.ok) {
      setFile(null);
      setPreview(null);
      return setProblem(`${name}: ${decoded.message}`);
    }
    setFile({ name, text: decoded.text, bytes, encoding: decoded.encoding, warning: decoded.warning });
    await runPreview(decoded.text, null, decimal);
  }

  async function commit() {
    if (!file || !preview) return;
    setBusy("commit");
    setProblem(null);
    try {
      const r = await fetchJson<{ imported: number; firstCode: string | null; lastCode: string | null }>(`/api/projects/${projectId}/samples/import?mode=commit`, {
        method: "POST",
        json: { csv: file.text, decimalComma: decimalOption(decimal), timeZone: timeZone.trim() || null, ...(mapping && { mapping }) },
      });
      setDone(r);
    } catch (err) {
      if (err instanceof ApiError && Array.isArray(err.details?.errors)) {
        setPreview({ ...preview, errors: err.details.errors as CsvImportError[], errorCount: Number(err.details.errorCount ?? 0) });
      }
      setProblem(err instanceof ApiError ? err.message : "The import failed; nothing was written. Try again.");
    } finally {
      setBusy(null);
    }
  }

  const usedFields = new Set(Object.values(mapping ?? {}).filter(Boolean));
  const canCommit = !!preview && preview.errorCount === 0 && preview.validRowCount > 0 && !busy && !done;

  if (done) {
    return (
      <Card>
        <h2 className="text-lg font-semibold" role="status">
          Imported {done.imported} sample{done.imported === 1 ? "" : "s"}
          {done.firstCode && ` (${done.firstCode} … ${done.lastCode})`}.
        </h2>
        <div className="mt-3 flex gap-2">
          <Link className={buttonClass("primary")} href={`/projects/${projectId}/samples`}>
            Open the register
          </Link>
          <Button variant="secondary" onClick={() => (setDone(null), setFile(null), setPreview(null))}>
            Import another file
          </Button>
        </div>
      </Card>
    );
  }

  return (
    <div className="space-y-4">
      <Step n={1} title="Choose a CSV file" active>
        <div className="grid gap-3 md:grid-cols-[2fr_1fr_1fr_1fr]">
          <label className="text-sm">
            <span className="mb-1 block font-medium">File (CSV, header row first; UTF-8 preferred)</span>
            <input type="file" accept=".csv,text/csv,text/plain" className={inputClass} onChange={(e) => onFile(e.target.files?.[0])} />
          </label>
          <label className="text-sm">
            <span className="mb-1 block font-medium">Text encoding</span>
            <select
              className={inputClass}
              value={encodingChoice}
              onChange={(e) => {
                const c = e.target.value as CsvEncoding | "detect";
                setEncodingChoice(c);
                if (file) void readBytes(file.name, file.bytes, c);
              }}
            >
              <option value="detect">Detect (UTF-8 unless the file says otherwise)</option>
              {CSV_ENCODINGS.map((enc) => (
                <option key={enc} value={enc}>
                  {CSV_ENCODING_LABELS[enc]}
                </option>
              ))}
            </select>
          </label>
          <label className="text-sm">
            <span className="mb-1 block font-medium">Decimal separator</span>
            <select
              className={inputClass}
              value={decimal}
              onChange={(e) => {
                const d = e.target.value as Decimal;
                setDecimal(d);
                if (file) void runPreview(file.text, mapping, d);
              }}
            >
              <option value="auto">Automatic (comma when the file uses “;”)</option>
              <option value="point">Point (37.5)</option>
              <option value="comma">Comma (37,5)</option>
            </select>
          </label>
          <label className="text-sm">
            <span className="mb-1 block font-medium">Time zone of local times (optional)</span>
            <input
              className={inputClass}
              list="iana-zones"
              placeholder="e.g. Europe/Madrid"
              value={timeZone}
              onChange={(e) => setTimeZone(e.target.value)}
              onFocus={() => zones.length === 0 && typeof Intl.supportedValuesOf === "function" && setZones(Intl.supportedValuesOf("timeZone"))}
              onBlur={() => file && runPreview(file.text, mapping, decimal, timeZone)}
            />
            <datalist id="iana-zones">
              {zones.map((z) => (
                <option key={z} value={z} />
              ))}
            </datalist>
          </label>
        </div>
        <p className="mt-2 text-xs text-muted">
          Coordinates in WGS84 decimal degrees (lat, lon). Dates as ISO 8601 with offset (2026-03-14T10:05:00+01:00), or local time with a collected_tz column or the time zone chosen here. Rows without a code get the next
          project codes. The easiest template is an export of the register.
        </p>
      </Step>

      {file?.warning && (
        <p role="status" className="rounded-md border border-amber-300 bg-amber-50 px-3 py-2 text-sm text-amber-900">
          {file.warning}
        </p>
      )}
      {problem && (
        <p role="alert" className="rounded-md bg-red-50 px-3 py-2 text-sm text-danger">
          {problem}
        </p>
      )}
      {busy === "preview" && <p className="text-sm text-muted" role="status">Checking the file…</p>}

      {preview && mapping && (
        <>
          <Step n={2} title="Match columns to register fields" active>
            <p className="mb-2 text-sm text-muted">
              {file?.name}: {preview.rowCount} {preview.rowCount === 1 ? "row" : "rows"}, {file ? CSV_ENCODING_LABELS[file.encoding] : ""}, separator “{preview.delimiter}”, decimal {preview.decimalComma ? "comma" : "point"}.
            </p>
            <div className="grid gap-2 sm:grid-cols-2 lg:grid-cols-3">
              {preview.headers.map((h, i) => (
                <label key={`${h}-${i}`} className="flex items-center gap-2 text-sm">
                  <span className="w-36 truncate font-mono" title={h}>
                    {h || "(blank)"}
                  </span>
                  <span aria-hidden="true">→</span>
                  <select
                    aria-label={`Field for column ${h}`}
                    className={cn(inputClass, "py-1")}
                    value={mapping[h] ?? ""}
                    onChange={(e) => setMapping({ ...mapping, [h]: (e.target.value || null) as SampleCsvField | null })}
                  >
                    <option value="">— ignore —</option>
                    {SAMPLE_CSV_COLUMNS.map((c) => (
                      <option key={c.field} value={c.field} disabled={usedFields.has(c.field) && mapping[h] !== c.field}>
                        {c.label}
                      </option>
                    ))}
                  </select>
                </label>
              ))}
            </div>
            <Button variant="secondary" className="mt-3" disabled={!!busy} onClick={() => file && runPreview(file.text, mapping, decimal)}>
              Check again with this mapping
            </Button>
          </Step>

          <Step n={3} title={preview.errorCount ? `Fix ${preview.errorCount} problem${preview.errorCount === 1 ? "" : "s"}` : "No problems found"} active>
            {preview.errorCount > 0 ? (
              <>
                <p className="mb-2 text-sm">Nothing is imported until every row is valid. Line numbers count the header as line 1, as in a spreadsheet.</p>
                <ul className="max-h-72 space-y-1 overflow-y-auto text-sm" aria-label="Problems by line" data-testid="import-errors">
                  {preview.errors.map((e, i) => (
                    <li key={i} className="rounded bg-red-50 px-2 py-1">
                      <span className="font-medium">Line {e.line}</span>
                      {e.column && <span className="font-mono"> · {e.column}</span>}: {e.message}
                    </li>
                  ))}
                </ul>
                {preview.errorCount > preview.errors.length && <p className="mt-1 text-xs text-muted">Showing the first {preview.errors.length}.</p>}
              </>
            ) : (
              <p className="text-sm text-ok">{preview.validRowCount === 1 ? "The row is valid." : `All ${preview.validRowCount} rows are valid.`}</p>
            )}
            {preview.rows.length > 0 && (
              <div className="mt-3 overflow-x-auto rounded border border-line">
                <table className="w-full min-w-[640px] text-sm">
                  <caption className="px-2 py-1 text-left text-xs text-muted">
                    {preview.rows.length === 1 ? "The valid row as it will be stored" : `First ${preview.rows.length} valid rows as they will be stored`}
                  </caption>
                  <thead className="bg-stone text-left text-xs uppercase text-muted">
                    <tr>
                      {["Line", "Code", "Type", "Station", "Lat", "Lon", "Collected", "Lithology"].map((h) => (
                        <th key={h} className="px-2 py-1 font-medium">
                          {h}
                        </th>
                      ))}
                    </tr>
                  </thead>
                  <tbody>
                    {preview.rows.map((r) => (
                      <tr key={r.line} className="border-t border-line">
                        <td className="px-2 py-1 text-muted">{r.line}</td>
                        <td className="px-2 py-1 font-mono">{r.sample.code ?? <span className="text-muted">next code</span>}</td>
                        <td className="px-2 py-1">{SAMPLE_TYPE_LABELS[r.sample.sampleType]}</td>
                        <td className="px-2 py-1">{r.stationCode ?? "—"}</td>
                        <td className="px-2 py-1 tabular-nums">{r.sample.lat?.toFixed(6) ?? "—"}</td>
                        <td className="px-2 py-1 tabular-nums">{r.sample.lon?.toFixed(6) ?? "—"}</td>
                        <td className="px-2 py-1">{formatDate(r.sample.collectedAt)}</td>
                        <td className="px-2 py-1">{r.sample.lithology ?? "—"}</td>
                      </tr>
                    ))}
                  </tbody>
                </table>
              </div>
            )}
          </Step>

          <Step n={4} title="Import" active={canCommit}>
            <p className="mb-3 text-sm">
              {Object.values(mapping).includes("code") ? "Codes come from the file." : "Every row gets the next code of the project sequence."} All rows are written
              together, or none.
            </p>
            <Button onClick={commit} disabled={!canCommit}>
              {busy === "commit" ? "Importing…" : `Import ${preview.validRowCount} sample${preview.validRowCount === 1 ? "" : "s"}`}
            </Button>
          </Step>
        </>
      )}
    </div>
  );
}
