import { mkdirSync, mkdtempSync, readdirSync, readFileSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import type { Browser, Page } from "playwright-core";
import { afterAll, beforeAll, describe, expect, inject, test } from "vitest";
import type { OutboxMessage } from "@/lib/mail/outbox";
import { quartzCalciteXy } from "../fixtures/lab/handbook-scans";
import { baseUrl, isNotBlank, launchBrowser, openDemoProject, signInAs } from "./helpers";

// Issue 11 §3 in the browser: the field geologist dispatches a submission; the lab's e-mail is captured by the fake
// SMTP server the harness starts (the outbox); an outside lab with no account opens the e-mailed link, records the
// intake and uploads a scan for a sample on the manifest; the project sees it in the sample's chain of custody; the
// link, once withdrawn, answers 410.

const SHOTS = join(process.cwd(), "test-results", "outside-lab");
const LAB_EMAIL = "reception@lab.lithodex.example";
const CODES = ["APR-000046", "APR-000047"];

let browser: Browser;
beforeAll(async () => {
  browser = await launchBrowser();
  mkdirSync(SHOTS, { recursive: true });
});
afterAll(async () => {
  await browser?.close();
});

function watch(page: Page): string[] {
  const errors: string[] = [];
  page.on("pageerror", (e) => errors.push(String(e)));
  page.on("console", (m) => m.type() === "error" && errors.push(m.text()));
  return errors;
}

/** Messages the fake SMTP server captured (LITHODEX_DATA_DIR/outbox of the test server). */
function outbox(): OutboxMessage[] {
  const dir = join(inject("dataDir"), "files", "outbox");
  return readdirSync(dir)
    .filter((n) => n.endsWith(".json"))
    .map((n) => JSON.parse(readFileSync(join(dir, n), "utf8")) as OutboxMessage);
}

describe("an outside lab works from the e-mailed link, without an account", () => {
  let projectId = "";
  let code = "";
  let submissionUrl = "";
  let labUrl = "";

  test("the field geologist dispatches two samples; the lab's e-mail carries the manifest PDF and a lab link", async () => {
    const page = await browser.newPage({ viewport: { width: 1280, height: 900 } });
    const errors = watch(page);
    await signInAs(page, "field");
    projectId = await openDemoProject(page);
    const ids: string[] = [];
    for (const c of CODES) {
      const r = await page.request.get(`${baseUrl()}/api/projects/${projectId}/samples?code=${c}`);
      ids.push(((await r.json()) as { items: { id: string; code: string }[] }).items.find((s) => s.code === c)!.id);
    }
    await page.goto(`${baseUrl()}/projects/${projectId}/submissions/new?sampleIds=${ids.join(",")}`);
    await page.click("text=Create draft with 2 samples");
    await page.waitForURL(/submissions\/[0-9a-f-]{36}$/);
    submissionUrl = page.url();
    code = (await page.textContent("[data-testid=submission-code]")) ?? "";
    await page.fill("#waybill", "WB-OUTSIDE-1");
    await page.click("text=Record dispatch and e-mail the lab");
    await expect.poll(() => page.textContent("[role=status]"), { timeout: 20_000 }).toContain(`E-mail sent to ${LAB_EMAIL}`);
    await expect.poll(() => outbox().filter((m) => m.subject.includes(code) && m.to.includes(LAB_EMAIL)).length, { timeout: 20_000 }).toBe(1);
    const mail = outbox().find((m) => m.subject.includes(code) && m.to.includes(LAB_EMAIL))!;
    expect(mail.via).toBe("smtp");
    expect(mail.attachments?.map((a) => [a.filename, a.contentType])).toEqual([[`${code}-manifest.pdf`, "application/pdf"]]);
    expect(Buffer.from(mail.attachments![0].contentBase64, "base64").subarray(0, 5).toString("latin1")).toBe("%PDF-");
    labUrl = (mail.text ?? "").match(/https?:\/\/\S+\/lab\/[A-Za-z0-9_-]{43}/)![0];
    expect(labUrl.startsWith(baseUrl())).toBe(true);
    await page.reload();
    await expect.poll(() => page.locator("[data-testid=lab-link-panel]").textContent()).toContain("Active");
    await page.screenshot({ path: join(SHOTS, "1-field-submission-sent.png"), fullPage: true });
    expect(errors).toEqual([]);
  });

  test("the lab opens the link in a browser with no account, records the intake and uploads a scan", async () => {
    const context = await browser.newContext({ viewport: { width: 1280, height: 900 } });
    const page = await context.newPage();
    const errors = watch(page);
    await page.goto(labUrl);
    expect(await page.textContent("[data-testid=lab-submission-code]")).toBe(code);
    expect(await page.locator("text=Record the intake").count()).toBeGreaterThan(0);
    expect(await page.locator("text=Arroyo Pinar").count()).toBeGreaterThan(0);
    await page.screenshot({ path: join(SHOTS, "2-lab-link-before-intake.png"), fullPage: true });
    expect(await isNotBlank(await page.screenshot())).toBe(true);

    await page.fill("#lab-name", "Ana Ruiz");
    await page.fill("#labReference", "OL-2026-118");
    await page.fill("#lab-location", "Reception, rack 3");
    await page.selectOption(`select[aria-label="Condition of ${CODES[1]}"]`, "damaged");
    await page.fill(`input[aria-label="Note for ${CODES[1]}"]`, "Bag torn at one corner, contents intact");
    await page.click("text=Record the intake of 2 bags");
    await expect.poll(() => page.textContent("[data-testid=lab-status]"), { timeout: 20_000 }).toMatch(/^Received .* \(batch OL-2026-118\)$/);

    const dir = mkdtempSync(join(tmpdir(), "lithodex-lab-"));
    const file = join(dir, `${CODES[0]}.xy`);
    writeFileSync(file, quartzCalciteXy({ seed: 46 }));
    await page.fill("#lab-upload-name", "Ana Ruiz");
    await page.setInputFiles(`input[aria-label="Scan file for ${CODES[0]}"]`, file);
    await expect.poll(() => page.textContent("[role=status]"), { timeout: 30_000 }).toContain(`${CODES[0]}.xy uploaded for ${CODES[0]}`);
    await expect.poll(() => page.locator("[data-testid=lab-sample-row]", { hasText: `${CODES[0]}.xy` }).count()).toBe(1);
    await page.screenshot({ path: join(SHOTS, "3-lab-link-after-upload.png"), fullPage: true });
    // No session was ever made: the page worked on the link alone.
    expect((await context.cookies()).filter((c) => c.name.includes("session"))).toEqual([]);
    expect(errors).toEqual([]);
    await context.close();
  });

  test("the lead sees who at the outside lab received and scanned the sample in its chain of custody", async () => {
    const page = await browser.newPage({ viewport: { width: 1280, height: 900 } });
    await signInAs(page, "lead");
    const r = await page.request.get(`${baseUrl()}/api/projects/${projectId}/samples?code=${CODES[0]}`);
    const id = ((await r.json()) as { items: { id: string; code: string }[] }).items.find((s) => s.code === CODES[0])!.id;
    await page.goto(`${baseUrl()}/projects/${projectId}/samples/${id}`);
    await page.waitForSelector('ol[aria-label="Custody events, oldest first"] > li');
    const steps = await page.locator('ol[aria-label="Custody events, oldest first"] > li').allTextContents();
    expect(steps.map((s) => s.split(" · ")[0]).slice(0, 4)).toEqual(["Collected", "Dispatched", "Received at lab", "Scanned"]);
    expect(steps[2]).toContain(`Ana Ruiz (outside lab, ${LAB_EMAIL})`);
    await page.screenshot({ path: join(SHOTS, "4-lead-sample-custody.png"), fullPage: true });
  });

  test("the field geologist withdraws the link; the lab's next visit answers 410", async () => {
    const page = await browser.newPage({ viewport: { width: 1280, height: 900 } });
    await signInAs(page, "field");
    await page.goto(submissionUrl);
    page.once("dialog", (d) => void d.accept());
    await page.click("text=Withdraw the lab link");
    await expect.poll(() => page.locator("[data-testid=lab-link-panel]").textContent()).toContain("Withdrawn");
    const lab = await browser.newContext();
    const labPage = await lab.newPage();
    const res = await labPage.goto(labUrl);
    expect(labPage.url()).toMatch(/\/gone$/);
    expect(res?.status()).toBe(410);
    expect(await labPage.textContent("h1")).toBe("This lab link was withdrawn");
    await labPage.screenshot({ path: join(SHOTS, "5-lab-link-withdrawn.png") });
    await lab.close();
  });
});
