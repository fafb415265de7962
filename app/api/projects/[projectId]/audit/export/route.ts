import { withActor } from "@/lib/api/handler";
import { auditCsvHeader, auditCsvLines } from "@/lib/audit/diff";
import { prepareAuditExport } from "@/lib/dal/audit-log";

// GET /api/projects/:projectId/audit/export?… — the filtered audit log as CSV (RFC 4180, UTF-8 with BOM, times ISO 8601
// UTC, before/after as JSON), oldest first, streamed (audit.read)
export const GET = withActor<{ projectId: string }>({ permission: "audit.read" }, async ({ params, actor, url }) => {
  const query = Object.fromEntries([...url.searchParams].filter(([, v]) => v !== ""));
  const exp = await prepareAuditExport(actor, params.projectId, query);
  const enc = new TextEncoder();
  const it = exp.chunks();
  let started = false;
  const body = new ReadableStream<Uint8Array>({
    async pull(controller) {
      try {
        if (!started) {
          started = true;
          controller.enqueue(enc.encode(`\uFEFF${auditCsvHeader()}`));
          return;
        }
        const { value, done } = await it.next();
        if (done) controller.close();
        else controller.enqueue(enc.encode(auditCsvLines(value)));
      } catch (err) {
        console.error("audit export failed while streaming:", err);
        controller.error(err);
      }
    },
  });
  const name = `${exp.projectCode}-audit-${new Date().toISOString().slice(0, 10)}.csv`;
  return new Response(body, { headers: { "content-type": "text/csv; charset=utf-8", "content-disposition": `attachment; filename="${name}"`, "cache-control": "no-store" } });
});
