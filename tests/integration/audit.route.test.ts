import { readdirSync, readFileSync, statSync } from "node:fs";
import { join } from "node:path";
import Papa from "papaparse";
import { eq } from "drizzle-orm";
import { beforeAll, describe, expect, test } from "vitest";
import { GET as auditRoute } from "@/app/api/projects/[projectId]/audit/route";
import { GET as auditExportRoute } from "@/app/api/projects/[projectId]/audit/export/route";
import { POST as createSampleRoute } from "@/app/api/projects/[projectId]/samples/route";
import { PATCH as patchSampleRoute } from "@/app/api/projects/[projectId]/samples/[sampleId]/route";
import { getDb } from "@/db";
import { auditLog } from "@/db/schema";
import * as auditWriter from "@/lib/dal/audit";
import * as auditReader from "@/lib/dal/audit-log";
import { call, makeWorld, type World } from "../helpers/app";

// Issue 11 §4: the audit log has a page and an API for audit.read (lead, consultant, site admin), filterable by record,
// person, action and date, exportable as CSV with before/after values; it is append-only.

let w: World;
let sampleId = "";
let sampleCode = "";
const P = () => ({ projectId: w.projectId });
const get = (cookie: string | undefined, query = "") => call(auditRoute, { path: `/api/projects/x/audit${query}`, params: P(), cookie });

beforeAll(async () => {
  w = await makeWorld();
  const made = await call(createSampleRoute, { method: "POST", params: P(), cookie: w.cookies.field_geologist, body: { sampleType: "chip", lithology: "gossan" } });
  sampleId = made.json.id;
  sampleCode = made.json.code;
  const edit = await call(patchSampleRoute, { method: "PATCH", params: { ...P(), sampleId }, cookie: w.cookies.lead, body: { version: 1, lithology: "=HYPERLINK(\"x\")" } });
  expect(edit.status).toBe(200);
  // An older entry, written as the app writes them (insert only), to filter by date.
  await getDb().insert(auditLog).values({ projectId: w.projectId, actorId: w.userIds.lead, action: "update", entity: "project", entityId: w.projectId, beforeJson: { name: "Old" }, afterJson: { name: "New" }, createdAt: new Date("2026-01-15T12:00:00Z") });
});

describe("who may read it", () => {
  test("lead, consultant and site admin read it; field geologist and lab analyst get 403; others 404; no session 401", async () => {
    for (const who of ["lead", "consultant", "admin"] as const) expect((await get(w.cookies[who])).status, who).toBe(200);
    for (const who of ["field_geologist", "lab_analyst"] as const) expect((await get(w.cookies[who])).status, who).toBe(403);
    expect((await get(w.cookies.outsider)).status).toBe(404);
    expect((await get(undefined)).status).toBe(401);
    const csv = (cookie?: string) => call(auditExportRoute, { path: "/api/projects/x/audit/export", params: P(), cookie });
    expect((await csv(w.cookies.consultant)).status).toBe(200);
    expect((await csv(w.cookies.lab_analyst)).status).toBe(403);
  });
});

describe("entries, filters and before/after", () => {
  test("an edit shows the changed field before and after, with the person and the record's code", async () => {
    const r = await get(w.cookies.consultant, `?entity=sample&entityId=${sampleId}`);
    expect(r.status).toBe(200);
    const actions = r.json.items.map((e: { action: string }) => e.action);
    expect(actions).toEqual(["update", "create"]);
    const [edit] = r.json.items;
    expect(edit).toMatchObject({ record: sampleCode, entity: "sample" });
    expect(edit.actorName).toMatch(/^lead \d+$/);
    expect(edit.actorId).toBe(w.userIds.lead);
    expect(edit.changes).toEqual([{ field: "lithology", before: "gossan", after: '=HYPERLINK("x")' }]);
  });

  test("filters by person, by action family, by date; a bad date is 422 naming the field", async () => {
    const byField = await get(w.cookies.lead, `?actorId=${w.userIds.field_geologist}`);
    expect(byField.json.items.length).toBeGreaterThan(0);
    expect(byField.json.items.every((e: { actorId: string }) => e.actorId === w.userIds.field_geologist)).toBe(true);
    const custody = await get(w.cookies.lead, "?action=custody");
    expect(custody.json.items.length).toBe(0); // a sample created as collected writes its event with the create entry
    const creates = await get(w.cookies.lead, "?action=create&entity=sample");
    expect(creates.json.total).toBe(1);
    const january = await get(w.cookies.lead, "?from=2026-01-01&to=2026-01-31");
    expect(january.json.items.map((e: { entity: string }) => e.entity)).toEqual(["project"]);
    expect(january.json.items[0].changes).toEqual([{ field: "name", before: "Old", after: "New" }]);
    const bad = await get(w.cookies.lead, "?from=2026-13-01");
    expect(bad.status).toBe(422);
    expect(Object.keys(bad.json.error.fields)).toEqual(["from"]);
    const backwards = await get(w.cookies.lead, "?from=2026-02-01&to=2026-01-01");
    expect(backwards.json.error.fields.to).toEqual(["The end date is before the start date."]);
  });

  test("the filter menus list the people, record types and actions found", async () => {
    const r = await get(w.cookies.lead);
    expect(r.json.facets.people.map((p: { id: string }) => p.id)).toEqual(expect.arrayContaining([w.userIds.lead, w.userIds.field_geologist]));
    expect(r.json.facets.entities).toEqual(expect.arrayContaining(["sample", "project"]));
    expect(r.json.facets.actions).toEqual(expect.arrayContaining(["create", "update"]));
  });
});

