import { join } from "node:path";
import type { Browser } from "playwright-core";
import { afterAll, beforeAll, describe, expect, test } from "vitest";
import { SILICA_CAUTION } from "@/components/cautions/caution-texts";
import { baseUrl, isNotBlank, launchBrowser, openDemoProject, signInAs } from "./helpers";

/**
 * Synthetic scan made with cctbx by the project's test-data set (tests/fixtures/scans/forsterite-marble.md):
 * calcite 60, dolomite 25, forsterite 15 wt%, Cu Kα1 + Kα2, 5–80° 2θ, 3751 points, no header.
 */
const MARBLE = join(import.meta.dirname, "../fixtures/scans/forsterite-marble.xy");
/** Screenshots for a person to look at (laptop-size viewport). */
const SHOTS = process.env.E2E_SCREENSHOT_DIR ?? "/tmp";

let browser: Browser;
beforeAll(async () => {
  browser = await launchBrowser();
});
afterAll(async () => {
  await browser?.close();
});

describe("lab analyst: whole-pattern fit of a marble, refit without a phase, sign off", () => {
  test("upload → calculated and difference curves, phases with wt% ± σ → remove forsterite → refit → sign off with the fit statistics", async () => {
    const page = await browser.newPage({ viewport: { width: 1366, height: 768 } });
    const errors: string[] = [];
    page.on("pageerror", (e) => errors.push(String(e)));
    page.on("console", (m) => m.type() === "error" && errors.push(m.text()));
    await signInAs(page, "lab");
    const projectId = await openDemoProject(page);

    await page.goto(`${baseUrl()}/projects/${projectId}/scans/upload`);
    await page.getByPlaceholder("Type a sample code").fill("APR-000041");
    await page.getByRole("option", { name: /APR-000041/ }).click();
    await expect.poll(() => page.textContent("[data-testid=picked-sample]")).toMatch(/APR-000041/);
    await page.setInputFiles("input[type=file][name=file]", MARBLE);
    await expect.poll(() => page.textContent("[data-testid=file-check]")).toMatch(/3751 points, 5–80° 2θ/);
    // No anode in the file: the form's Cu is used.
    await page.getByRole("button", { name: "Upload and process" }).click();
    await page.waitForURL(/\/scans\/[0-9a-f-]{36}$/);

    // Processing runs on the server; the page follows it, then shows the fit.
    await page.waitForSelector("[data-testid=fit-panel]", { timeout: 90_000 });
    const main = page.locator("[data-testid=diffractogram] canvas").first();
    const diff = page.locator("[data-testid=difference-plot] canvas").first();
    await main.waitFor();
    await diff.waitFor();
    await page.waitForTimeout(300);
    await page.screenshot({ path: join(SHOTS, "wp-review-0-top.png") });
    // Zoomed in, each phase's share of the profile shows as a shaded area; the difference panel follows the zoom.
    for (let i = 0; i < 6; i++) await page.getByRole("button", { name: "Zoom in" }).click();
    await page.waitForTimeout(200);
    await page.locator("[data-testid=diffractogram]").locator("..").screenshot({ path: join(SHOTS, "wp-review-0-zoom.png") });
    await page.getByRole("button", { name: "Reset" }).click();
    expect(await isNotBlank(await main.screenshot())).toBe(true);
    expect(await isNotBlank(await diff.screenshot())).toBe(true);
    await expect.poll(() => page.getByRole("button", { name: "Calculated (fit)" }).getAttribute("aria-pressed")).toBe("true");

    const fitted = page.locator("[data-testid=fit-phase]");
    const minerals = await fitted.evaluateAll((els) => els.map((e) => e.getAttribute("data-mineral")));
    expect(minerals).toEqual(expect.arrayContaining(["calcite", "dolomite", "forsterite"]));
    // One profile toggle per fitted phase, and wt% ± σ labelled semi-quantitative (no internal standard).
    expect(await page.locator("[data-testid=phase-profile-toggle]").count()).toBe(minerals.length);
    for (const t of await page.locator("[data-testid=fit-wt]").allTextContents()) expect(t).toMatch(/^\d+(\.\d)? ± \d+(\.\d)? wt%$/);
    expect(await page.locator("[data-testid=fit-panel]").textContent()).toMatch(/semi-quantitative/);
    expect(await page.textContent("[data-testid=candidates-notice]")).toMatch(/not an identification/);
    const rwpOf = async () => Number(/Rwp ([\d.]+) %/.exec((await page.textContent("[data-testid=fit-summary]"))!)![1]);
    const rwpBefore = await rwpOf();
    expect(rwpBefore).toBeGreaterThan(0);
    // Evidence: forsterite's stand-alone lines with d and hkl.
    const fo = page.locator("[data-testid=fit-phase][data-mineral=forsterite]");
    await fo.getByRole("button", { name: /standing alone/ }).click();
    expect(await fo.locator("[data-testid=evidence-lines] tbody tr").count()).toBeGreaterThan(0);
    await page.screenshot({ path: join(SHOTS, "wp-review-1-fit.png") });
    await page.screenshot({ path: join(SHOTS, "wp-review-1-fit-full.png"), fullPage: true });

    // A phase profile can be hidden and shown again.
    const toggle = page.locator("[data-testid=phase-profile-toggle]", { hasText: "forsterite" });
    await toggle.click();
    expect(await toggle.getAttribute("aria-pressed")).toBe("false");
    await toggle.click();

    // Remove forsterite and refit: the fit changes, the run list gains a refit run.
    await page.getByRole("button", { name: "Remove forsterite and refit" }).click();
    await expect.poll(() => page.textContent("[data-testid=fit-change]").catch(() => null), { timeout: 15_000 }).toMatch(/Removed forsterite: Rwp/);
    await expect.poll(() => fitted.count()).toBe(minerals.length - 1);
    expect(await page.locator("[data-testid=fit-phase][data-mineral=forsterite]").count()).toBe(0);
    const rwpAfter = await rwpOf();
    // Fewer phases cannot fit the same profile better (nested least-squares models).
    expect(rwpAfter).toBeGreaterThan(rwpBefore);
    expect(await page.getByRole("list", { name: "Processing runs" }).textContent()).toMatch(/refit, 2 phases/);
    // Forsterite's lines are now listed among the peaks the fit does not explain.
    expect(await page.locator("[data-testid=unexplained-peaks] li").count()).toBeGreaterThan(0);
    await page.screenshot({ path: join(SHOTS, "wp-review-2-refit.png") });

    // Accept the two fitted phases and sign off: the fit statistics are recorded with them.
    for (const mineral of ["calcite", "dolomite"]) {
      await page.getByRole("button", { name: `Accept ${mineral}` }).click();
      await expect.poll(() => page.getAttribute(`[data-testid=fit-phase][data-mineral=${mineral}]`, "data-status")).toBe("accepted");
    }
    await page.getByLabel("I have reviewed the pattern and the accepted phases.").check();
    await page.getByRole("button", { name: "Sign off scan" }).click();
    await expect.poll(() => page.textContent("[data-testid=signed-off]"), { timeout: 15_000 }).toMatch(/Signed off by Priya Raman/);
    expect(await page.textContent("[data-testid=signed-off-fit]")).toContain(`Rwp ${rwpAfter.toFixed(2)} %`);
    // Locked: no more refit or decisions.
    expect(await page.getByRole("button", { name: /and refit$/ }).count()).toBe(0);
    expect(await page.getByRole("button", { name: /^Accept / }).count()).toBe(0);
    await page.screenshot({ path: join(SHOTS, "wp-review-3-signed.png"), fullPage: true });
    expect(errors).toEqual([]);
    await page.close();
  });

  test("a project lead sees a demo scan's fit read-only; the sample lists the fit's phases as not confirmed", async () => {
    const page = await browser.newPage({ viewport: { width: 1280, height: 800 } });
    const errors: string[] = [];
    page.on("pageerror", (e) => errors.push(String(e)));
    page.on("console", (m) => m.type() === "error" && errors.push(m.text()));
    await signInAs(page, "lead");
    const projectId = await openDemoProject(page);
    await page.goto(`${baseUrl()}/projects/${projectId}/scans`);
    // Demo scan awaiting review (invented quartz–muscovite–chlorite–pyrite mixture, db/seed/demo-scans.ts).
    await page.getByRole("link", { name: "APR-000009.xy" }).click();
    await page.waitForSelector("[data-testid=fit-panel]");
    const minerals = await page.locator("[data-testid=fit-phase]").evaluateAll((els) => els.map((e) => e.getAttribute("data-mineral")));
    expect(minerals).toContain("quartz");
    // Quartz in the fit is still only a candidate, but its caution shows.
    expect(await page.textContent("[data-testid=silica-caution]")).toContain(SILICA_CAUTION);
    expect(await page.getByRole("button", { name: /and refit$/ }).count()).toBe(0);
    expect(await page.getByRole("button", { name: /^Accept / }).count()).toBe(0);
    await page.screenshot({ path: join(SHOTS, "wp-review-4-lead.png") });

    await page.click("[data-testid=scan-sample-link]");
    await page.waitForSelector("[data-testid=unconfirmed-phases]");
    const unconfirmed = (await page.textContent("[data-testid=unconfirmed-phases]"))!;
    expect(unconfirmed).toMatch(/In the fit, not confirmed/);
    for (const m of minerals) expect(unconfirmed).toContain(m!);
    expect(await page.locator("[data-testid=confirmed-phases]").count()).toBe(0);
    await page.screenshot({ path: join(SHOTS, "wp-review-5-sample.png"), fullPage: true });
    expect(errors).toEqual([]);
    await page.close();
  });
});
