import { mkdtempSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import type { Browser } from "playwright-core";
import { afterAll, beforeAll, describe, expect, test } from "vitest";
import { SILICA_CAUTION } from "@/components/cautions/caution-texts";
import { quartzCalciteXy } from "../fixtures/lab/handbook-scans";
import { baseUrl, isNotBlank, launchBrowser, openDemoProject, signInAs } from "./helpers";

let browser: Browser;
beforeAll(async () => {
  browser = await launchBrowser();
});
afterAll(async () => {
  await browser?.close();
});

describe("lab analyst: upload a scan, review the candidates, sign off", () => {
  test("upload → diffractogram and candidates → accept → sign off → the sample shows the confirmed phase", async () => {
    // A synthetic scan built from handbook quartz and calcite lines (tests/fixtures/lab/handbook-scans.ts).
    const dir = mkdtempSync(join(tmpdir(), "lithodex-scan-"));
    const file = join(dir, "APR-000033.xy");
    writeFileSync(file, quartzCalciteXy({ seed: 33 }));

    const page = await browser.newPage({ viewport: { width: 1360, height: 1000 } });
    const errors: string[] = [];
    page.on("pageerror", (e) => errors.push(String(e)));
    page.on("console", (m) => m.type() === "error" && errors.push(m.text()));
    await signInAs(page, "lab");
    const projectId = await openDemoProject(page);

    await page.goto(`${baseUrl()}/projects/${projectId}/scans/upload`);
    await page.getByPlaceholder("Type a sample code").fill("APR-000033");
    await page.getByRole("option", { name: /APR-000033/ }).click();
    await expect.poll(() => page.textContent("[data-testid=picked-sample]")).toMatch(/APR-000033/);
    await page.setInputFiles("input[type=file][name=file]", file);
    // The browser reads the file first and says what it found.
    await expect.poll(() => page.textContent("[data-testid=file-check]")).toMatch(/3001 points, 10–70° 2θ/);
    await page.getByRole("button", { name: "Upload and process" }).click();
    await page.waitForURL(/\/scans\/[0-9a-f-]{36}$/);

    // Processing runs on the server; the page follows it and then shows the results.
    await page.waitForSelector("[data-testid=candidate-list]", { timeout: 60_000 });
    const canvas = page.locator("[data-testid=diffractogram] canvas").first();
    await canvas.waitFor();
    await page.waitForTimeout(300);
    expect(await isNotBlank(await canvas.screenshot())).toBe(true);
    // The whole-pattern fit keeps quartz and calcite; the search's other candidates are listed beside it.
    await expect.poll(() => page.locator("[data-testid=fit-phase][data-mineral=quartz]").count()).toBe(1);
    await expect.poll(() => page.locator("[data-testid=fit-phase][data-mineral=calcite]").count()).toBe(1);
    expect(await page.textContent("[data-testid=candidates-notice]")).toMatch(/not an identification/);
    // Quartz is crystalline silica: the caution (our advisory wording) is on the page.
    expect(await page.textContent("[data-testid=silica-caution]")).toContain(SILICA_CAUTION);
    expect(await page.locator("[data-testid=peak-table] tbody tr").count()).toBeGreaterThan(10);

    // Reference lines of another candidate can be drawn over the pattern.
    const other = page.locator("[data-testid=candidate]").first();
    const otherMineral = await other.getAttribute("data-mineral");
    await other.locator("input[type=checkbox]").check();
    // The pattern is computed on the server for the scan's wavelength (a worker thread; allow for its start-up).
    await expect.poll(() => page.getByText(new RegExp(`${otherMineral} \\(calculated lines, scaled`)).count(), { timeout: 15_000 }).toBe(1);

    for (const mineral of ["quartz", "calcite"]) {
      await page.getByRole("button", { name: `Accept ${mineral}` }).click();
      await expect.poll(() => page.getAttribute(`[data-testid=fit-phase][data-mineral=${mineral}]`, "data-status")).toBe("accepted");
    }
    await page.getByLabel("I have reviewed the pattern and the accepted phases.").check();
    await page.getByRole("button", { name: "Sign off scan" }).click();
    await expect.poll(() => page.textContent("[data-testid=signed-off]"), { timeout: 15_000 }).toMatch(/Signed off by Priya Raman/);
    // Locked: no more accept/reject buttons.
    expect(await page.getByRole("button", { name: /^Accept / }).count()).toBe(0);

    await page.click("[data-testid=scan-sample-link]");
    await page.waitForSelector("[data-testid=confirmed-phases]");
    const confirmed = await page.locator("[data-testid=confirmed-phase]").allTextContents();
    expect(confirmed.map((t) => t.trim().toLowerCase()).sort()).toEqual(["calcite", "quartz"]);
    expect(errors).toEqual([]);
    await page.close();
  });

  test("the diabase scan shows the asbestos caution to a consultant, who cannot review", async () => {
    const page = await browser.newPage();
    await signInAs(page, "consultant");
    const projectId = await openDemoProject(page);
    await page.goto(`${baseUrl()}/projects/${projectId}/scans`);
    await page.getByRole("link", { name: "APR-000029.xy" }).click();
    await page.waitForSelector("[data-testid=candidate-list]");
    expect(await page.textContent("[data-testid=asbestos-caution]")).toMatch(/Possible asbestiform mineral: .*tremolite/);
    expect(await page.getByRole("button", { name: /^Accept / }).count()).toBe(0);
    await page.close();
  });
});
