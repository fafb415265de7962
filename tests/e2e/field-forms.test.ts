/**
 * The field forms check with the server's own schema, loaded on the first check rather than with the page: the
 * first wrong value already gets the schema's message beside its field, a corrected one saves. Also: sign-out from
 * the user menu (the auth client loads on that click) ends the session.
 */
import type { Browser } from "playwright-core";
import { afterAll, beforeAll, describe, expect, test } from "vitest";
import { baseUrl, launchBrowser, openDemoProject, signInAs } from "./helpers";

let browser: Browser;
beforeAll(async () => {
  browser = await launchBrowser();
});
afterAll(async () => {
  await browser?.close();
});

describe("field forms and the session", () => {
  test("a structural measurement: a dip over 90° is refused beside the field on the first try, 35° is added to the table", async () => {
    const ctx = await browser.newContext();
    const page = await ctx.newPage();
    const errors: string[] = [];
    page.on("pageerror", (e) => errors.push(e.message));
    await signInAs(page, "field");
    const projectId = await openDemoProject(page);
    const list = await (await page.request.get(`${baseUrl()}/api/projects/${projectId}/stations`)).json();
    const st = list.items[0] as { id: string };
    await page.goto(`${baseUrl()}/projects/${projectId}/stations/${st.id}`);
    await page.waitForLoadState("networkidle");
    const form = page.locator("details", { has: page.locator("#sf-strike") });
    if ((await form.getAttribute("open")) === null) await form.locator("summary").click();

    const note = `E2E joint ${Date.now()}`;
    await page.selectOption("#sf-feature", "joint");
    await page.fill("#sf-strike", "120");
    await page.fill("#sf-dip", "95");
    await page.fill("#sf-note", note);
    await page.getByRole("button", { name: "Add measurement" }).click();
    await expect.poll(() => form.textContent(), { timeout: 15_000 }).toContain("Dip must be between 0 and 90°.");
    expect(await page.getAttribute("#sf-dip", "aria-invalid")).toBe("true");
    expect(await page.locator("[data-testid=structure-table] tr", { hasText: note }).count()).toBe(0);

    await page.fill("#sf-dip", "35");
    await page.getByRole("button", { name: "Add measurement" }).click();
    await expect.poll(() => page.locator("[data-testid=structure-table] tr", { hasText: note }).count(), { timeout: 15_000 }).toBe(1);
    const saved = (await (await page.request.get(`${baseUrl()}/api/projects/${projectId}/stations/${st.id}`)).json()) as { structures: { note: string | null; dip: number; strike: number | null }[] };
    expect(saved.structures.find((s) => s.note === note)).toMatchObject({ dip: 35 });
    expect(errors).toEqual([]);
    await ctx.close();
  });

  test("sign-out from the user menu ends the session: the project list then asks to sign in", async () => {
    const ctx = await browser.newContext();
    const page = await ctx.newPage();
    await signInAs(page, "lead");
    await openDemoProject(page);
    await page.getByTestId("user-menu").click();
    await page.getByRole("menuitem", { name: "Sign out" }).click();
    await page.waitForURL("**/sign-in", { timeout: 15_000 });
    await page.goto(`${baseUrl()}/projects`);
    expect(page.url()).toContain("/sign-in");
    const session = await page.request.get(`${baseUrl()}/api/auth/get-session`);
    expect(await session.text()).toMatch(/^(null|)$/);
    await ctx.close();
  });
});
