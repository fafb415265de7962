import type { Browser } from "playwright-core";
import { afterAll, beforeAll, describe, expect, test } from "vitest";
import { baseUrl, launchBrowser, openDemoProject, signInAs, type DemoRole } from "./helpers";

let browser: Browser;
beforeAll(async () => {
  browser = await launchBrowser();
});
afterAll(async () => {
  await browser?.close();
});

const ROLES: [DemoRole, string][] = [
  ["lead", "Project lead"],
  ["field", "Field geologist"],
  ["lab", "Lab analyst"],
  ["consultant", "Consultant (read-only)"],
  ["admin", "Project lead"],
];

describe("sign-in through the real page, every demo role", () => {
  for (const [role, label] of ROLES) {
    test(`${role} signs in and sees the role in the user menu`, async () => {
      const ctx = await browser.newContext();
      const page = await ctx.newPage();
      const errors: string[] = [];
      page.on("console", (m) => m.type() === "error" && errors.push(m.text()));
      await signInAs(page, role);
      await openDemoProject(page);
      await expect.poll(() => page.textContent("[data-testid=user-role]")).toBe(label);
      expect(await page.textContent("[data-testid=count-samples]")).toMatch(/^\d+$/);
      expect(errors).toEqual([]);
      await ctx.close();
    });
  }

  test("a wrong password shows a clear message and stays on the page", async () => {
    const page = await browser.newPage();
    await page.goto(`${baseUrl()}/sign-in`);
    await page.fill("#email", "lead@lithodex.example");
    await page.fill("#password", "not-the-password");
    await page.click("button[type=submit]");
    await expect.poll(() => page.textContent("[role=alert]")).toContain("not right");
    expect(page.url()).toContain("/sign-in");
    await page.close();
  });

  test("tab titles name the project, and the overview's counts lead to their lists", async () => {
    const ctx = await browser.newContext();
    const page = await ctx.newPage();
    await signInAs(page, "lead");
    const projectId = await openDemoProject(page);
    const name = (await page.textContent("h1"))!.trim();
    expect(await page.title()).toBe(`${name} · Lithodex`);
    await page.locator("[data-testid=count-scans] a").click();
    await page.waitForURL(`**/projects/${projectId}/scans`);
    expect(await page.title()).toMatch(/^Scans · [A-Z0-9]+ · Lithodex$/);
    await page.goto(`${baseUrl()}/projects/${projectId}`);
    await page.getByRole("link", { name: "Phases confirmed" }).click();
    await page.waitForURL(`**/projects/${projectId}/samples?status=confirmed`);
    await ctx.close();
  });

  test("signed out, a project URL sends you to sign-in", async () => {
    const page = await browser.newPage();
    await page.goto(`${baseUrl()}/projects`);
    expect(page.url()).toContain("/sign-in");
    await page.close();
  });

  test("a consultant's write is refused by the route handler (403), not only hidden", async () => {
    const ctx = await browser.newContext();
    const page = await ctx.newPage();
    await signInAs(page, "consultant");
    const projectId = await openDemoProject(page);
    const res = await page.request.post(`${baseUrl()}/api/projects/${projectId}/samples`, { data: { sampleType: "soil" }, headers: { origin: baseUrl() } });
    expect(res.status()).toBe(403);
    expect((await res.json()).error.code).toBe("forbidden");
    await ctx.close();
  });

  test("the lead is not a member of the other project: its URLs are 404", async () => {
    const ctx = await browser.newContext();
    const page = await ctx.newPage();
    await signInAs(page, "field");
    // The second field geologist leads the other project; find its id through the API as that user.
    const other = await browser.newContext();
    const op = await other.newPage();
    await op.goto(`${baseUrl()}/sign-in`);
    await op.fill("#email", "field2@lithodex.example");
    await op.fill("#password", "field-demo-2026");
    await op.click("button[type=submit]");
    await op.waitForURL("**/projects");
    const list = await (await op.request.get(`${baseUrl()}/api/projects`)).json();
    const lgr = list.items.find((p: { code: string }) => p.code === "LGR");
    expect(lgr).toBeDefined();
    const leadCtx = await browser.newContext();
    const lp = await leadCtx.newPage();
    await signInAs(lp, "lead");
    const api = await lp.request.get(`${baseUrl()}/api/projects/${lgr.id}`);
    expect(api.status()).toBe(404);
    const pageRes = await lp.goto(`${baseUrl()}/projects/${lgr.id}`);
    expect(pageRes?.status()).toBe(404);
    await Promise.all([ctx.close(), other.close(), leadCtx.close()]);
  });
});
