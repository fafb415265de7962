import { chromium, type Browser, type Page } from "playwright-core";
import sharp from "sharp";
import { inject } from "vitest";
import { DEMO_USERS } from "@/db/seed/scenario";

export const baseUrl = () => inject("baseUrl");

/** Debian's Chromium, headless, with the flags this machine needs (no background network). */
export function launchBrowser(): Promise<Browser> {
  return chromium.launch({
    executablePath: process.env.CHROMIUM_PATH || "/usr/bin/chromium",
    args: ["--headless", "--no-sandbox", "--disable-gpu", "--disable-quic", "--no-first-run", "--disable-background-networking", "--disable-component-update", "--disable-sync"],
  });
}

export type DemoRole = "admin" | "lead" | "field" | "lab" | "consultant";

export function demoUser(role: DemoRole) {
  const u = DEMO_USERS.find((x) => x.key === role);
  if (!u) throw new Error(`no demo user ${role}`);
  return u;
}

/** Signs in through the real sign-in page and waits for the project list. */
export async function signInAs(page: Page, role: DemoRole): Promise<void> {
  const u = demoUser(role);
  await page.goto(`${baseUrl()}/sign-in`);
  await page.fill("#email", u.email);
  await page.fill("#password", u.password);
  await page.click("button[type=submit]");
  await page.waitForURL("**/projects");
}

/** Aborts every request that does not go to this machine, so offline behaviour is real. */
export async function blockExternalNetwork(page: Page): Promise<string[]> {
  const blocked: string[] = [];
  await page.route("**/*", (route) => {
    const host = new URL(route.request().url()).hostname;
    if (host === "localhost" || host === "127.0.0.1" || route.request().url().startsWith("data:")) return route.continue();
    blocked.push(route.request().url());
    return route.abort();
  });
  return blocked;
}

/** True when an image has visible structure (some channel's standard deviation above `min`). */
export async function isNotBlank(png: Buffer, min = 5): Promise<boolean> {
  const stats = await sharp(png).stats();
  return stats.channels.slice(0, 3).some((c) => c.stdev > min);
}

/** The id of the demo project, from the project list. */
export async function openDemoProject(page: Page): Promise<string> {
  await page.goto(`${baseUrl()}/projects`);
  await page.click("text=Arroyo Pinar");
  await page.waitForURL(/\/projects\/[^/]+$/);
  return page.url().split("/projects/")[1];
}

/**
 * A point on the map (#map) where a click reaches the map itself (a tile or the empty container), not a marker, a
 * symbol or a control, and which is not under the phone's bottom navigation. Where the stations sit depends on the
 * map's fitted extent, so a fixed fraction of the box can land on a marker.
 */
export async function emptyMapPoint(page: Page): Promise<{ x: number; y: number }> {
  // Not while the map is still zooming to its fitted extent (Leaflet marks the map pane during the animation).
  await page.waitForFunction(() => !document.querySelector("#map .leaflet-zoom-anim"), null, { timeout: 10_000 });
  const spot = await page.evaluate(() => {
    const m = document.querySelector("#map")!.getBoundingClientRect();
    const bottom = Math.min(m.bottom, window.innerHeight - 120);
    for (let fy = 0.35; fy <= 0.95; fy += 0.05) {
      for (let fx = 0.25; fx <= 0.85; fx += 0.05) {
        const x = m.left + m.width * fx;
        const y = m.top + (bottom - m.top) * fy;
        const el = document.elementFromPoint(x, y);
        if (el && (el.classList.contains("leaflet-tile") || el.classList.contains("leaflet-container"))) return { x, y };
      }
    }
    return null;
  });
  if (!spot) throw new Error("no empty point on the map to click");
  return spot;
}

/** Clicks empty map points (see emptyMapPoint) until the element the click should open is visible, three tries. */
export async function clickEmptyMapUntilVisible(page: Page, selector: string): Promise<void> {
  for (let attempt = 0; attempt < 3; attempt++) {
    const spot = await emptyMapPoint(page);
    await page.mouse.click(spot.x, spot.y);
    if (await page.locator(selector).waitFor({ state: "visible", timeout: 5_000 }).then(() => true, () => false)) return;
  }
  throw new Error(`clicking the map did not open ${selector}`);
}

/** Waits until the service worker controls the page (one reload when it installed after the page loaded). */
export async function waitForServiceWorker(page: Page): Promise<void> {
  await page.waitForFunction(async () => !!(await navigator.serviceWorker?.ready), null, { timeout: 60_000 });
  if (!(await page.evaluate(() => !!navigator.serviceWorker.controller))) await page.reload();
  await page.waitForFunction(() => !!navigator.serviceWorker.controller, null, { timeout: 30_000 });
}
