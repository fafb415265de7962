/**
 * E-mail templates: small pure functions returning {subject, text, html}. Links are absolute, built from the
 * `baseUrl` the caller passes (appBaseUrl(), i.e. BETTER_AUTH_URL). No I/O here, so they are unit-tested as is.
 */
import { SAMPLE_TYPE_LABELS } from "@/lib/format";
import type { SampleType } from "@/lib/vocabulary";

export interface MailContent {
  subject: string;
  text: string;
  html: string;
}

interface ProjectRef {
  id: string;
  code: string;
  name: string;
}

/** Escapes text for HTML element content and attribute values. */
export function escapeHtml(s: string): string {
  return s.replace(/[&<>"']/g, (c) => ({ "&": "&amp;", "<": "&lt;", ">": "&gt;", '"': "&quot;", "'": "&#39;" })[c]!);
}

const seg = encodeURIComponent;

/** "2026-03-20 09:00 UTC" from an ISO instant (unparseable input comes back as given). */
export function formatUtc(iso: string): string {
  const d = new Date(iso);
  return Number.isNaN(d.getTime()) ? iso : `${d.toISOString().slice(0, 16).replace("T", " ")} UTC`;
}

/** Absolute URL of an app path. */
export function appLink(baseUrl: string, path: string): string {
  return `${baseUrl.replace(/\/+$/, "")}${path.startsWith("/") ? path : `/${path}`}`;
}

export const submissionPath = (projectId: string, submissionId: string) => `/projects/${seg(projectId)}/submissions/${seg(submissionId)}`;
export const manifestPath = (projectId: string, submissionId: string) => `${submissionPath(projectId, submissionId)}/manifest`;
export const samplePath = (projectId: string, sampleId: string) => `/projects/${seg(projectId)}/samples/${seg(sampleId)}`;
export const scanPath = (projectId: string, scanId: string) => `/projects/${seg(projectId)}/scans/${seg(scanId)}`;
export const invitePath = (token: string) => `/invite/${seg(token)}`;
export const labLinkPath = (token: string) => `/lab/${seg(token)}`;

function layout(title: string, body: string, footer = "Sent by Lithodex. Links open the project in the app; sign in first."): string {
  return [
    `<!doctype html><html><body style="font-family:Arial,Helvetica,sans-serif;color:#17313a;line-height:1.45;max-width:640px">`,
    `<h1 style="font-size:18px;margin:0 0 12px">${escapeHtml(title)}</h1>`,
    body,
    `<p style="color:#5f6b6d;font-size:12px;margin-top:24px">${escapeHtml(footer)}</p>`,
    `</body></html>`,
  ].join("\n");
}

const button = (href: string, label: string) =>
  `<p><a href="${escapeHtml(href)}" style="display:inline-block;background:#1d5c63;color:#fff;padding:8px 14px;border-radius:6px;text-decoration:none">${escapeHtml(label)}</a></p>`;

const ASBESTOS_NOTE =
  "Suspected asbestos: handle these bags as potentially hazardous before and during preparation, follow site rules and local regulations, and confirm asbestiform habit by accredited methods (e.g. polarized light or electron microscopy). XRD alone cannot establish it.";

export interface ManifestLine {
  code: string;
  sampleType: SampleType;
  weightKg: number | null;
  suspectedAsbestos: boolean;
}

/** To the lab when a submission is dispatched: what is coming, how, and the manifest link. */
export function submissionDispatchedMail(input: {
  baseUrl: string;
  project: ProjectRef;
  submission: { id: string; code: string; requestedAnalysis: string; priority: string; hazards: string | null; qaqcNote: string | null; notes: string | null; waybill: string | null; courier?: string | null };
  samples: ManifestLine[];
  sender: { name: string; email: string };
  /**
   * The lab link (no account needed; absolute URL) and when it expires. Absent when the lab's address belongs to a
   * project member, who opens the submission with their own account.
   */
  labLink?: { url: string; expiresAt: Date } | null;
  /** The manifest goes with the message as a PDF attachment. */
  manifestAttached?: boolean;
}): MailContent {
  const { baseUrl, project, submission: s, samples, sender } = input;
  const url = appLink(baseUrl, manifestPath(project.id, s.id));
  const lab = input.labLink ?? null;
  const until = lab ? formatUtc(lab.expiresAt.toISOString()) : "";
  const asbestos = samples.filter((x) => x.suspectedAsbestos).map((x) => x.code);
  const subject = `Sample submission ${s.code}: ${samples.length} sample${samples.length === 1 ? "" : "s"} for ${s.requestedAnalysis}${s.priority !== "routine" ? ` (${s.priority})` : ""}`;
  const line = (x: ManifestLine) => `${x.code}  ${SAMPLE_TYPE_LABELS[x.sampleType]}  ${x.weightKg != null ? `${x.weightKg} kg` : "—"}${x.suspectedAsbestos ? "  SUSPECTED ASBESTOS" : ""}`;
  const text = [
    `${sender.name} (${sender.email}) has dispatched submission ${s.code} from project ${project.name} (${project.code}).`,
    "",
    `Requested analysis: ${s.requestedAnalysis}`,
    `Priority: ${s.priority}`,
    `Waybill: ${s.waybill ?? "—"}${s.courier ? ` (${s.courier})` : ""}`,
    s.hazards ? `Hazards: ${s.hazards}` : "Hazards: none declared",
    ...(asbestos.length ? ["", ASBESTOS_NOTE] : []),
    ...(s.qaqcNote ? [`QA/QC: ${s.qaqcNote}`] : []),
    ...(s.notes ? [`Notes: ${s.notes}`] : []),
    "",
    `Samples (${samples.length}):`,
    ...samples.map(line),
    "",
    ...(input.manifestAttached ? ["The manifest (packing list) is attached as a PDF."] : []),
    ...(lab
      ? [
          `Record the intake and upload the scans of these samples (no account needed): ${lab.url}`,
          `This link works for submission ${s.code} only and expires on ${until}. Keep it within the lab.`,
          "",
          `Lab staff with a Lithodex account in this project can sign in instead: ${url}`,
        ]
      : [`Manifest and intake checklist: ${url}`]),
    "Please record the receipt (condition of each bag, location, your batch number) in Lithodex when the shipment arrives.",
  ].join("\n");
  const rows = samples
    .map(
      (x) =>
        `<tr><td style="padding:2px 8px">${escapeHtml(x.code)}</td><td style="padding:2px 8px">${escapeHtml(SAMPLE_TYPE_LABELS[x.sampleType])}</td><td style="padding:2px 8px;text-align:right">${x.weightKg != null ? `${x.weightKg} kg` : "—"}</td><td style="padding:2px 8px;color:#a4262c">${x.suspectedAsbestos ? "Suspected asbestos" : ""}</td></tr>`,
    )
    .join("\n");
  const html = layout(
    `Sample submission ${s.code}`,
    [
      `<p>${escapeHtml(sender.name)} (${escapeHtml(sender.email)}) has dispatched submission <strong>${escapeHtml(s.code)}</strong> from project ${escapeHtml(project.name)} (${escapeHtml(project.code)}).</p>`,
      `<p>Requested analysis: <strong>${escapeHtml(s.requestedAnalysis)}</strong><br>Priority: ${escapeHtml(s.priority)}<br>Waybill: ${escapeHtml(s.waybill ?? "—")}${s.courier ? ` (${escapeHtml(s.courier)})` : ""}<br>Hazards: ${escapeHtml(s.hazards ?? "none declared")}</p>`,
      asbestos.length ? `<p style="border:1px solid #a4262c;background:#fdecec;padding:8px;color:#a4262c">${escapeHtml(ASBESTOS_NOTE)}</p>` : "",
      s.qaqcNote ? `<p>QA/QC: ${escapeHtml(s.qaqcNote)}</p>` : "",
      s.notes ? `<p>Notes: ${escapeHtml(s.notes)}</p>` : "",
      `<table style="border-collapse:collapse;font-size:13px"><thead><tr><th style="text-align:left;padding:2px 8px">Sample</th><th style="text-align:left;padding:2px 8px">Type</th><th style="text-align:right;padding:2px 8px">Weight</th><th></th></tr></thead><tbody>${rows}</tbody></table>`,
      input.manifestAttached ? `<p>The manifest (packing list) is attached as a PDF.</p>` : "",
      lab
        ? [
            button(lab.url, "Record the intake and upload scans"),
            `<p style="font-size:13px">No account needed. This link works for submission ${escapeHtml(s.code)} only and expires on ${escapeHtml(until)}; keep it within the lab.</p>`,
            `<p style="font-size:13px">Lab staff with a Lithodex account in this project can <a href="${escapeHtml(url)}">sign in and open the manifest</a> instead.</p>`,
          ].join("\n")
        : button(url, "Open the manifest"),
      `<p>Please record the receipt (condition of each bag, location, your batch number) in Lithodex when the shipment arrives.</p>`,
    ].join("\n"),
    lab ? "Sent by Lithodex on behalf of the project team." : undefined,
  );
  return { subject, text, html };
}

/** To the sender and the leads when the lab records intake: the receipt, with discrepancies. */
export function submissionReceivedMail(input: {
  baseUrl: string;
  project: ProjectRef;
  submission: { id: string; code: string; labReference: string | null };
  receivedAt: string;
  receivedBy: string;
  counts: { received: number; damaged: number; missing: number; extra: number };
  discrepancies: { code: string; condition: string; note: string | null }[];
}): MailContent {
  const { baseUrl, project, submission: s, counts } = input;
  const url = appLink(baseUrl, submissionPath(project.id, s.id));
  const issues = counts.damaged + counts.missing + counts.extra;
  const subject = `Submission ${s.code} received by the lab${issues ? ` — ${issues} discrepanc${issues === 1 ? "y" : "ies"}` : ""}`;
  const summary = `${counts.received} received, ${counts.damaged} damaged, ${counts.missing} missing, ${counts.extra} extra`;
  const text = [
    `${input.receivedBy} recorded the intake of submission ${s.code} (${project.name}) at ${formatUtc(input.receivedAt)}.`,
    `Lab batch: ${s.labReference ?? "—"}`,
    `Bags: ${summary}.`,
    ...(input.discrepancies.length ? ["", "Discrepancies:", ...input.discrepancies.map((d) => `${d.code}: ${d.condition}${d.note ? ` — ${d.note}` : ""}`)] : []),
    "",
    `Submission: ${url}`,
  ].join("\n");
  const html = layout(
    `Submission ${s.code} received`,
    [
      `<p>${escapeHtml(input.receivedBy)} recorded the intake of submission <strong>${escapeHtml(s.code)}</strong> (${escapeHtml(project.name)}) at ${escapeHtml(formatUtc(input.receivedAt))}.</p>`,
      `<p>Lab batch: ${escapeHtml(s.labReference ?? "—")}<br>Bags: ${escapeHtml(summary)}.</p>`,
      input.discrepancies.length ? `<ul>${input.discrepancies.map((d) => `<li>${escapeHtml(d.code)}: ${escapeHtml(d.condition)}${d.note ? ` — ${escapeHtml(d.note)}` : ""}</li>`).join("")}</ul>` : "",
      button(url, "Open the submission"),
    ].join("\n"),
  );
  return { subject, text, html };
}

/** To the invitee: a single-use link to set a password (or, for an existing account, to join). */
export function invitationMail(input: { baseUrl: string; token: string; projectName: string; roleLabel: string; invitedBy: string; expiresAt: Date }): MailContent {
  const url = appLink(input.baseUrl, invitePath(input.token));
  const until = formatUtc(input.expiresAt.toISOString());
  const subject = `${input.invitedBy} invited you to ${input.projectName} on Lithodex`;
  const text = [
    `${input.invitedBy} invited you to join the project "${input.projectName}" as ${input.roleLabel}.`,
    "",
    `Accept the invitation and set your password: ${url}`,
    "",
    `The link works once and expires on ${until}. If you did not expect this, ignore this message.`,
  ].join("\n");
  const html = layout(
    `Invitation to ${input.projectName}`,
    [
      `<p>${escapeHtml(input.invitedBy)} invited you to join the project <strong>${escapeHtml(input.projectName)}</strong> as ${escapeHtml(input.roleLabel)}.</p>`,
      button(url, "Accept the invitation"),
      `<p style="font-size:13px">Or paste this link into your browser: <a href="${escapeHtml(url)}">${escapeHtml(url)}</a></p>`,
      `<p style="font-size:13px">The link works once and expires on ${escapeHtml(until)}. If you did not expect this, ignore this message.</p>`,
    ].join("\n"),
  );
  return { subject, text, html };
}

/** To the project leads when an analyst signs off a scan's results. */
export function signOffMail(input: { baseUrl: string; project: ProjectRef; sample: { id: string; code: string }; scanId: string; signedOffBy: string }): MailContent {
  const { baseUrl, project, sample } = input;
  const scanUrl = appLink(baseUrl, scanPath(project.id, input.scanId));
  const sampleUrl = appLink(baseUrl, samplePath(project.id, sample.id));
  const subject = `Results signed off for sample ${sample.code}`;
  const note = "Semi-quantitative percentages are estimates, not accredited results.";
  const text = [
    `${input.signedOffBy} signed off the XRD results for sample ${sample.code} (${project.name}).`,
    "",
    `Scan: ${scanUrl}`,
    `Sample: ${sampleUrl}`,
    "",
    note,
  ].join("\n");
  const html = layout(
    subject,
    [
      `<p>${escapeHtml(input.signedOffBy)} signed off the XRD results for sample <strong>${escapeHtml(sample.code)}</strong> (${escapeHtml(project.name)}).</p>`,
      button(scanUrl, "Open the scan"),
      `<p><a href="${escapeHtml(sampleUrl)}">Sample ${escapeHtml(sample.code)}</a></p>`,
      `<p style="font-size:13px;color:#5f6b6d">${escapeHtml(note)}</p>`,
    ].join("\n"),
  );
  return { subject, text, html };
}

/** To the project leads, once, when every sample of a submission has signed-off results. */
export function submissionReportedMail(input: { baseUrl: string; project: ProjectRef; submission: { id: string; code: string }; sampleCount: number; missingCount: number }): MailContent {
  const { baseUrl, project, submission: s } = input;
  const url = appLink(baseUrl, submissionPath(project.id, s.id));
  const subject = `Submission ${s.code}: results signed off for all ${input.sampleCount} sample${input.sampleCount === 1 ? "" : "s"}`;
  const missing = input.missingCount ? ` ${input.missingCount} sample${input.missingCount === 1 ? " was" : "s were"} missing at intake and ${input.missingCount === 1 ? "is" : "are"} not included.` : "";
  const text = [`Every sample of submission ${s.code} (${project.name}) now has signed-off XRD results.${missing}`, "", `Submission: ${url}`].join("\n");
  const html = layout(
    `Submission ${s.code} signed off`,
    [`<p>Every sample of submission <strong>${escapeHtml(s.code)}</strong> (${escapeHtml(project.name)}) now has signed-off XRD results.${escapeHtml(missing)}</p>`, button(url, "Open the submission")].join("\n"),
  );
  return { subject, text, html };
}
