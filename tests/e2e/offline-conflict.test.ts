/**
 * Offline field work with reserved sample codes and an edit conflict, in a production build at 390×844 (a common
 * phone size, "common practice"): the field geologist's phone reserves a block of sample codes while online; offline,
 * a new sample takes the next code of the block (provisional until synced) and a station is edited while the lead
 * changes the same station on the server; back online the sample arrives with its reserved code and the station edit
 * is shown side by side (optimistic concurrency, DEVELOPERS.md) for the person to resolve — never an overwrite; a
 * structural measurement edited offline arrives with the version it was made against.
 */
import { mkdirSync } from "node:fs";
import { join } from "node:path";
import { createClient } from "@libsql/client";
import type { Browser } from "playwright-core";
import { afterAll, beforeAll, describe, expect, inject, test } from "vitest";
import { baseUrl, blockExternalNetwork, launchBrowser, openDemoProject, signInAs, waitForServiceWorker } from "./helpers";

let browser: Browser;
beforeAll(async () => {
  browser = await launchBrowser();
});
afterAll(async () => {
  await browser?.close();
});

const SHOTS = process.env.E2E_SCREENSHOT_DIR || "test-results/offline-conflict";

describe("offline codes and conflicts on a phone", () => {
  test("a reserved code survives offline capture; an offline station edit meets the lead's change and is resolved side by side", async () => {
    mkdirSync(SHOTS, { recursive: true });
    const ctx = await browser.newContext({ viewport: { width: 390, height: 844 }, deviceScaleFactor: 1, isMobile: true, hasTouch: true });
    const page = await ctx.newPage();
    await blockExternalNetwork(page);
    await signInAs(page, "field");
    const projectId = await openDemoProject(page);
    const base = `${baseUrl()}/projects/${projectId}`;
    await waitForServiceWorker(page);

    // Online once: the project shell reserves a block of codes for this device; the sync page shows it.
    await page.goto(`${base}/sync`);
    await expect.poll(() => page.locator("[data-testid=code-block]").count(), { timeout: 30_000 }).toBeGreaterThanOrEqual(1);
    const blockText = (await page.textContent("[data-testid=code-block]"))!;
    const [, firstCode, lastCode] = /([A-Z0-9-]+)–([A-Z0-9-]+) · 0 used · 20 left/.exec(blockText) ?? [];
    expect(firstCode, blockText).toBeTruthy();
    await page.locator("[data-testid=code-blocks]").screenshot({ path: `${SHOTS}/code-block-390.png` });
    await page.screenshot({ path: `${SHOTS}/sync-code-block-390.png`, fullPage: true });

    // A station to edit, and one online visit of each screen used offline.
    const list = await (await page.request.get(`${baseUrl()}/api/projects/${projectId}/stations`)).json();
    const st = list.items[0] as { id: string; code: string };
    const before = await (await page.request.get(`${baseUrl()}/api/projects/${projectId}/stations/${st.id}`)).json();
    // A measurement at the station, to be edited offline too.
    const made = await page.request.post(`${baseUrl()}/api/projects/${projectId}/stations/${st.id}/structures`, {
      data: { convention: "dip_dipdir", feature: "foliation", dipDirection: 40, dip: 60, note: "E2E foliation" },
      headers: { origin: baseUrl() },
    });
    expect(made.status()).toBe(201);
    const structureId = (await made.json()).id as string;
    for (const p of ["/samples/new", "/samples/quick", `/stations/${st.id}/edit`, `/stations/${st.id}`, "/sync"]) {
      await page.goto(`${base}${p}`);
      await page.waitForLoadState("networkidle");
    }

    await ctx.setOffline(true);

    // Quick capture shows the code a sample saved now would take, before saving (to write it on the bag).
    await page.goto(`${base}/samples/quick`);
    await expect.poll(() => page.getAttribute("#qc-tag", "placeholder"), { timeout: 15_000 }).toBe(firstCode);
    expect(await page.textContent("form[aria-label='Quick sample']")).toContain(`Leave empty to use ${firstCode}, reserved for this device`);

    // A sample saved offline takes the first code of the block.
    await page.goto(`${base}/samples/new`);
    await expect.poll(() => page.getAttribute("#sf-code", "placeholder"), { timeout: 15_000 }).toBe(firstCode);
    await page.fill("#sf-lith", "gossan");
    await page.getByRole("button", { name: "Create sample" }).click();
    await page.waitForURL("**/sync", { timeout: 30_000 });
    await expect.poll(() => page.locator("[data-testid=outbox-item]").count(), { timeout: 30_000 }).toBe(1);
    expect(await page.textContent("[data-testid=outbox-item]")).toContain(`New sample (code ${firstCode}, provisional until synced)`);
    await expect.poll(() => page.textContent("[data-testid=code-block]")).toContain("1 used · 19 left");

    // The station edited offline.
    await page.goto(`${base}/stations/${st.id}/edit`);
    await page.waitForLoadState("load");
    await page.waitForTimeout(1000); // let the form hydrate before typing
    await page.fill("#st-desc", "Gossan cap over sheared schist (edited offline)");
    expect(await page.inputValue("#st-desc")).toBe("Gossan cap over sheared schist (edited offline)");
    await page.getByRole("button", { name: "Save changes" }).click();
    await expect.poll(() => page.locator("[data-testid=station-queued]").count(), { timeout: 30_000 }).toBe(1);

    // A structural measurement edited offline (re-entered: dip 60 → 55).
    await page.goto(`${base}/stations/${st.id}`);
    const row = page.locator("[data-testid=structure-table] tr", { hasText: "E2E foliation" });
    await row.getByRole("button", { name: "Edit" }).click();
    await page.fill("#se-dip", "55");
    await page.getByRole("button", { name: "Save measurement" }).click();
    await expect.poll(() => page.textContent("body"), { timeout: 30_000 }).toMatch(/the edit is saved on this device/);

    // Meanwhile the lead changes the same station on the server (another session).
    const lead = await browser.newContext();
    const leadPage = await lead.newPage();
    await signInAs(leadPage, "lead");
    const theirs = await leadPage.request.patch(`${baseUrl()}/api/projects/${projectId}/stations/${st.id}`, {
      data: { version: before.version, name: "Ridge north (lead)", description: "Gossan cap, lead's note" },
      headers: { origin: baseUrl() },
    });
    expect(theirs.status()).toBe(200);
    await lead.close();

    // Back online: sync. The sample goes through; the station edit is a conflict shown side by side.
    await ctx.setOffline(false);
    await page.goto(`${base}/sync`);
    await page.getByRole("button", { name: "Sync now" }).click();
    await expect.poll(() => page.locator("[data-testid=conflict-panel]").count(), { timeout: 30_000 }).toBe(1);
    expect(await page.textContent("[data-testid=theirs-description]")).toBe("Gossan cap, lead's note");
    expect(await page.textContent("[data-testid=mine-description]")).toBe("Gossan cap over sheared schist (edited offline)");
    // There is no form on the sync page: the panel says where the edit waits.
    expect(await page.textContent("[data-testid=conflict-panel]")).toContain("your edit is kept on this device until you choose");
    // Only the field changed here is compared: the lead's new name is not put back by this edit.
    expect(await page.locator("[data-testid=theirs-name]").count()).toBe(0);
    await page.locator("[data-testid=conflict-panel]").scrollIntoViewIfNeeded();
    await page.screenshot({ path: `${SHOTS}/conflict-390.png`, fullPage: true });

    // Resolve: keep mine (sent against their version).
    await page.getByRole("button", { name: "Save my values over theirs" }).click();
    await page.getByRole("button", { name: "Sync now" }).click();
    await expect.poll(() => page.locator("[data-testid=outbox-empty]").count(), { timeout: 30_000 }).toBe(1);
    await page.screenshot({ path: `${SHOTS}/sync-resolved-390.png`, fullPage: true });

    // The database: the sample once, with its reserved code; the station with the lead's name and my description.
    const db = createClient({ url: `file:${join(inject("dataDir"), "e2e.db")}` });
    try {
      const s = await db.execute({ sql: "SELECT id, lithology FROM samples WHERE project_id = ? AND code = ?", args: [projectId, firstCode] });
      expect(s.rows).toHaveLength(1);
      expect(s.rows[0].lithology).toBe("gossan");
      const r = await db.execute({ sql: "SELECT sample_id FROM reserved_sample_codes WHERE project_id = ? AND code = ?", args: [projectId, firstCode] });
      expect(r.rows[0].sample_id).toBe(s.rows[0].id);
      const row = (await db.execute({ sql: "SELECT name, description, version FROM stations WHERE id = ?", args: [st.id] })).rows[0];
      expect(row).toMatchObject({ name: "Ridge north (lead)", description: "Gossan cap over sheared schist (edited offline)", version: before.version + 2 });
      const n = await db.execute({ sql: "SELECT count(*) AS n FROM stations WHERE project_id = ? AND code = ?", args: [projectId, st.code] });
      expect(n.rows[0].n).toBe(1);
      // The measurement edit went through without a conflict: dip 55, stored direction unchanged, version 2.
      const m = (await db.execute({ sql: "SELECT dip_direction, dip, version FROM structures WHERE id = ?", args: [structureId] })).rows[0];
      expect(m).toMatchObject({ dip_direction: 40, dip: 55, version: 2 });
    } finally {
      db.close();
    }
    expect(lastCode).toBeTruthy();
    await ctx.close();
  });
});
