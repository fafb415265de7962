import type { Browser } from "playwright-core";
import { afterAll, beforeAll, describe, expect, test } from "vitest";
import { baseUrl, blockExternalNetwork, isNotBlank, launchBrowser, openDemoProject, signInAs } from "./helpers";

let browser: Browser;
beforeAll(async () => {
  browser = await launchBrowser();
});
afterAll(async () => {
  await browser?.close();
});

describe("project map, offline", () => {
  test("with only localhost reachable the map shows the bundled tiles, and a station placed by click appears in the list", async () => {
    const ctx = await browser.newContext({ viewport: { width: 1280, height: 900 } });
    const page = await ctx.newPage();
    const blocked = await blockExternalNetwork(page);
    const errors: string[] = [];
    page.on("console", (m) => m.type() === "error" && errors.push(m.text()));
    await signInAs(page, "field");
    const projectId = await openDemoProject(page);
    await page.goto(`${baseUrl()}/projects/${projectId}/map`);

    // Tiles come from public/tiles-offline; wait until several have loaded.
    await page.waitForFunction(() => [...document.querySelectorAll("img.leaflet-tile-loaded")].filter((i) => (i as HTMLImageElement).src.includes("/tiles-offline/")).length >= 4, null, { timeout: 30_000 });
    await page.waitForFunction(() => document.querySelectorAll(".lx-cluster, .lx-symbol").length > 0, null, { timeout: 30_000 });
    const shot = await page.locator("#map").screenshot();
    expect(await isNotBlank(shot)).toBe(true);

    await page.getByRole("button", { name: "Place station" }).click();
    const box = (await page.locator("#map").boundingBox())!;
    // A spot away from the controls (zoom top-left, layers top-right) and, in the demo, from the stations.
    await page.mouse.click(box.x + box.width * 0.42, box.y + box.height * 0.88);
    await page.fill("#ns-name", "E2E outcrop placed on the map");
    const lat = Number(await page.inputValue("#ns-lat"));
    const lon = Number(await page.inputValue("#ns-lon"));
    expect(Math.abs(lat)).toBeLessThanOrEqual(90);
    await page.getByRole("button", { name: "Create station" }).click();
    await expect.poll(() => page.textContent("[role=status]")).toMatch(/Station APR-ST-\d+ created/);
    await expect.poll(() => page.textContent("[data-testid=station-list]")).toContain("E2E outcrop placed on the map");

    // The stored position is the picked one (6 decimals).
    const res = await page.request.get(`${baseUrl()}/api/projects/${projectId}/stations?limit=2000`);
    const made = (await res.json()).items.find((s: { name: string | null }) => s.name === "E2E outcrop placed on the map");
    expect(made.lat).toBeCloseTo(lat, 6);
    expect(made.lon).toBeCloseTo(lon, 6);
    const detail = await (await page.request.get(`${baseUrl()}/api/projects/${projectId}/stations/${made.id}`)).json();
    expect(detail.locationSource).toBe("map");

    expect(blocked).toEqual([]);
    expect(errors).toEqual([]);
    await ctx.close();
  });

  test("'Filter register to this view' opens the register with a bbox filter", async () => {
    const ctx = await browser.newContext({ viewport: { width: 1280, height: 900 } });
    const page = await ctx.newPage();
    await blockExternalNetwork(page);
    await signInAs(page, "consultant");
    const projectId = await openDemoProject(page);
    await page.goto(`${baseUrl()}/projects/${projectId}/map`);
    await page.waitForFunction(() => document.querySelectorAll(".lx-cluster, .lx-symbol").length > 0, null, { timeout: 30_000 });
    expect(await page.getByRole("button", { name: "Place station" }).count()).toBe(0); // read-only role
    await page.getByRole("button", { name: "Filter register to this view" }).click();
    await page.waitForURL(/\/samples\?bbox=/);
    await expect.poll(() => page.textContent("[data-testid=register-total]")).toMatch(/^[1-9]\d* samples/);
    await ctx.close();
  });
});
