/**
 * axe-core (Deque, @axe-core/playwright) on the main project pages for the moderate rules that are cheap to keep:
 * heading order (WCAG 2.2 SC 1.3.1 / 2.4.6 best practice: no level skipped, e.g. the map legend was an h3 under the
 * page's h1), one main landmark, region. Fails on any violation of these rules, whatever the impact.
 */
import AxeBuilder from "@axe-core/playwright";
import type { Browser, Page } from "playwright-core";
import { afterAll, beforeAll, expect, test } from "vitest";
import { baseUrl, launchBrowser, openDemoProject, signInAs } from "./helpers";

const RULES = ["heading-order", "landmark-one-main", "landmark-no-duplicate-main", "page-has-heading-one", "empty-heading"];

let browser: Browser;
beforeAll(async () => {
  browser = await launchBrowser();
});
afterAll(async () => {
  await browser?.close();
});

async function violations(page: Page, label: string): Promise<string[]> {
  await page.waitForLoadState("networkidle").catch(() => undefined);
  const result = await new AxeBuilder({ page: page as never }).withRules(RULES).exclude(".leaflet-marker-pane").analyze();
  return result.violations.map((v) => `${label}: ${v.id} (${v.impact}) ×${v.nodes.length} — ${v.nodes.slice(0, 2).map((n) => n.target.join(" ")).join(" | ")}`);
}

test("main project pages: headings in order, one main landmark, a level-one heading", async () => {
  const ctx = await browser.newContext({ viewport: { width: 1280, height: 900 } });
  const page = await ctx.newPage();
  await signInAs(page, "lead");
  const projectId = await openDemoProject(page);
  const p = `/projects/${projectId}`;
  const found: string[] = [];
  for (const [label, path] of [
    ["overview", p],
    ["samples", `${p}/samples`],
    ["stations", `${p}/stations`],
    ["map", `${p}/map`],
    ["phase map", `${p}/phase-map`],
    ["scans", `${p}/scans`],
    ["submissions", `${p}/submissions`],
    ["library", "/library"],
  ] as const) {
    await page.goto(`${baseUrl()}${path}`);
    found.push(...(await violations(page, label)));
  }
  await ctx.close();
  expect(found).toEqual([]);
});
