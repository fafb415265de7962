import { withActor } from "@/lib/api/handler";
import { sampleCsvHeaderLine, sampleCsvLines } from "@/lib/csv";
import { prepareSampleExport } from "@/lib/dal/sample-export";
import { AppError } from "@/lib/dal/errors";
import { FEATURE_COLLECTION_END, FEATURE_COLLECTION_START, sampleFeature } from "@/lib/export/sample-geojson";

const FORMATS = {
  csv: { type: "text/csv; charset=utf-8", ext: "csv" },
  geojson: { type: "application/geo+json", ext: "geojson" },
} as const;

// GET /api/projects/:projectId/samples/export?format=csv|geojson&<register filters> — the filtered register as CSV or GeoJSON, streamed (any member)
export const GET = withActor<{ projectId: string }>(async ({ actor, params, url }) => {
  const format = (url.searchParams.get("format") ?? "csv") as keyof typeof FORMATS;
  if (!(format in FORMATS)) throw new AppError("validation_failed", "Some query parameters are not valid.", { format: ["format must be csv or geojson."] });
  const query: Record<string, string> = {};
  url.searchParams.forEach((v, k) => {
    if (v !== "" && k !== "format" && k !== "download") query[k] = v;
  });
  const exp = await prepareSampleExport(actor, params.projectId, query);
  const samplesUrl = `${url.origin}/projects/${params.projectId}/samples`;
  const enc = new TextEncoder();
  const pages = exp.pages();
  let first = true;
  let started = false;

  const body = new ReadableStream<Uint8Array>({
    async pull(controller) {
      try {
        if (!started) {
          started = true;
          // UTF-8 byte-order mark so spreadsheet programs read accented names correctly (common practice).
          controller.enqueue(enc.encode(format === "csv" ? `\uFEFF${sampleCsvHeaderLine()}` : FEATURE_COLLECTION_START));
          return;
        }
        const { value, done } = await pages.next();
        if (done) {
          if (format === "geojson") controller.enqueue(enc.encode(FEATURE_COLLECTION_END));
          controller.close();
          return;
        }
        if (format === "csv") controller.enqueue(enc.encode(sampleCsvLines(value)));
        else {
          const text = value.map((r) => JSON.stringify(sampleFeature(r, `${samplesUrl}/${r.id}`))).join(",\n");
          controller.enqueue(enc.encode(`${first ? "\n" : ",\n"}${text}`));
          first = false;
        }
      } catch (err) {
        controller.error(err);
      }
    },
    async cancel() {
      await pages.return(undefined);
    },
  });

  const date = new Date().toISOString().slice(0, 10);
  const name = `${exp.projectCode}-samples-${date}.${FORMATS[format].ext}`;
  return new Response(body, {
    headers: {
      "content-type": FORMATS[format].type,
      "content-disposition": `attachment; filename="${name}"`,
      "cache-control": "no-store",
      "x-content-type-options": "nosniff",
    },
  });
});
