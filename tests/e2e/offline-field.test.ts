/**
 * Field work without signal, in a production build: after one online visit the app reopens offline (service worker),
 * a station and a sample saved offline wait in the device's outbox ("not yet synced"), survive a reload, and arrive
 * exactly once when the connection returns. Phone viewport 390×844 (a common phone size, "common practice").
 */
import { mkdirSync } from "node:fs";
import type { Browser } from "playwright-core";
import { afterAll, beforeAll, describe, expect, test } from "vitest";
import { baseUrl, blockExternalNetwork, clickEmptyMapUntilVisible, launchBrowser, openDemoProject, signInAs, waitForServiceWorker } from "./helpers";

let browser: Browser;
beforeAll(async () => {
  browser = await launchBrowser();
});
afterAll(async () => {
  await browser?.close();
});

const SHOTS = process.env.E2E_SCREENSHOT_DIR || "test-results/offline-field";

describe("offline capture on a phone", () => {
  test("station and sample saved offline, reload offline, sync once online: exactly one record of each on the server", async () => {
    mkdirSync(SHOTS, { recursive: true });
    const ctx = await browser.newContext({
      viewport: { width: 390, height: 844 },
      deviceScaleFactor: 1,
      isMobile: true,
      hasTouch: true,
      geolocation: { latitude: 37.741194, longitude: -6.621306, accuracy: 6 },
      permissions: ["geolocation"],
    });
    const page = await ctx.newPage();
    await blockExternalNetwork(page);
    await signInAs(page, "field");
    const projectId = await openDemoProject(page);
    const base = `${baseUrl()}/projects/${projectId}`;
    await waitForServiceWorker(page);
    // One online visit of each field screen (the service worker keeps the last copy of each page).
    for (const p of ["/map", "/samples/new", "/samples/quick", "/sync", ""]) {
      await page.goto(`${base}${p}`);
      await page.waitForLoadState("networkidle");
    }
    await page.goto(`${base}/map`);
    await page.waitForFunction(() => document.querySelectorAll("img.leaflet-tile-loaded").length >= 4, null, { timeout: 30_000 });
    await page.screenshot({ path: `${SHOTS}/map-390.png` });
    const manifest = await page.request.get(`${baseUrl()}/manifest.webmanifest`);
    expect(manifest.ok()).toBe(true);
    expect((await manifest.json()).icons.length).toBeGreaterThanOrEqual(2);

    await ctx.setOffline(true);

    // The app opens offline, with the samples on the map from the service worker's last copy of their GeoJSON.
    const samplesOffline = page.waitForResponse((r) => r.url().includes("/samples/export?format=geojson") && r.status() === 200, { timeout: 30_000 });
    await page.goto(`${base}/map`);
    expect((await samplesOffline).fromServiceWorker()).toBe(true);
    await expect.poll(() => page.getByText("Loading stations and samples…").count(), { timeout: 20_000 }).toBe(0);
    await expect.poll(() => page.getByRole("button", { name: "Place station" }).count(), { timeout: 30_000 }).toBe(1);
    await page.getByRole("button", { name: "Place station" }).click();
    await clickEmptyMapUntilVisible(page, "#ns-name");
    await page.fill("#ns-name", "Offline outcrop E2E");
    await page.getByRole("button", { name: "Create station" }).click();
    await expect.poll(() => page.textContent("body")).toMatch(/saved on this device/);

    await page.goto(`${base}/samples/new`);
    await page.fill("#sf-code", "FT-E2E-0001");
    await page.fill("#sf-lith", "gossan");
    await page.getByRole("button", { name: "Create sample" }).click();
    await page.waitForURL("**/sync", { timeout: 30_000 });
    await expect.poll(() => page.locator("[data-testid=outbox-item]").count(), { timeout: 30_000 }).toBe(2);

    // Quick capture offline: device position with its accuracy, pick lists, the pre-printed tag.
    await page.goto(`${base}/samples/quick`);
    await page.getByRole("button", { name: "Use my location" }).click();
    await expect.poll(() => page.textContent("[data-testid=qc-fix]")).toMatch(/37\.741194, -6\.621306 · ± 6 m/);
    await page.getByRole("button", { name: "Soil", exact: true }).click();
    await page.getByRole("button", { name: "gossan", exact: true }).click();
    await page.fill("#qc-tag", "FT-E2E-0002");
    await page.screenshot({ path: `${SHOTS}/quick-capture-offline-390.png`, fullPage: true });
    await page.getByRole("button", { name: "Save on this device" }).click();
    await page.waitForURL("**/sync", { timeout: 30_000 });
    await expect.poll(() => page.locator("[data-testid=outbox-item]").count(), { timeout: 30_000 }).toBe(3);

    // Reload offline: the page opens and the records are still there, marked as not yet synced.
    await page.reload();
    await expect.poll(() => page.locator("[data-testid=outbox-item]").count(), { timeout: 30_000 }).toBe(3);
    expect(await page.getByText("not yet synced").count()).toBeGreaterThanOrEqual(3);
    await page.screenshot({ path: `${SHOTS}/sync-panel-offline-390.png`, fullPage: true });

    await ctx.setOffline(false);
    await page.getByRole("button", { name: "Sync now" }).click();
    await expect.poll(() => page.locator("[data-testid=outbox-empty]").count(), { timeout: 30_000 }).toBe(1);
    await expect.poll(() => page.textContent("[data-testid=last-sync]")).not.toMatch(/not yet/);
    await page.screenshot({ path: `${SHOTS}/sync-panel-synced-390.png`, fullPage: true });

    const samples = await (await page.request.get(`${baseUrl()}/api/projects/${projectId}/samples?code=FT-E2E-0001`)).json();
    expect(samples.total).toBe(1);
    expect(samples.items[0].code).toBe("FT-E2E-0001");
    const quick = await (await page.request.get(`${baseUrl()}/api/projects/${projectId}/samples?code=FT-E2E-0002`)).json();
    expect(quick.total).toBe(1);
    const detail = await (await page.request.get(`${baseUrl()}/api/projects/${projectId}/samples/${quick.items[0].id}`)).json();
    expect(detail).toMatchObject({ sampleType: "soil", lithology: "gossan", locationSource: "device_gnss", horizontalAccuracyM: 6, lat: 37.741194, lon: -6.621306 });
    const stations = await (await page.request.get(`${baseUrl()}/api/projects/${projectId}/stations?q=Offline%20outcrop%20E2E`)).json();
    expect(stations.total).toBe(1);

    // The register as cards on a phone.
    await page.goto(`${base}/samples?code=FT-E2E`);
    await expect.poll(() => page.locator("[data-testid=register-cards] li").count(), { timeout: 30_000 }).toBe(2);
    expect(await page.locator("table").isVisible()).toBe(false);
    await page.screenshot({ path: `${SHOTS}/register-cards-390.png`, fullPage: true });
    await ctx.close();
  });
});
