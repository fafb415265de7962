import "server-only";
import { and, eq } from "drizzle-orm";
import { getDb } from "@/db";
import { samples, scans, stations, submissions } from "@/db/schema";
import { authorize, type Actor } from "./actor";

/**
 * Short titles of records for page metadata (<title>): sample code, station code and name, scan file and sample,
 * submission code. Checks project.read like every read; null when the record is not there or not visible, so a
 * title never reveals another project's record (the page itself answers 404).
 */
export async function recordTitle(actor: Actor, projectId: string, kind: "sample" | "station" | "scan" | "submission", id: string): Promise<string | null> {
  try {
    await authorize(actor, projectId, "project.read");
  } catch {
    return null;
  }
  const db = getDb();
  if (kind === "sample") {
    const [r] = await db.select({ code: samples.code }).from(samples).where(and(eq(samples.id, id), eq(samples.projectId, projectId)));
    return r ? `Sample ${r.code}` : null;
  }
  if (kind === "station") {
    const [r] = await db.select({ code: stations.code, name: stations.name }).from(stations).where(and(eq(stations.id, id), eq(stations.projectId, projectId)));
    return r ? `Station ${r.code}${r.name ? ` ${r.name}` : ""}` : null;
  }
  if (kind === "scan") {
    const [r] = await db
      .select({ file: scans.originalName, sample: samples.code })
      .from(scans)
      .innerJoin(samples, eq(samples.id, scans.sampleId))
      .where(and(eq(scans.id, id), eq(scans.projectId, projectId)));
    return r ? `Scan ${r.file} (${r.sample})` : null;
  }
  const [r] = await db.select({ code: submissions.code }).from(submissions).where(and(eq(submissions.id, id), eq(submissions.projectId, projectId)));
  return r ? `Submission ${r.code}` : null;
}
