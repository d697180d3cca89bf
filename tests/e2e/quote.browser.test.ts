/// <reference lib="dom" />
// From the demo cabin to an accepted quote, in headless Chromium: the estimator builds the
// estimate, makes and sends the quote, the e-mail with the PDF arrives in the local catcher, the
// client opens the link in a browser of their own and accepts, and the dashboard counts it.
import path from "node:path";
import type { BrowserContext } from "playwright-core";
import type { DataSource } from "typeorm";
import { afterAll, beforeAll, describe, expect, inject, it } from "vitest";
import { Quote } from "../../server/db/entities/index.js";
import { DEMO_JOBS, DEMO_PASSWORD, DEMO_USERS, seedDemo } from "../../server/db/seed.js";
import { uniqueEmail } from "../support/accounts.js";
import { startTestApp, type TestApp } from "../support/app.js";
import { artifactsDir, closeBrowser, hasChromium, launchBrowser, watchPage } from "../support/browser.js";
import { linkIn, waitForMail } from "../support/mail.js";
import { openTestDb } from "../support/test-db.js";

const CABIN = DEMO_JOBS[0];
const estimator = DEMO_USERS.find((u) => u.role === "estimator")!;

describe.skipIf(!hasChromium)("estimate → quote → e-mail → client accepts, in headless Chromium", () => {
  let db: DataSource;
  let app: TestApp;
  let contractor: BrowserContext;
  let client: BrowserContext;
  const shots = artifactsDir("quote");

  beforeAll(async () => {
    db = await openTestDb();
    await seedDemo(db);
    app = await startTestApp(db, { clientDir: inject("clientDir") });
    contractor = await launchBrowser();
    client = await launchBrowser();
  });
  afterAll(async () => {
    await closeBrowser(contractor);
    await closeBrowser(client);
    await app?.close();
    await db?.destroy();
  });

  it("builds the estimate from the cabin, sends the quote, the client accepts it, and the dashboard shows it", async () => {
    const page = await contractor.newPage();
    const watch = watchPage(page, app.url);
    await page.goto(`${app.url}/sign-in`);
    await page.getByLabel("E-mail").fill(estimator.email);
    await page.getByLabel("Password").fill(DEMO_PASSWORD);
    await page.getByRole("button", { name: "Sign in" }).click();
    await page.getByRole("heading", { level: 1, name: "Dashboard" }).waitFor();
    const acceptedBefore = await db.getRepository(Quote).countBy({ jobId: CABIN.id, status: "accepted" });

    // The job page → its estimate, built from the layout with the demo price list.
    await page.goto(`${app.url}/jobs/${CABIN.id}`);
    await page.getByRole("heading", { level: 1, name: CABIN.title }).waitFor();
    await page.getByRole("link", { name: "Estimate", exact: true }).click();
    const build = page.getByRole("button", { name: "Build from the layout" });
    const rebuild = page.getByRole("button", { name: "Rebuild from the layout" });
    await build.or(rebuild).first().waitFor();
    await (await build.isVisible() ? build : rebuild).click();
    const createQuote = page.getByRole("button", { name: "Create quote" });
    await expect.poll(() => createQuote.isEnabled(), { timeout: 15000 }).toBe(true);
    const estimateText = await page.locator("main").innerText();
    expect(estimateText).toMatch(/mm²/);
    expect(estimateText).not.toMatch(/No price for/);
    await page.screenshot({ path: path.join(shots, "1-estimate.png"), fullPage: true });

    // Create the quote: the quote screen opens on the draft.
    await createQuote.click();
    const heading = page.getByRole("heading", { level: 1, name: /^Q-\d{4}-\d{4} R\d+$/ });
    await heading.waitFor({ timeout: 15000 });
    const label = await heading.innerText();
    await page.screenshot({ path: path.join(shots, "2-quote-draft.png"), fullPage: true });

    // Send it to the client (a unique address, so this run's message is found).
    const to = uniqueEmail("cabin-client");
    await page.getByRole("button", { name: "Send to client" }).click();
    const dialog = page.getByRole("dialog");
    await dialog.getByLabel("To").fill(to);
    await dialog.getByRole("button", { name: "Send quote" }).click();
    await dialog.waitFor({ state: "hidden", timeout: 15000 });
    await expect.poll(() => page.locator("main").innerText(), { timeout: 15000 }).toMatch(/\bSent\b/);

    // The e-mail in the catcher carries the quote number and the client link.
    const mail = await waitForMail(to);
    expect(mail.subject).toContain(label);
    const link = linkIn(mail, `${app.url}/q/`);
    await page.screenshot({ path: path.join(shots, "3-quote-sent.png"), fullPage: true });

    // The client, in a browser of their own with no session, opens the link and accepts.
    const clientPage = await client.newPage();
    const clientWatch = watchPage(clientPage, app.url);
    await clientPage.goto(link);
    await clientPage.getByRole("button", { name: "Accept quote" }).waitFor({ timeout: 15000 });
    const shown = await clientPage.locator("body").innerText();
    expect(shown).toContain(label);
    expect(shown).toMatch(/Well pump/);
    expect(shown).toMatch(/Within limit|Near limit/);
    expect(shown).toMatch(/Fuse every positive conductor/);
    await clientPage.screenshot({ path: path.join(shots, "4-client-page.png"), fullPage: true });
    await clientPage.getByLabel("Your full name").fill("Juniper Holloway");
    await clientPage.getByLabel("I have read and agree to the terms above").check();
    await clientPage.getByRole("button", { name: "Accept quote" }).click();
    await clientPage.getByText(/Accepted by Juniper Holloway/).first().waitFor({ timeout: 15000 });
    await clientPage.screenshot({ path: path.join(shots, "5-client-accepted.png"), fullPage: true });
    expect(await db.getRepository(Quote).countBy({ jobId: CABIN.id, status: "accepted" })).toBe(acceptedBefore + 1);

    // Back with the contractor: the dashboard counts an accepted quote this month.
    await page.goto(`${app.url}/`);
    const tiles = page.getByRole("list", { name: "Quotes this month by status" });
    await tiles.waitFor({ timeout: 15000 });
    const acceptedTile = tiles.getByRole("listitem").filter({ hasText: "Accepted" });
    await expect.poll(async () => Number((await acceptedTile.innerText()).match(/(\d+)\s*quotes?/)?.[1] ?? 0), { timeout: 15000 }).toBeGreaterThanOrEqual(1);
    expect(await page.getByRole("list", { name: "Recent activity" }).innerText()).toContain(label);
    // The money-by-status chart draws once recharts has loaded.
    await page.locator("figure .recharts-surface").first().waitFor({ timeout: 15000 });
    await page.screenshot({ path: path.join(shots, "6-dashboard.png"), fullPage: true });

    expect(watch.problems).toEqual([]);
    expect(clientWatch.problems).toEqual([]);
  }, 120_000);
});
