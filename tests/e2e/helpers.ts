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
