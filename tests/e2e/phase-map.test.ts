import { mkdirSync, writeFileSync } from "node:fs";
import type { Browser } from "playwright-core";
import { afterAll, beforeAll, describe, expect, test } from "vitest";
import { DEMO_SCANS } from "@/db/seed/demo-scans";
import { baseUrl, blockExternalNetwork, isNotBlank, launchBrowser, openDemoProject, signInAs } from "./helpers";

let browser: Browser;
beforeAll(async () => {
  browser = await launchBrowser();
});
afterAll(async () => {
  await browser?.close();
});

/**
 * Stations where the demo seed signs off a scan whose (invented) mixture contains the mineral: the seed
 * plan (db/seed/demo-scans.ts), four samples per station in station order (db/seed/demo.ts).
 */
function plannedStations(mineral: string): string[] {
  const codes = DEMO_SCANS.filter((s) => s.outcome === "signed_off" && mineral in s.mix).map((s) => Math.ceil(Number(s.code.split("-")[1]) / 4));
  return [...new Set(codes)].sort((a, b) => a - b).map((n) => `APR-ST-${String(n).padStart(3, "0")}`);
}

describe("phase map", () => {
  test("a lead filters by one mineral and sees only the stations where it was confirmed", async () => {
    const ctx = await browser.newContext({ viewport: { width: 1360, height: 1000 } });
    const page = await ctx.newPage();
    const blocked = await blockExternalNetwork(page);
    const errors: string[] = [];
    page.on("console", (m) => m.type() === "error" && errors.push(m.text()));
    page.on("pageerror", (e) => errors.push(String(e)));
    await signInAs(page, "lead");
    const projectId = await openDemoProject(page);
    await page.getByRole("link", { name: "Phase map" }).click();
    await page.waitForURL(`**/projects/${projectId}/phase-map`);
    await page.waitForFunction(() => document.querySelectorAll("[data-testid=station-item]").length > 0, null, { timeout: 30_000 });
    const all = await page.locator("[data-testid=station-item]").count();
    // The map opens fitted to the stations (the demo district is ~15 km across), not the whole world.
    await expect.poll(async () => {
      const m = (await page.textContent(".leaflet-control-scale"))?.match(/(\d+)\s*(m|km)/);
      return m ? Number(m[1]) * (m[2] === "km" ? 1000 : 1) : Infinity;
    }, { timeout: 10_000 }).toBeLessThanOrEqual(5000);

    // Choose pyrite in the filter (the option lists the IMA symbol first).
    await page.selectOption("[data-testid=filter-mineral]", "pyrite");
    await page.waitForURL(/mineral=pyrite/);
    const expected = plannedStations("pyrite");
    expect(expected.length).toBeGreaterThan(0);
    await expect.poll(async () => (await page.locator("[data-testid=station-item]").evaluateAll((els) => els.map((e) => e.getAttribute("data-station")))).sort(), { timeout: 15_000 }).toEqual(expected);
    expect(expected.length).toBeLessThan(all);

    // Every listed station shows pyrite as a confirmed chip (filled), never only as a candidate.
    for (const item of await page.locator("[data-testid=station-item]").all()) {
      expect(await item.locator('[title^="pyrite"][title$="— confirmed"]').count()).toBe(1);
    }
    // The map draws the same stations: each drawn station has the pyrite glyph filled ("Py:c"); stations
    // close together at this zoom may be drawn as a cluster, whose count makes up the rest.
    await page.waitForFunction(() => document.querySelectorAll(".lx-phase [data-station], .lx-phase [data-cluster]").length > 0, null, { timeout: 15_000 });
    const markers = await page.locator(".lx-phase [data-station]").evaluateAll((els) => els.map((e) => [e.getAttribute("data-station")!, e.getAttribute("data-symbols")!]));
    const clustered = await page.locator(".lx-phase [data-cluster]").evaluateAll((els) => els.reduce((n, e) => n + Number(e.getAttribute("data-cluster")), 0));
    for (const [code, symbols] of markers) {
      expect(expected).toContain(code);
      expect(symbols).toBe("Py:c");
    }
    expect(markers.length + clustered).toBe(expected.length);
    // The API agrees: only stations with pyrite confirmed.
    const api = await (await page.request.get(`${baseUrl()}/api/projects/${projectId}/phase-map?mineral=pyrite`)).json();
    for (const s of api.stations) expect(s.phases.some((p: { mineral: string; kind: string }) => p.mineral === "pyrite" && p.kind === "confirmed")).toBe(true);

    // With candidates on, stations where pyrite awaits review join, drawn as dashed outlines ("Py:k").
    await page.click("[data-testid=phase-any]");
    await page.waitForURL(/phase=any/);
    await expect.poll(() => page.locator("[data-testid=station-item]").count(), { timeout: 15_000 }).toBeGreaterThanOrEqual(expected.length);

    // Back to confirmed only, open a station: its samples, phases and scan links.
    await page.click("[data-testid=phase-confirmed]");
    await expect.poll(() => page.locator("[data-testid=station-item]").count()).toBe(expected.length);
    await page.locator("[data-testid=station-item]").first().click();
    const panel = page.locator("[data-testid=station-panel]");
    await expect.poll(() => panel.textContent(), { timeout: 15_000 }).toContain("Scans:");
    expect(await panel.locator('a[href*="/scans/"]').count()).toBeGreaterThan(0);

    // The export buttons carry the filter.
    expect(await page.getAttribute("[data-testid=export-xlsx]", "href")).toBe(`/api/projects/${projectId}/exports/xlsx?mineral=pyrite`);

    // Share the filtered selection: a visitor without an account sees exactly those samples; revoked → 410.
    await page.locator("summary", { hasText: "Share this selection" }).click();
    await page.fill('input[name="label"]', "E2E consultant review");
    await page.getByRole("button", { name: "Create link" }).click();
    const shareUrl = await expect.poll(() => page.inputValue("[data-testid=share-url]").catch(() => ""), { timeout: 15_000 }).toMatch(/\/share\//).then(() => page.inputValue("[data-testid=share-url]"));
    const visitor = await browser.newContext();
    const vp = await visitor.newPage();
    expect((await vp.goto(shareUrl))?.status()).toBe(200);
    expect(await vp.textContent("[data-testid=share-filter]")).toBe("mineral = pyrite (confirmed)");
    expect(await vp.locator("[data-testid=share-row]").count()).toBe(Number((await page.textContent("[data-testid=phase-map-summary]"))!.match(/(\d+) samples/)![1]));
    await page.getByRole("button", { name: "Revoke" }).first().click();
    await expect.poll(async () => (await vp.goto(shareUrl))?.status(), { timeout: 15_000 }).toBe(410);
    await visitor.close();

    mkdirSync("test-results", { recursive: true });
    const shot = await page.screenshot({ fullPage: true });
    writeFileSync("test-results/phase-map.png", shot);
    expect(await isNotBlank(await page.locator("#phase-map").screenshot())).toBe(true);
    expect(blocked).toEqual([]);
    expect(errors).toEqual([]);
    await ctx.close();
  });
});
