/**
 * "Make this area available offline" in a production build, on a phone (390×844, a common phone size — common
 * practice): the field geologist saves the area in view for two zoom levels, the tiles land in the service worker's
 * tile cache, and with the network off the map reloads, zooms into the saved level without a failed tile request and
 * still draws the strike/dip symbols. The map opens at the project's stations, not at world zoom.
 */
import { mkdirSync } from "node:fs";
import type { Browser, Page } from "playwright-core";
import { afterAll, beforeAll, describe, expect, test } from "vitest";
import { baseUrl, blockExternalNetwork, isNotBlank, launchBrowser, openDemoProject, signInAs, waitForServiceWorker } from "./helpers";

let browser: Browser;
beforeAll(async () => {
  browser = await launchBrowser();
});
afterAll(async () => {
  await browser?.close();
});

const SHOTS = process.env.E2E_SCREENSHOT_DIR || "test-results/offline-area";

/** The map's scale bar in metres (Leaflet's metric scale line: "500 m", "2 km"). */
async function scaleMetres(page: Page): Promise<number> {
  const t = (await page.textContent(".leaflet-control-scale-line")) ?? "";
  const m = /([\d.]+)\s*(km|m)/.exec(t);
  if (!m) throw new Error(`no scale: ${t}`);
  return Number(m[1]) * (m[2] === "km" ? 1000 : 1);
}

const tilesLoaded = (page: Page, min: number) =>
  page.waitForFunction((n) => [...document.querySelectorAll<HTMLImageElement>("img.leaflet-tile-loaded")].filter((i) => i.src.includes("/tiles-offline/") && i.naturalWidth > 0).length >= n, min, { timeout: 30_000 });

