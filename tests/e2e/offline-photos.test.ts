/**
 * Photos without signal, in a production build on a phone viewport (390×844, a common phone size, "common
 * practice"): after one online visit, one station and three quick-capture samples with photos are saved offline;
 * after a reload offline they are still "not yet synced"; back online one sync sends the records, then the photos
 * (resumable, tus 1.0.0), and the database holds each record and each photo exactly once with the SHA-256 of the
 * bytes chosen (node:crypto as the independent hash). One photo's upload is cut in the middle (a chunk aborted)
 * and resumes from the server's offset.
 */
import { createHash } from "node:crypto";
import { mkdirSync } from "node:fs";
import { join } from "node:path";
import { createClient } from "@libsql/client";
import type { Browser } from "playwright-core";
import sharp from "sharp";
import { afterAll, beforeAll, describe, expect, inject, test } from "vitest";
import { noise } from "../helpers/photo-fixtures";
import { baseUrl, blockExternalNetwork, clickEmptyMapUntilVisible, launchBrowser, openDemoProject, signInAs, waitForServiceWorker } from "./helpers";

let browser: Browser;
beforeAll(async () => {
  browser = await launchBrowser();
});
afterAll(async () => {
  await browser?.close();
});

const SHOTS = process.env.E2E_SCREENSHOT_DIR || "test-results/offline-photos";
const sha = (b: Uint8Array) => createHash("sha256").update(b).digest("hex");

const jpeg = (w: number, h: number, seed: number) => sharp(noise(w, h, seed), { raw: { width: w, height: h, channels: 3 } }).jpeg({ quality: 95 }).toBuffer();

describe("offline photos on a phone", () => {
  test("a station and 3 samples with photos saved offline arrive exactly once; a cut photo upload resumes", async () => {
    mkdirSync(SHOTS, { recursive: true });
    const tags = ["FT-PH-0001", "FT-PH-0002", "FT-PH-0003"];
    // Two phone-sized photos and one camera-sized one (noise barely compresses: several MB, five or more chunks).
    const files = [await jpeg(800, 600, 11), await jpeg(800, 600, 12), await jpeg(2600, 1950, 13)];
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
    for (const p of ["/map", "/samples/quick", "/sync", ""]) {
      await page.goto(`${base}${p}`);
      await page.waitForLoadState("networkidle");
    }

    await ctx.setOffline(true);

    // A station placed on the map offline.
    await page.goto(`${base}/map`);
    await expect.poll(() => page.getByRole("button", { name: "Place station" }).count(), { timeout: 30_000 }).toBe(1);
    await page.getByRole("button", { name: "Place station" }).click();
    await clickEmptyMapUntilVisible(page, "#ns-name");
    await page.fill("#ns-name", "Offline photo outcrop E2E");
    await page.getByRole("button", { name: "Create station" }).click();
    await expect.poll(() => page.textContent("body")).toMatch(/saved on this device/);

    // Three quick-capture samples, each with a photo, offline.
    for (const [i, tag] of tags.entries()) {
      await page.goto(`${base}/samples/quick`);
      await page.locator("[data-testid=qc-photo-input]").setInputFiles({ name: `outcrop-${i + 1}.jpg`, mimeType: "image/jpeg", buffer: files[i] });
      await page.getByRole("button", { name: "gossan", exact: true }).click();
      await page.fill("#qc-tag", tag);
      await page.getByRole("button", { name: "Save on this device" }).click();
      await page.waitForURL("**/sync", { timeout: 30_000 });
    }
    await expect.poll(() => page.locator("[data-testid=queued-photo]").count(), { timeout: 30_000 }).toBe(3);

    // Reload offline: records and photos are still on the device, not yet synced.
    await page.reload();
    await expect.poll(() => page.locator("[data-testid=queued-photo]").count(), { timeout: 30_000 }).toBe(3);
    await expect.poll(() => page.locator("[data-testid=outbox-item]").count(), { timeout: 30_000 }).toBeGreaterThanOrEqual(4);
    expect(await page.getByText("not yet synced").count()).toBeGreaterThanOrEqual(7);
    await page.screenshot({ path: `${SHOTS}/sync-panel-queued-photos-390.png`, fullPage: false });
    await page.screenshot({ path: `${SHOTS}/sync-panel-queued-photos-full-390.png`, fullPage: true });

    // Back online. The big photo's chunk at byte ≥ 2 MiB is cut (aborted) once; the client must resume from the offset.
    const seen: string[] = [];
    let patches = 0;
    let cut = 0;
    const big = { start: 0, end: 0 };
    await page.route("**/photo-uploads**", async (route) => {
      const req = route.request();
      seen.push(req.method());
      if (req.method() === "PATCH") {
        patches++;
        if (cut === 0 && Number(req.headers()["upload-offset"]) >= 2 * 1024 * 1024) {
          cut++;
          return route.abort("connectionreset");
        }
      }
      if (req.method() === "POST" && req.headers()["upload-length"] === String(files[2].byteLength)) big.start = Date.now();
      return route.fallback();
    });
    page.on("response", (res) => {
      // The big photo is sent last (oldest first): the last stored answer (200) ends it.
      if (res.request().method() === "PATCH" && res.url().includes("/photo-uploads/") && res.status() === 200 && big.start) big.end = Date.now();
    });
    await ctx.setOffline(false);
    await page.getByRole("button", { name: "Sync now" }).click();
    await expect.poll(() => page.locator("[data-testid=outbox-empty]").count(), { timeout: 90_000 }).toBe(1);
    await page.screenshot({ path: `${SHOTS}/sync-panel-synced-390.png`, fullPage: false });
    expect(cut, "one chunk was cut").toBe(1);
    expect(seen.filter((m) => m === "HEAD").length, "the client asked for the offset after the cut").toBeGreaterThanOrEqual(1);
    console.log(
      `offline-photos: ${seen.length} tus requests (${seen.filter((m) => m === "POST").length} POST, ${patches} PATCH, ${seen.filter((m) => m === "HEAD").length} HEAD); ` +
        `${(files[2].byteLength / 1024 / 1024).toFixed(1)} MiB photo in 1 MiB chunks: ${big.end && big.start ? big.end - big.start : "n/a"} ms from opening to stored`,
    );

    // The database: each record and each photo exactly once, with the hashes of the bytes chosen.
    const db = createClient({ url: `file:${join(inject("dataDir"), "e2e.db")}` });
    try {
      const st = await db.execute({ sql: "select count(*) as n from stations where project_id = ? and name = ?", args: [projectId, "Offline photo outcrop E2E"] });
      expect(Number(st.rows[0].n)).toBe(1);
      const rows = await db.execute({
        sql: `select s.code as code, count(p.id) as n, group_concat(p.sha256) as hashes from samples s left join photos p on p.sample_id = s.id
              where s.project_id = ? and s.code in (?, ?, ?) group by s.id order by s.code`,
        args: [projectId, ...tags],
      });
      expect(rows.rows.map((r) => [r.code, Number(r.n), r.hashes])).toEqual(tags.map((t, i) => [t, 1, sha(files[i])]));
    } finally {
      db.close();
    }
    await ctx.close();
  });
});
