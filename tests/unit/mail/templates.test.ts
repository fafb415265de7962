import { describe, expect, test } from "vitest";
import { escapeHtml, invitationMail, signOffMail, submissionDispatchedMail, submissionReceivedMail, submissionReportedMail } from "@/lib/mail/templates";

const project = { id: "p 1", code: "APR", name: "Arroyo <Pinar> & Co" };
const base = "https://lab.example.test/";

/** Every href in an HTML string, decoded the way a browser would (&amp; → &). */
const hrefs = (html: string) => [...html.matchAll(/href="([^"]+)"/g)].map((m) => m[1].replace(/&amp;/g, "&"));

describe("escapeHtml", () => {
  test("escapes the five characters the HTML spec says are unsafe in text and attributes", () => {
    // WHATWG HTML "escaping a string": & < > " (and ' for single-quoted attributes).
    expect(escapeHtml(`<a href="x">Tom & Jerry's</a>`)).toBe("&lt;a href=&quot;x&quot;&gt;Tom &amp; Jerry&#39;s&lt;/a&gt;");
  });
});

describe("submissionDispatchedMail", () => {
  const mail = submissionDispatchedMail({
    baseUrl: base,
    project,
    submission: { id: "s/1", code: "APR-SUB-0003", requestedAnalysis: "XRD bulk; XRD clay fraction", priority: "urgent", hazards: "Suspected asbestos (flagged at collection): APR-000029", qaqcNote: "1 duplicate, 1 blank", notes: null, waybill: "WB 1", courier: "Courier X" },
    samples: [
      { code: "APR-000028", sampleType: "core", weightKg: 2.1, suspectedAsbestos: false },
      { code: "APR-000029", sampleType: "hand_sample", weightKg: null, suspectedAsbestos: true },
    ],
    sender: { name: "Tomás Ferreira", email: "field@example.test" },
  });

  test("subject names the code, count, analysis and a non-routine priority", () => {
    expect(mail.subject).toBe("Sample submission APR-SUB-0003: 2 samples for XRD bulk; XRD clay fraction (urgent)");
  });

  test("the manifest link is absolute, percent-encoded and parses back to the ids (WHATWG URL parser)", () => {
    const links = hrefs(mail.html);
    expect(links).toHaveLength(1);
    const u = new URL(links[0]);
    expect(u.origin).toBe("https://lab.example.test");
    expect(u.pathname.split("/").map(decodeURIComponent)).toEqual(["", "projects", "p 1", "submissions", "s/1", "manifest"]);
    expect(mail.text).toContain(links[0]);
  });

  test("lists every bag, flags asbestos with the accredited-confirmation caution, and escapes names in html", () => {
    expect(mail.text).toContain("APR-000028  Drill core  2.1 kg");
    expect(mail.text).toContain("APR-000029  Hand sample  —  SUSPECTED ASBESTOS");
    expect(mail.text).toMatch(/confirm asbestiform habit by accredited methods/);
    expect(mail.html).toContain("Arroyo &lt;Pinar&gt; &amp; Co");
    expect(mail.html).not.toContain("<Pinar>");
  });
});

test("submissionReceivedMail counts discrepancies in the subject", () => {
  const m = submissionReceivedMail({
    baseUrl: base,
    project,
    submission: { id: "s1", code: "APR-SUB-0003", labReference: "LAB-1" },
    receivedAt: "2026-03-20T09:00:00.000Z",
    receivedBy: "Priya Raman",
    counts: { received: 8, damaged: 1, missing: 1, extra: 0 },
    discrepancies: [
      { code: "APR-000028", condition: "damaged", note: "split bag" },
      { code: "APR-000031", condition: "missing", note: null },
    ],
  });
  expect(m.subject).toBe("Submission APR-SUB-0003 received by the lab — 2 discrepancies");
  expect(m.text).toContain("Bags: 8 received, 1 damaged, 1 missing, 0 extra.");
  expect(hrefs(m.html)).toEqual(["https://lab.example.test/projects/p%201/submissions/s1"]);
});

test("invitationMail: single-use link with the expiry in UTC", () => {
  const m = invitationMail({ baseUrl: base, token: "abc_DEF-123", projectName: "Loma Gris", roleLabel: "Lab analyst", invitedBy: "Marta Vidal", expiresAt: new Date("2026-03-27T10:15:00Z") });
  expect(m.subject).toBe("Marta Vidal invited you to Loma Gris on Lithodex");
  expect(new Set(hrefs(m.html))).toEqual(new Set(["https://lab.example.test/invite/abc_DEF-123"]));
  expect(m.text).toContain("expires on 2026-03-27 10:15 UTC");
});

test("signOffMail links the scan and the sample and says estimates are not accredited results", () => {
  const m = signOffMail({ baseUrl: base, project, sample: { id: "sa1", code: "APR-000007" }, scanId: "sc1", signedOffBy: "Priya Raman" });
  expect(m.subject).toBe("Results signed off for sample APR-000007");
  expect(hrefs(m.html)).toEqual(["https://lab.example.test/projects/p%201/scans/sc1", "https://lab.example.test/projects/p%201/samples/sa1"]);
  expect(m.text).toContain("not accredited results");
});

test("submissionReportedMail mentions missing bags only when there are some", () => {
  const all = submissionReportedMail({ baseUrl: base, project, submission: { id: "s1", code: "APR-SUB-0001" }, sampleCount: 1, missingCount: 0 });
  expect(all.subject).toBe("Submission APR-SUB-0001: results signed off for all 1 sample");
  expect(all.text).not.toContain("missing");
  const some = submissionReportedMail({ baseUrl: base, project, submission: { id: "s1", code: "APR-SUB-0001" }, sampleCount: 9, missingCount: 2 });
  expect(some.text).toContain("2 samples were missing at intake and are not included.");
});

describe("submissionDispatchedMail to an outside lab (issue 11 §3)", () => {
  const mail = submissionDispatchedMail({
    baseUrl: base,
    project,
    submission: { id: "s1", code: "APR-SUB-0004", requestedAnalysis: "XRD bulk", priority: "routine", hazards: null, qaqcNote: null, notes: null, waybill: "WB 2" },
    samples: [{ code: "APR-000030", sampleType: "chip", weightKg: 1, suspectedAsbestos: false }],
    sender: { name: "Tomás Ferreira", email: "field@example.test" },
    labLink: { url: "https://lab.example.test/lab/AbC_123", expiresAt: new Date("2026-04-19T15:30:00Z") },
    manifestAttached: true,
  });
  test("the lab link comes first, says it needs no account, when it expires and that it covers this submission only", () => {
    const links = hrefs(mail.html);
    expect(links[0]).toBe("https://lab.example.test/lab/AbC_123");
    expect(links[1]).toBe("https://lab.example.test/projects/p%201/submissions/s1/manifest");
    expect(mail.text).toContain("Record the intake and upload the scans of these samples (no account needed): https://lab.example.test/lab/AbC_123");
    expect(mail.text).toContain("works for submission APR-SUB-0004 only and expires on 2026-04-19 15:30 UTC");
    expect(mail.text).toContain("The manifest (packing list) is attached as a PDF.");
    expect(mail.html).not.toContain("sign in first");
  });
});
