import type { Browser, Page } from "playwright-core";
import { afterAll, beforeAll, describe, expect, test } from "vitest";
import { baseUrl, launchBrowser, openDemoProject, signInAs, type DemoRole } from "./helpers";

// The field → lab hand-off (chain of custody: common practice) through the real pages: draft from the register selection, dispatch with
// a waybill, the lab's e-mail (captured by the fake SMTP server the harness starts), intake, a lab step, and the
// sample's chain of custody.

let browser: Browser;
beforeAll(async () => {
  browser = await launchBrowser();
});
afterAll(async () => {
  await browser?.close();
});

async function as(role: DemoRole): Promise<{ page: Page; errors: string[] }> {
  const page = await (await browser.newContext()).newPage();
  const errors: string[] = [];
  page.on("console", (m) => m.type() === "error" && errors.push(m.text()));
  page.on("pageerror", (e) => errors.push(e.message));
  await signInAs(page, role);
  return { page, errors };
}

describe("lab submission in the browser", () => {
  let projectId = "";
  let submissionUrl = "";
  let code = "";

  test("a field geologist selects samples in the register, creates a draft and sends it", async () => {
    const { page, errors } = await as("field");
    projectId = await openDemoProject(page);
    await page.goto(`${baseUrl()}/projects/${projectId}/samples?sort=code&dir=desc`);
    await page.locator('input[aria-label="Select APR-000060"]:visible').check();
    await page.locator('input[aria-label="Select APR-000059"]:visible').check();
    await page.locator("text=Submit to lab (2) >> visible=true").first().click();
    await page.waitForURL(/submissions\/new\?sampleIds=/);
    await expect.poll(() => page.locator('ul[aria-label="Selected samples"] li').count()).toBe(2);
    await page.click("text=Create draft with 2 samples");
    await page.waitForURL(/submissions\/[0-9a-f-]{36}$/);
    submissionUrl = page.url();
    code = (await page.textContent("[data-testid=submission-code]")) ?? "";
    // The demo's own batch is APR-SUB-0001; other browser tests may have sent one before this.
    expect(code).toMatch(/^APR-SUB-\d{4}$/);
    expect(code).not.toBe("APR-SUB-0001");
    await page.fill("#waybill", "WB-E2E-001");
    await page.click("text=Record dispatch and e-mail the lab");
    await expect.poll(() => page.textContent('[role=status]'), { timeout: 20_000 }).toContain("E-mail sent to reception@lab.lithodex.example");
    await expect.poll(() => page.locator("text=Sent to lab").count()).toBeGreaterThan(0);
    expect(errors).toEqual([]);
  });

  test("the site admin finds the lab's e-mail in the outbox with a working manifest link", async () => {
    const { page } = await as("admin");
    await page.goto(`${baseUrl()}/dev/outbox`);
    const msg = page.locator("li", { hasText: `Sample submission ${code}` }).first();
    await expect.poll(() => msg.count()).toBe(1);
    const href = await msg.locator("a[href*='/manifest']").getAttribute("href");
    expect(href).toBe(`${submissionUrl}/manifest`);
    await page.goto(href!);
    await expect.poll(() => page.locator("text=Received by (lab)").count()).toBe(1);
    expect(await page.locator("tbody tr").count()).toBe(2);
  });

  test("the consultant sees no outbox mail and no actions", async () => {
    const { page } = await as("consultant");
    await page.goto(`${baseUrl()}/dev/outbox`);
    expect(await page.locator("text=No messages yet.").count()).toBe(1);
    await page.goto(submissionUrl);
    expect(await page.locator("form").count()).toBe(0);
  });

  test("the lab records intake with one damaged bag, then preparation; the sample shows its chain of custody", async () => {
    const { page, errors } = await as("lab");
    await page.goto(submissionUrl);
    await page.fill("#labReference", "LAB-E2E-7");
    await page.fill("#intake-location", "Reception, shelf R2");
    await page.selectOption('select[aria-label="Condition of APR-000059"]', "damaged");
    await page.fill('input[aria-label="Note for APR-000059"]', "Bag split at the seam");
    await page.click("text=Record intake");
    await expect.poll(() => page.textContent('[role=status]'), { timeout: 20_000 }).toContain("Intake recorded");
    await page.waitForSelector('form[aria-label="Record a custody step"]');
    expect(await page.locator("text=Respirable crystalline silica").count()).toBeGreaterThan(0);
    await page.check('form[aria-label="Record a custody step"] >> text=All (2)');
    await page.fill("#location-step", "Prep lab");
    await page.click('form[aria-label="Record a custody step"] button[type=submit]');
    await expect.poll(() => page.locator("text=Prepared recorded for 2 samples.").count(), { timeout: 20_000 }).toBe(1);
    await page.click("a:text('APR-000059')");
    await page.waitForURL(/samples\/[0-9a-f-]{36}$/);
    await page.waitForSelector('ol[aria-label="Custody events, oldest first"] > li');
    const steps = await page.locator('ol[aria-label="Custody events, oldest first"] > li').allTextContents();
    expect(steps.map((s) => s.split(" · ")[0])).toEqual(["Collected", "Dispatched", "Received at lab", "Prepared"]);
    expect(steps[2]).toContain("damaged");
    expect(errors).toEqual([]);
  });
});
