import { BODY_LIMITS } from "@/lib/api/body";
import { parseJson, withActor } from "@/lib/api/handler";
import { AppError } from "@/lib/dal/errors";
import { commitSampleImport, previewSampleImport } from "@/lib/dal/sample-import";

// POST /api/projects/:projectId/samples/import?mode=preview|commit — body {csv, mapping?, decimalComma?}; preview returns rows, mapping and errors by line; commit imports all rows or none (lead, field geologist)
export const POST = withActor<{ projectId: string }>({ permission: "sample.write", body: { kind: "json", maxBytes: BODY_LIMITS.csvImport, label: "a CSV import" } }, async ({ actor, params, req, url }) => {
  const mode = url.searchParams.get("mode") ?? "preview";
  if (mode !== "preview" && mode !== "commit") throw new AppError("validation_failed", "Some query parameters are not valid.", { mode: ["mode must be preview or commit."] });
  const body = await parseJson(req);
  if (mode === "preview") return previewSampleImport(actor, params.projectId, body);
  return Response.json(await commitSampleImport(actor, params.projectId, body), { status: 201 });
});
