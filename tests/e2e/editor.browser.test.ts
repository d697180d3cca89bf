/// <reference lib="dom" />
import path from "node:path";
import type { BrowserContext, Page } from "playwright-core";
import type { DataSource } from "typeorm";
import { afterAll, beforeAll, describe, expect, inject, it } from "vitest";
import { Attachment, System } from "../../server/db/entities/index.js";
import { DEMO_JOBS, DEMO_PASSWORD, DEMO_USERS, seedDemo } from "../../server/db/seed.js";
import { startTestApp, type TestApp } from "../support/app.js";
import { artifactsDir, closeBrowser, hasChromium, launchBrowser, watchPage } from "../support/browser.js";
import { TINY_PNG } from "../support/jobs.js";
import { openTestDb } from "../support/test-db.js";

const CABIN = DEMO_JOBS[0];
const estimator = DEMO_USERS.find((u) => u.role === "estimator")!;

/** The status text in a load's row of the results. */
const loadStatus = (page: Page, id: string) => page.locator(`tr[data-load-id="${id}"]`).first().innerText();

describe.skipIf(!hasChromium)("the System editor in headless Chromium", () => {
  let db: DataSource;
  let app: TestApp;
  let browser: BrowserContext;
  const shots = artifactsDir("editor");

  beforeAll(async () => {
    db = await openTestDb();
    await seedDemo(db);
    app = await startTestApp(db, { clientDir: inject("clientDir") });
    browser = await launchBrowser();
    const page = await browser.newPage();
    await page.goto(`${app.url}/sign-in`);
    await page.getByLabel("E-mail").fill(estimator.email);
    await page.getByLabel("Password").fill(DEMO_PASSWORD);
    await page.getByRole("button", { name: "Sign in" }).click();
    await page.getByRole("heading", { level: 1, name: "Dashboard" }).waitFor();
    await page.close();
  });
  afterAll(async () => {
    await closeBrowser(browser);
    await app?.close();
    await db?.destroy();
  });

  it("opens the demo cabin solved, turns the pump Over limit with a smaller feeder, auto-sizes, applies and saves", async () => {
    const page = await browser.newPage();
    const watch = watchPage(page, app.url);
    await page.goto(`${app.url}/jobs`);
    await page.getByRole("link", { name: CABIN.title }).click();
    await page.getByRole("heading", { level: 1, name: CABIN.title }).waitFor();
    await page.getByRole("link", { name: CABIN.system.name }).click();

    // Already solved on opening: every load has a status, the pump passes.
    await expect.poll(() => loadStatus(page, "well-pump"), { timeout: 15000 }).toMatch(/Within limit|Near limit/);
    await page.getByRole("heading", { name: "Safety cautions" }).waitFor();
    await page.screenshot({ path: path.join(shots, "1-cabin-opened.png"), fullPage: true });

    // The pump feeder down to 6 mm²: the pump goes over its 3 % critical limit.
    await page.getByRole("tablist", { name: "Entry tables" }).getByRole("tab", { name: "Runs", exact: true }).click();
    const size = page.getByRole("combobox", { name: "Size of run shed-pump", exact: true });
    await size.click();
    await size.fill("6");
    await size.press("Enter");
    await expect.poll(() => loadStatus(page, "well-pump"), { timeout: 15000 }).toMatch(/Over limit/);
    await page.screenshot({ path: path.join(shots, "2-pump-over-limit.png"), fullPage: true });

    // Auto-size proposes a bigger feeder with its cost; apply it and the pump passes again.
    await page.getByRole("button", { name: "Auto-size" }).click();
    const proposal = page.getByRole("dialog", { name: "Auto-size proposal" });
    await proposal.waitFor();
    expect(await proposal.innerText()).toMatch(/shed-pump/);
    await page.screenshot({ path: path.join(shots, "3-auto-size-proposal.png"), fullPage: true });
    await proposal.getByRole("button", { name: "Apply proposal" }).click();
    await expect.poll(() => loadStatus(page, "well-pump"), { timeout: 15000 }).toMatch(/Within limit|Near limit/);
    const proposedSize = await page.getByRole("combobox", { name: "Size of run shed-pump", exact: true }).inputValue();
    expect(proposedSize).not.toMatch(/^6\b/);

    // Save with the version; the database has the proposal and a new version.
    const before = await db.getRepository(System).findOneByOrFail({ id: CABIN.system.id });
    await page.getByRole("button", { name: "Save" }).click();
    await expect.poll(async () => (await db.getRepository(System).findOneByOrFail({ id: CABIN.system.id })).version, { timeout: 10000 }).toBe(before.version + 1);
    const after = await db.getRepository(System).findOneByOrFail({ id: CABIN.system.id });
    const pumpRun = (after.document as { runs: Array<{ id: string; size: string }> }).runs.find((r) => r.id === "shed-pump")!;
    expect(pumpRun.size).not.toBe("6 mm2");
    expect(pumpRun.size.replace(" mm2", "")).toBe(proposedSize.replace(/ ?mm[²2]/, ""));
    expect(after.lastSolve?.over).toBe(0);
    await page.getByText("Saved", { exact: true }).first().waitFor();
    await page.screenshot({ path: path.join(shots, "4-saved.png"), fullPage: true });
    expect(watch.problems).toEqual([]);
    await page.close();
  });

  it("a site photo dropped on the job page uploads with progress and shows as a thumbnail", async () => {
    const page = await browser.newPage();
    const watch = watchPage(page, app.url);
    await page.goto(`${app.url}/jobs/${CABIN.id}`);
    await page.getByRole("heading", { level: 1, name: CABIN.title }).waitFor();
    await page.getByLabel("Add files").setInputFiles({ name: "pump-shed.png", mimeType: "image/png", buffer: TINY_PNG });
    await page.getByRole("img", { name: "pump-shed.png" }).waitFor({ timeout: 10000 });
    expect(await db.getRepository(Attachment).countBy({ jobId: CABIN.id, fileName: "pump-shed.png" })).toBe(1);
    await page.screenshot({ path: path.join(shots, "5-job-photo.png"), fullPage: true });
    expect(watch.problems).toEqual([]);
    await page.close();
  });

  it("an estimator creates a client, a job and a system from scratch with the keyboard and sees the load's voltage", async () => {
    const page = await browser.newPage();
    const watch = watchPage(page, app.url);
    const enterText = async (name: string, text: string, key: "Enter" | "Tab" = "Enter") => {
      const cell = page.getByLabel(name, { exact: true });
      await cell.focus();
      await page.keyboard.press("Control+A");
      await page.keyboard.type(text);
      await page.keyboard.press(key);
    };
    const focusedLabel = () => page.evaluate(() => document.activeElement?.getAttribute("aria-label") ?? "");

    page.setDefaultTimeout(8000);
    // A client: Name, Tab, E-mail, Enter submits.
    await page.goto(`${app.url}/clients`);
    await page.getByRole("button", { name: "New client" }).focus();
    await page.keyboard.press("Enter");
    await page.getByLabel("Name", { exact: true }).focus();
    await page.keyboard.type("Perpetua Ashgrove (browser test)");
    await page.keyboard.press("Tab");
    await page.keyboard.type("perpetua@client.test");
    await page.keyboard.press("Enter");
    await page.getByRole("table", { name: "Clients" }).getByText("Perpetua Ashgrove (browser test)").waitFor();

    // A job for her, from the Jobs list.
    await page.goto(`${app.url}/jobs`);
    await page.getByRole("button", { name: "New job" }).focus();
    await page.keyboard.press("Enter");
    await page.getByLabel("Client", { exact: true }).selectOption({ label: "Perpetua Ashgrove (browser test)" });
    await page.getByLabel("Title", { exact: true }).focus();
    await page.keyboard.type("Boathouse 12 V lighting");
    await page.keyboard.press("Enter");
    await page.getByRole("heading", { level: 1, name: "Boathouse 12 V lighting" }).waitFor();

    // A 12 V system on the job page.
    await page.getByRole("button", { name: "New system" }).focus();
    await page.keyboard.press("Enter");
    await page.getByLabel("System name", { exact: true }).focus();
    await page.keyboard.type("Boathouse house bank");
    await page.getByLabel("Nominal voltage", { exact: true }).selectOption({ label: "12 V" });
    await page.getByRole("button", { name: "Create system" }).focus();
    await page.keyboard.press("Enter");
    await page.getByRole("heading", { name: "One-line diagram" }).waitFor();

    // A point, a run to it and a load on it, typed cell by cell.
    const entry = page.getByRole("tablist", { name: "Entry tables" });
    await entry.getByRole("tab", { name: "Points", exact: true }).click();
    await page.getByRole("button", { name: "Add point" }).click();
    await enterText(await focusedLabel(), "dock");
    await entry.getByRole("tab", { name: "Runs", exact: true }).click();
    await page.getByRole("button", { name: "Add run" }).click();
    const runId = (await focusedLabel()).replace(/^Id of run /, "");
    await enterText(`From of run ${runId}`, "bus");
    await enterText(`To of run ${runId}`, "dock");
    await enterText(`Length of run ${runId}`, "12");
    await enterText(`Size of run ${runId}`, "4");
    await entry.getByRole("tab", { name: "Loads", exact: true }).click();
    await page.getByRole("button", { name: "Add load" }).click();
    const loadId = (await focusedLabel()).replace(/^Id of load /, "");
    await enterText(`Point of load ${loadId}`, "dock");
    await enterText(`Watts of load ${loadId}`, "60");

    // 60 W at 12 V over 12 m of 4 mm²: the load gets a voltage and a status.
    await expect.poll(() => loadStatus(page, loadId), { timeout: 15000 }).toMatch(/(Within|Near|Over) limit/);
    expect(await loadStatus(page, loadId)).toMatch(/\d+\.\d{2}/);
    await page.keyboard.press("Control+s");
    await page.getByText("Saved", { exact: true }).first().waitFor({ timeout: 10000 });
    const saved = await db.getRepository(System).findOneByOrFail({ name: "Boathouse house bank" });
    expect(saved.version).toBe(2);
    expect((saved.document as { loads: Array<{ point: string; watts: number }> }).loads).toEqual([expect.objectContaining({ point: "dock", watts: 60 })]);
    expect(saved.lastSolve).not.toBeNull();
    await page.screenshot({ path: path.join(shots, "6-from-scratch.png"), fullPage: true });
    expect(watch.problems).toEqual([]);
    await page.close();
  });
});
