import "server-only";
import { and, eq, inArray, isNull, ne, sql } from "drizzle-orm";
import { getDb } from "@/db";
import { projects, samples, submissionSamples, submissions, user } from "@/db/schema";
import { appBaseUrl, sendMail, signOffMail, submissionReportedMail } from "@/lib/mail";
import { writeSampleEvent } from "@/lib/jobs/sample-status";
import { STATUS_RANK } from "@/lib/custody";
import { audit } from "./audit";
import { projectLeadEmails } from "./submissions";

export interface SignOffNotice {
  projectId: string;
  scanId: string;
  sampleId: string;
  /** User id of the analyst who signed off (a display name is accepted too). */
  signedOffBy: string;
}

export interface SignOffOutcome {
  /** Lead addresses the sign-off message went to (empty when sending failed or there are no leads). */
  mailedTo: string[];
  /** Submissions that became "reported" because of this sign-off. */
  reportedSubmissions: string[];
  errors: string[];
}

async function mailLeads(projectId: string, content: { subject: string; text: string; html: string }, errors: string[]): Promise<string[]> {
  const to = await projectLeadEmails(projectId);
  if (to.length === 0) return [];
  try {
    await sendMail({ to, ...content });
    return to;
  } catch (err) {
    errors.push((err as Error).message);
    console.error("mail:", (err as Error).message);
    return [];
  }
}

/**
 * Call after an analyst signs off a scan (after the sign-off committed). E-mails the project's leads
 * "results signed off for sample X" with links to the scan and the sample; then, for each submission holding
 * the sample, when every sample on it (except bags missing at intake) has a signed-off scan, marks the
 * submission "reported", moves its samples forward to "reported" and e-mails the leads — once per submission.
 * Never throws for a mail failure: the sign-off stands; failures come back in `errors`.
 */
export async function notifySignOff({ projectId, scanId, sampleId, signedOffBy }: SignOffNotice): Promise<SignOffOutcome> {
  const db = getDb();
  const errors: string[] = [];
  const [project] = await db.select({ id: projects.id, code: projects.code, name: projects.name }).from(projects).where(eq(projects.id, projectId));
  const [sample] = await db.select({ id: samples.id, code: samples.code }).from(samples).where(and(eq(samples.id, sampleId), eq(samples.projectId, projectId)));
  if (!project || !sample) return { mailedTo: [], reportedSubmissions: [], errors: ["Unknown project or sample."] };
  const [analyst] = await db.select({ id: user.id, name: user.name }).from(user).where(eq(user.id, signedOffBy));
  const baseUrl = appBaseUrl();
  const mailedTo = await mailLeads(projectId, signOffMail({ baseUrl, project, sample, scanId, signedOffBy: analyst?.name ?? signedOffBy }), errors);

  const reportedSubmissions: string[] = [];
  const candidates = await db
    .select({ id: submissions.id, code: submissions.code, sentAt: submissions.sentAt })
    .from(submissionSamples)
    .innerJoin(submissions, eq(submissions.id, submissionSamples.submissionId))
    .where(and(eq(submissionSamples.sampleId, sampleId), isNull(submissions.reportedAt), inArray(submissions.status, ["received", "in_progress"])));
  for (const sub of candidates) {
    const counted = await db
      .select({
        sampleId: submissionSamples.sampleId,
        // Qualified by hand: drizzle leaves column names bare inside sql`` subqueries.
        // Only scans made for this submission count (after it was sent), not results of an earlier batch.
        signed: sql<number>`(select count(*) from "scans" sc where sc."sample_id" = "submission_samples"."sample_id" and (sc."status" = 'signed_off' or sc."signed_off_at" is not null) and sc."created_at" >= ${sub.sentAt?.getTime() ?? 0})`,
      })
      .from(submissionSamples)
      .where(and(eq(submissionSamples.submissionId, sub.id), sql`coalesce(${submissionSamples.intakeCondition}, '') <> 'missing'`));
    if (counted.length === 0 || counted.some((c) => c.signed === 0)) continue;
    const [{ missing }] = await db
      .select({ missing: sql<number>`count(*)` })
      .from(submissionSamples)
      .where(and(eq(submissionSamples.submissionId, sub.id), eq(submissionSamples.intakeCondition, "missing")));
    // The conditional update makes "once" hold even when two sign-offs race: only one caller gets the row back.
    const won = await db.transaction(async (tx) => {
      const [row] = await tx
        .update(submissions)
        .set({ status: "reported", reportedAt: new Date() })
        .where(and(eq(submissions.id, sub.id), isNull(submissions.reportedAt)))
        .returning({ id: submissions.id });
      if (!row) return false;
      const ids = counted.map((c) => c.sampleId);
      const below = Object.entries(STATUS_RANK)
        .filter(([, r]) => r < STATUS_RANK.reported)
        .map(([s]) => s as keyof typeof STATUS_RANK);
      // A review event per sample moves it to "reported" (the status follows the events).
      const moving = await tx.select({ id: samples.id }).from(samples).where(and(inArray(samples.id, ids), inArray(samples.status, below), ne(samples.status, "planned")));
      for (const m of moving) {
        await writeSampleEvent(tx, { sampleId: m.id, event: "reported", actorId: null, submissionId: sub.id, note: `All results of submission ${sub.code} signed off` });
      }
      await audit(tx, null, { projectId, action: "reported", entity: "submission", entityId: sub.id, after: { status: "reported", trigger: { scanId, sampleId } } });
      return true;
    });
    if (!won) continue;
    reportedSubmissions.push(sub.id);
    await mailLeads(projectId, submissionReportedMail({ baseUrl, project, submission: sub, sampleCount: counted.length, missingCount: missing }), errors);
  }
  return { mailedTo, reportedSubmissions, errors };
}