describe("saved offline area on a phone", () => {
  test("save the area in view for two zooms, go offline, reload and zoom in: tiles come from the cache, symbols drawn", async () => {
    mkdirSync(SHOTS, { recursive: true });
    const ctx = await browser.newContext({ viewport: { width: 390, height: 844 }, deviceScaleFactor: 1, isMobile: true, hasTouch: true });
    const page = await ctx.newPage();
    await blockExternalNetwork(page);
    await signInAs(page, "field");
    const projectId = await openDemoProject(page);
    await waitForServiceWorker(page);
    await page.goto(`${baseUrl()}/projects/${projectId}/map`);
    await tilesLoaded(page, 4);
    await page.waitForFunction(() => document.querySelectorAll(".lx-structure svg line").length > 0, null, { timeout: 30_000 });

    // Opens at the field area: a scale bar of kilometres at most, not thousands of kilometres (world zoom).
    expect(await scaleMetres(page)).toBeLessThanOrEqual(5000);
    const symbols = await page.locator(".lx-structure").count();
    expect(symbols).toBeGreaterThan(0);
    // every planar symbol carries its dip as a number (the demo stations have planar readings only)
    const labels = await page.locator(".lx-structure text").allTextContents();
    expect(labels.length).toBe(symbols);
    expect(labels.every((l) => /^\d{1,2}$/.test(l))).toBe(true);
    await page.screenshot({ path: `${SHOTS}/map-symbols-390.png` });
    expect(await isNotBlank(await page.locator("#map").screenshot())).toBe(true);

    // The dialog: current view, zoom now … now + 1.
    await page.getByRole("button", { name: "Save area offline" }).click();
    const dialog = page.getByTestId("offline-area-dialog");
    await expect.poll(() => dialog.isVisible()).toBe(true);
    const zoom = Number(/zoom (\d+)/.exec((await dialog.textContent()) ?? "")?.[1]);
    expect(zoom).toBeGreaterThanOrEqual(11);
    await page.getByLabel("Lowest zoom level").selectOption(String(zoom));
    await page.getByLabel("Highest zoom level").selectOption(String(zoom + 1));
    await page.fill("input[placeholder^='e.g.']", "E2E creek");
    const summary = (await page.getByTestId("oa-summary").textContent()) ?? "";
    const planned = Number(/([\d,]+)\s*tiles, about/.exec(summary)?.[1].replace(/,/g, ""));
    expect(planned).toBeGreaterThan(4);
    expect(summary).toMatch(/Storage on this device: .* used of .* available to this site/);
    await page.screenshot({ path: `${SHOTS}/offline-area-dialog-390.png` });

    const t0 = Date.now();
    await page.getByRole("button", { name: "Download for offline use" }).click();
    await expect.poll(() => page.getByTestId("oa-result").textContent(), { timeout: 60_000 }).toMatch(/Saved “E2E creek”/);
    const wall = Date.now() - t0;
    const result = (await page.getByTestId("oa-result").textContent()) ?? "";
    expect(await page.getByTestId("oa-persist").textContent()).toMatch(/Persistent storage: (granted|not granted)/);
    await expect.poll(() => page.locator("[data-testid=oa-saved] li").count()).toBe(1);
    await page.screenshot({ path: `${SHOTS}/offline-area-saved-390.png` });
    const stored = await page.evaluate(async (z) => {
      const c = await caches.open("map-tiles");
      const keys = (await c.keys()).map((r) => new URL(r.url).pathname).filter((p) => p.startsWith(`/tiles-offline/${z}/`));
      return keys.length;
    }, zoom + 1);
    expect(stored).toBeGreaterThan(0);
    console.log(`[offline-area] planned ${planned} tiles; ${result} (wall ${wall} ms); ${stored} tiles at z${zoom + 1} in the cache`);

    // Offline: reload, zoom in to the saved level.
    await ctx.setOffline(true);
    const failed: string[] = [];
    page.on("requestfailed", (r) => {
      if (r.url().includes("/tiles-offline/")) failed.push(r.url());
    });
    await page.reload();
    await tilesLoaded(page, 4);
    await page.waitForFunction(() => document.querySelectorAll(".lx-structure svg line").length > 0, null, { timeout: 30_000 });
    await page.screenshot({ path: `${SHOTS}/map-offline-reloaded-390.png` });
    // Every tile saved at the finer zoom is served offline by the service worker (a plain fetch goes through it).
    const served = await page.evaluate(async (z) => {
      const c = await caches.open("map-tiles");
      const urls = (await c.keys()).map((r) => r.url).filter((u) => new URL(u).pathname.startsWith(`/tiles-offline/${z}/`));
      const res = await Promise.all(urls.map(async (u) => (await fetch(u)).status));
      return { n: urls.length, ok: res.filter((st) => st === 200).length };
    }, zoom + 1);
    expect(served.n).toBe(stored);
    expect(served.ok).toBe(served.n);
    // And on the map: zoom in one level; the tiles shown are all loaded (256 px images), none failed.
    await page.locator(".leaflet-control-zoom-in").tap();
    await page.waitForTimeout(1500);
    await tilesLoaded(page, 4);
    const tileState = await page.evaluate(() => {
      const imgs = [...document.querySelectorAll<HTMLImageElement>("img.leaflet-tile")].filter((i) => i.src.includes("/tiles-offline/"));
      const zs = imgs.map((i) => Number(new URL(i.src).pathname.split("/")[2]));
      const top = Math.max(...zs);
      const shown = imgs.filter((_, k) => zs[k] === top);
      return { z: top, total: shown.length, ok: shown.filter((i) => i.complete && i.naturalWidth === 256).length };
    });
    console.log(`[offline-area] offline: ${served.ok}/${served.n} saved z${zoom + 1} tiles served; map shows z${tileState.z}: ${tileState.ok}/${tileState.total} tiles loaded`);
    expect(tileState.z).toBe(zoom + 1);
    expect(tileState.total).toBeGreaterThan(0);
    expect(tileState.ok).toBe(tileState.total);
    expect(failed).toEqual([]);
    expect(await page.locator(".lx-structure").count()).toBeGreaterThan(0);
    await page.screenshot({ path: `${SHOTS}/map-offline-zoomed-390.png` });
    expect(await isNotBlank(await page.locator("#map").screenshot())).toBe(true);
    await ctx.close();
  });
});