describe("CSV export", () => {
  test("RFC 4180 with a BOM, ISO 8601 UTC times, the changed fields and before/after JSON", async () => {
    const res = await auditExportRoute(new Request(`http://localhost:3000/api/projects/x/audit/export?entity=sample&entityId=${sampleId}`, { headers: { cookie: w.cookies.lead } }), { params: Promise.resolve(P()) });
    expect(res.status).toBe(200);
    expect(res.headers.get("content-type")).toBe("text/csv; charset=utf-8");
    expect(res.headers.get("content-disposition")).toMatch(/attachment; filename="TP\d+-audit-\d{4}-\d{2}-\d{2}\.csv"/);
    const bytes = new Uint8Array(await res.arrayBuffer());
    expect([...bytes.slice(0, 3)]).toEqual([0xef, 0xbb, 0xbf]);
    const text = new TextDecoder().decode(bytes);
    expect(text).toContain("\r\n");
    const parsed = Papa.parse<Record<string, string>>(text, { header: true, skipEmptyLines: true });
    expect(parsed.errors).toEqual([]);
    expect(parsed.meta.fields).toEqual(["time_utc", "person", "email", "action", "record_type", "record_id", "record", "changed_fields", "before_json", "after_json"]);
    expect(parsed.data.map((d) => d.action)).toEqual(["create", "update"]); // oldest first in files
    const upd = parsed.data[1];
    expect(upd.time_utc).toMatch(/^\d{4}-\d{2}-\d{2}T\d{2}:\d{2}:\d{2}\.\d{3}Z$/);
    expect(upd.person).toMatch(/^lead \d+$/);
    expect(upd).toMatchObject({ record_type: "sample", record_id: sampleId, record: sampleCode, changed_fields: "lithology" });
    expect(JSON.parse(upd.before_json).lithology).toBe("gossan");
    expect(JSON.parse(upd.after_json).lithology).toBe('=HYPERLINK("x")');
  });
});

describe("append-only", () => {
  test("the database refuses to change or delete an entry", async () => {
    const db = getDb();
    const [row] = await db.select().from(auditLog).where(eq(auditLog.entityId, sampleId)).limit(1);
    const why = (e: unknown) => `${(e as Error).message} ${((e as { cause?: Error }).cause?.message ?? "")}`;
    const upd = await db.update(auditLog).set({ action: "forged" }).where(eq(auditLog.id, row.id)).then(() => null, (e: unknown) => e);
    expect(why(upd)).toMatch(/audit_log is append-only: entries cannot be changed/);
    const del = await db.delete(auditLog).where(eq(auditLog.id, row.id)).then(() => null, (e: unknown) => e);
    expect(why(del)).toMatch(/audit_log is append-only: entries cannot be deleted/);
    const [again] = await db.select().from(auditLog).where(eq(auditLog.id, row.id));
    expect(again).toEqual(row);
  });

  test("the DAL has no update or delete path: its audit modules export only the writer and readers", () => {
    expect(Object.keys(auditWriter).sort()).toEqual(["audit"]);
    expect(Object.keys(auditReader).sort()).toEqual(["auditFacets", "listAudit", "prepareAuditExport", "zoneOffsetMs"]);
  });

  test("no code outside migrations updates or deletes audit_log rows", () => {
    const files: string[] = [];
    const walk = (dir: string) => {
      for (const name of readdirSync(dir)) {
        const p = join(dir, name);
        if (statSync(p).isDirectory()) walk(p);
        else if (/\.(ts|tsx|mjs|js)$/.test(name)) files.push(p);
      }
    };
    for (const dir of ["lib", "app", "db/seed", "scripts", "components"]) walk(dir);
    const offenders = files.filter((f) => {
      const src = readFileSync(f, "utf8");
      return /\.(update|delete)\(\s*auditLog\b/.test(src) || /(UPDATE|DELETE\s+FROM)\s+[`"']?audit_log/i.test(src);
    });
    expect(files.length).toBeGreaterThan(100);
    expect(offenders).toEqual([]);
  });
});
