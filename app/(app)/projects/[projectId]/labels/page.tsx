import type { Metadata } from "next";
import { headers } from "next/headers";
import Link from "next/link";
import QRCode from "qrcode";
import { Suspense } from "react";
import { AppError } from "@/lib/dal/errors";
import { listSampleLabels } from "@/lib/dal/sample-labels";
import { currentActor } from "@/lib/dal/session";
import { SAMPLE_TYPE_LABELS } from "@/lib/format";
import { PrintControls } from "./print-controls";

export const metadata: Metadata = { title: "Sample labels" };

/** A4 portrait label sheets (210 × 297 mm), edge to edge. 70 × 37 mm 3 × 8 is a common stock size (common practice). */
const LAYOUTS = {
  "3x8": { label: "A4, 3 × 8 labels (70 × 37 mm)", cols: 3, rows: 8 },
  "3x7": { label: "A4, 3 × 7 labels (70 × 42.4 mm)", cols: 3, rows: 7 },
  "2x7": { label: "A4, 2 × 7 labels (105 × 42.4 mm)", cols: 2, rows: 7 },
} as const;
type LayoutId = keyof typeof LAYOUTS;

function localDate(iso: string | null, tz: string | null): string {
  if (!iso) return "date —";
  const d = new Date(iso);
  if (Number.isNaN(d.getTime())) return iso.slice(0, 10);
  return new Intl.DateTimeFormat("en-CA", { timeZone: tz || "UTC", year: "numeric", month: "2-digit", day: "2-digit" }).format(d);
}

async function origin(): Promise<string> {
  const h = await headers();
  const host = h.get("x-forwarded-host") ?? h.get("host");
  if (host) return `${h.get("x-forwarded-proto") ?? (host.startsWith("localhost") || host.startsWith("127.") ? "http" : "https")}://${host}`;
  return process.env.BETTER_AUTH_URL || "http://localhost:3000";
}

export default async function LabelsPage({ params, searchParams }: { params: Promise<{ projectId: string }>; searchParams: Promise<Record<string, string | string[] | undefined>> }) {
  const { projectId } = await params;
  const sp = await searchParams;
  const one = (k: string) => (Array.isArray(sp[k]) ? sp[k][0] : sp[k]);
  const actor = await currentActor();
  const layoutId: LayoutId = (one("layout") as LayoutId) in LAYOUTS ? (one("layout") as LayoutId) : "3x8";
  const layout = LAYOUTS[layoutId];
  const perSheet = layout.cols * layout.rows;
  const skip = Math.min(perSheet - 1, Math.max(0, Math.floor(Number(one("skip") ?? 0)) || 0));

  const ids = one("ids");
  const query = Object.fromEntries(Object.entries(sp).filter(([k, v]) => !["ids", "layout", "skip"].includes(k) && typeof v === "string" && v !== "")) as Record<string, string>;
  let result: Awaited<ReturnType<typeof listSampleLabels>> | null = null;
  let problem: string | null = null;
  try {
    result = await listSampleLabels(actor, projectId, ids !== undefined ? { ids: ids.split(",").filter(Boolean) } : { query });
  } catch (err) {
    if (!(err instanceof AppError) || err.code !== "validation_failed") throw err;
    problem = [err.message, ...Object.values(err.fields ?? {}).flat()].join(" ");
  }

  const base = await origin();
  const labels = result
    ? await Promise.all(
        result.labels.map(async (l) => ({
          ...l,
          qr: await QRCode.toString(`${base}/projects/${projectId}/samples/${l.id}`, { type: "svg", margin: 1, errorCorrectionLevel: "M" }),
        })),
      )
    : [];
  const cells: (typeof labels[number] | null)[] = [...Array.from({ length: skip }, () => null), ...labels];
  const sheets: (typeof cells)[] = [];
  for (let i = 0; i < cells.length; i += perSheet) sheets.push(cells.slice(i, i + perSheet));
  const cellW = 210 / layout.cols;
  const cellH = 297 / layout.rows;

  return (
    <div className="space-y-4">
      <style>{`
        @page { size: A4 portrait; margin: 0; }
        .label-sheet { width: 210mm; height: 297mm; display: grid; grid-template-columns: repeat(${layout.cols}, ${cellW}mm); grid-template-rows: repeat(${layout.rows}, ${cellH}mm); background: white; box-sizing: border-box; }
        .label-cell { box-sizing: border-box; padding: 2.5mm 3mm; overflow: hidden; display: flex; gap: 2.5mm; align-items: center; }
        .label-qr svg { width: ${Math.min(cellH - 8, 24)}mm; height: ${Math.min(cellH - 8, 24)}mm; display: block; }
        @media screen { .label-sheet { outline: 1px solid var(--color-line); margin-bottom: 8mm; } .label-cell { outline: 1px dashed #d6d3cc; } }
        @media print {
          body * { visibility: hidden; }
          .label-sheets, .label-sheets * { visibility: visible; }
          .label-sheets { position: absolute; left: 0; top: 0; }
          .label-sheet { break-after: page; }
          .label-sheet:last-child { break-after: auto; }
        }
      `}</style>
      <div className="no-print space-y-3">
        <nav className="text-sm text-muted">
          <Link href={`/projects/${projectId}/samples`} className="hover:underline">
            Sample register
          </Link>{" "}
          / Labels
        </nav>
        <h1 className="text-2xl font-semibold">Sample labels</h1>
        {problem && (
          <p role="alert" className="rounded-md bg-red-50 px-3 py-2 text-sm text-danger">
            {problem}
          </p>
        )}
        {result?.truncated && (
          <p role="alert" className="rounded-md bg-oxide-light px-3 py-2 text-sm">
            Only the first {labels.length} labels are shown; narrow the filter to print the rest.
          </p>
        )}
        {result && labels.length === 0 && <p className="text-sm text-muted">No samples to label. Select samples in the register first.</p>}
        <Suspense>
          <PrintControls count={labels.length} layouts={Object.entries(LAYOUTS).map(([id, l]) => ({ id, label: l.label }))} />
        </Suspense>
        <p className="text-xs text-muted">Each QR code opens the sample&apos;s page; signing in is needed to see it.</p>
      </div>
      <div className="label-sheets overflow-x-auto" data-testid="label-sheets">
        {sheets.map((sheet, si) => (
          <div className="label-sheet" key={si} aria-label={`Sheet ${si + 1}`}>
            {sheet.map((l, i) =>
              l ? (
                <div className="label-cell" key={l.id} data-testid="label">
                  <div className="label-qr shrink-0" dangerouslySetInnerHTML={{ __html: l.qr }} />
                  <div className="min-w-0 text-[2.9mm] leading-tight text-black">
                    <p className="truncate font-mono text-[4.2mm] font-bold tracking-tight">{l.code}</p>
                    <p className="truncate">{result!.project.code} · {result!.project.name}</p>
                    <p>{localDate(l.collectedAt, l.collectedTz)}</p>
                    {l.stationCode && <p className="truncate">Stn {l.stationCode}</p>}
                    <p className="truncate">{SAMPLE_TYPE_LABELS[l.sampleType as keyof typeof SAMPLE_TYPE_LABELS] ?? l.sampleType}</p>
                    {l.suspectedAsbestos && <p className="font-bold">⚠ Suspected asbestos</p>}
                  </div>
                </div>
              ) : (
                <div className="label-cell" key={`skip-${i}`} aria-hidden="true" />
              ),
            )}
          </div>
        ))}
      </div>
    </div>
  );
}
