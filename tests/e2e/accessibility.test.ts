/**
 * WCAG 2.2 AA checks with axe-core (Deque's engine, @axe-core/playwright) on the main pages, signed in as the demo
 * lead: any violation of impact "serious" or "critical" fails. Tags: wcag2a, wcag2aa, wcag21a, wcag21aa, wcag22aa.
 */
import AxeBuilder from "@axe-core/playwright";
import type { Browser, Page } from "playwright-core";
import { afterAll, beforeAll, describe, expect, test } from "vitest";
import { baseUrl, launchBrowser, openDemoProject, signInAs } from "./helpers";

let browser: Browser;
beforeAll(async () => {
  browser = await launchBrowser();
});
afterAll(async () => {
  await browser?.close();
});

async function seriousViolations(page: Page, label: string): Promise<string[]> {
  await page.waitForLoadState("networkidle").catch(() => undefined);
  // @axe-core/playwright types name @playwright/test's Page; playwright-core's is the same object.
  // Map markers are excluded: every marker has an equivalent control outside the map (the station list beside
  // each map, keyboard reachable), which WCAG 2.2 SC 2.5.8 accepts as the "equivalent" exception.
  const result = await new AxeBuilder({ page: page as never })
    .withTags(["wcag2a", "wcag2aa", "wcag21a", "wcag21aa", "wcag22aa"])
    .exclude(".leaflet-marker-pane")
    .analyze();
  return result.violations
    .filter((v) => v.impact === "serious" || v.impact === "critical")
    .map((v) => `${label}: ${v.id} (${v.impact}) ×${v.nodes.length} — ${v.nodes.slice(0, 2).map((n) => n.target.join(" ")).join(" | ")}`);
}

/** The first link on the page whose path matches `re` (a record page), or null. */
async function firstRecord(page: Page, re: RegExp): Promise<string | null> {
  const hrefs = await page.$$eval("a[href]", (as) => as.map((a) => a.getAttribute("href") ?? ""));
  return hrefs.find((h) => re.test(h)) ?? null;
}

describe("accessibility (axe-core, serious and critical)", () => {
  test("sign-in and 404 pages", async () => {
    const ctx = await browser.newContext();
    const page = await ctx.newPage();
    const found: string[] = [];
    await page.goto(`${baseUrl()}/sign-in`);
    found.push(...(await seriousViolations(page, "sign-in")));
    await signInAs(page, "lead");
    await page.goto(`${baseUrl()}/no-such-page`);
    found.push(...(await seriousViolations(page, "404")));
    await ctx.close();
    expect(found).toEqual([]);
  });

  test("the main pages of a project, as the lead", async () => {
    const ctx = await browser.newContext({ viewport: { width: 1280, height: 900 } });
    const page = await ctx.newPage();
    await signInAs(page, "lead");
    const found: string[] = [...(await seriousViolations(page, "projects"))];
    const projectId = await openDemoProject(page);
    const p = `/projects/${projectId}`;
    const pages: [string, string][] = [
      ["overview", p],
      ["samples", `${p}/samples`],
      ["stations", `${p}/stations`],
      ["map", `${p}/map`],
      ["phase map", `${p}/phase-map`],
      ["scans", `${p}/scans`],
      ["submissions", `${p}/submissions`],
      ["library", "/library"],
    ];
    for (const [label, path] of pages) {
      await page.goto(`${baseUrl()}${path}`);
      found.push(...(await seriousViolations(page, label)));
      if (label === "samples" || label === "stations" || label === "scans") {
        const re = new RegExp(`^${p}/${label}/[0-9a-f-]{36}$`);
        const rec = await firstRecord(page, re);
        if (rec) {
          await page.goto(`${baseUrl()}${rec}`);
          found.push(...(await seriousViolations(page, `${label} record`)));
        }
      }
    }
    await ctx.close();
    expect(found).toEqual([]);
  });
});
