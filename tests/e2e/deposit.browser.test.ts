/// <reference lib="dom" />
// The client pays the deposit in headless Chromium: accept the quote on their page, press Pay
// deposit, go back once without paying, have a card declined on the Stripe fake's payment page,
// pay with the success card, and land on "Deposit paid — thank you" with the receipt; the
// contractor then sees the payment on the quote page and the dashboard.
import path from "node:path";
import type { BrowserContext } from "playwright-core";
import type { DataSource } from "typeorm";
import { afterAll, beforeAll, describe, expect, inject, it } from "vitest";
import { Payment, Quote } from "../../server/db/entities/index.js";
import { formatMoney } from "../../shared/money.js";
import { TEST_PASSWORD } from "../support/accounts.js";
import { startTestApp, type TestApp } from "../support/app.js";
import { artifactsDir, closeBrowser, hasChromium, launchBrowser, watchPage } from "../support/browser.js";
import { companyFixture } from "../support/fixtures.js";
import { waitForMail } from "../support/mail.js";
import { CARDS } from "../support/stripe.js";
import { openTestDb } from "../support/test-db.js";

describe.skipIf(!hasChromium)("the client pays the deposit on the Stripe fake's page, in headless Chromium", () => {
  let db: DataSource;
  let app: TestApp;
  let client: BrowserContext;
  let contractor: BrowserContext;
  const shots = artifactsDir("deposit");

  beforeAll(async () => {
    db = await openTestDb();
    app = await startTestApp(db, { clientDir: inject("clientDir") });
    client = await launchBrowser();
    contractor = await launchBrowser();
  });
  afterAll(async () => {
    await closeBrowser(client);
    await closeBrowser(contractor);
    await app?.close();
    await db?.destroy();
  });

  it("accepts, cancels once, is declined once, pays, and sees the receipt; the contractor sees it paid", async () => {
    const f = await companyFixture(db, app);
    const sent = await f.quotes();
    const quote = await db.manager.findOneByOrFail(Quote, { id: sent.quoteId });
    const deposit = formatMoney(quote.depositMinor, quote.currency);
    const fakeOrigin = app.stripe!.apiBase;

    const page = await client.newPage();
    const watch = watchPage(page, app.url);
    await page.goto(sent.clientLink);
    await page.getByLabel("Your full name").fill("Tamsin Fairweather");
    await page.getByLabel("I have read and agree to the terms above").check();
    await page.getByRole("button", { name: "Accept quote" }).click();

    // Accepted: the deposit panel offers to pay, without a reload.
    const pay = page.getByRole("button", { name: "Pay deposit" });
    await pay.waitFor({ timeout: 15000 });
    expect(await page.locator("main").innerText()).toContain(deposit);
    await page.screenshot({ path: path.join(shots, "1-accepted-deposit-due.png"), fullPage: true });

    // To the payment page and back without paying: nothing charged, the button is there again.
    await pay.click();
    await page.waitForURL(`${fakeOrigin}/pay/**`, { timeout: 15000 });
    expect(await page.locator("body").innerText()).toContain(deposit);
    await page.screenshot({ path: path.join(shots, "2-payment-page.png"), fullPage: true });
    await page.getByRole("link", { name: "← Back without paying" }).click();
    await page.waitForURL(/deposit=canceled/, { timeout: 15000 });
    await page.getByText(/Payment canceled — nothing was charged/).waitFor({ timeout: 15000 });
    await page.screenshot({ path: path.join(shots, "3-canceled.png"), fullPage: true });

    // Again: a declined card first, then the card that pays.
    await page.getByRole("button", { name: "Pay deposit" }).click();
    await page.waitForURL(`${fakeOrigin}/pay/**`, { timeout: 15000 });
    const fillCard = async (card: string) => {
      await page.getByLabel("Card number").fill(card);
      await page.getByLabel("Expiry (MM / YY)").fill("12 / 39");
      await page.getByLabel("CVC").fill("123");
      await page.getByLabel("Name on card").fill("Tamsin Fairweather");
      await page.getByRole("button", { name: /^Pay / }).click();
    };
    await fillCard(CARDS.declined);
    await page.getByRole("alert").filter({ hasText: "declined" }).waitFor({ timeout: 15000 });
    await page.screenshot({ path: path.join(shots, "4-declined.png"), fullPage: true });
    expect(await db.manager.countBy(Payment, { quoteId: sent.quoteId })).toBe(0);
    await fillCard(CARDS.success);

    // Back on the client's page: confirmed by the webhook, with the receipt.
    await page.waitForURL(/deposit=returned/, { timeout: 15000 });
    await page.getByRole("heading", { name: "Deposit paid — thank you", exact: true }).waitFor({ timeout: 30000 });
    const paidText = await page.locator("main").innerText();
    expect(paidText).toContain(deposit);
    const payment = await db.manager.findOneByOrFail(Payment, { quoteId: sent.quoteId });
    expect(paidText).toContain(payment.receiptNumber);
    const receiptLink = page.getByRole("link", { name: "Download receipt (PDF)" });
    const receipt = await page.request.get(new URL((await receiptLink.getAttribute("href"))!, app.url).toString());
    expect(receipt.status()).toBe(200);
    expect(receipt.headers()["content-type"]).toBe("application/pdf");
    await page.screenshot({ path: path.join(shots, "5-deposit-paid.png"), fullPage: true });
    const receiptMail = await waitForMail(sent.clientEmail, 2);
    expect(receiptMail.subject).toContain(payment.receiptNumber);

    // The contractor: the quote shows the payment, the dashboard counts it.
    const staff = await contractor.newPage();
    const staffWatch = watchPage(staff, app.url);
    await staff.goto(`${app.url}/sign-in`);
    await staff.getByLabel("E-mail").fill(f.owner.email);
    await staff.getByLabel("Password").fill(TEST_PASSWORD);
    await staff.getByRole("button", { name: "Sign in" }).click();
    await staff.getByRole("heading", { level: 1, name: "Dashboard" }).waitFor();
    await expect.poll(() => staff.locator("main").innerText(), { timeout: 15000 }).toContain("Deposits received this month");
    expect(await staff.locator("main").innerText()).toContain(deposit);
    await staff.screenshot({ path: path.join(shots, "6-dashboard.png"), fullPage: true });
    await staff.goto(`${app.url}/jobs/${quote.jobId}/quotes/${quote.id}`);
    await staff.getByRole("heading", { name: "Payments", exact: true }).waitFor({ timeout: 15000 });
    await expect.poll(() => staff.locator("main").innerText(), { timeout: 15000 }).toContain(payment.receiptNumber);
    await staff.screenshot({ path: path.join(shots, "7-quote-payments.png"), fullPage: true });

    // The only requests that left the app's origin went to the payment page, and its only error was the declined card's 402.
    const allowed = (p: string) =>
      p.startsWith(`foreign request: ${fakeOrigin}/`) || p.startsWith(`HTTP 402: ${fakeOrigin}/pay/`) || p === "console error: Failed to load resource: the server responded with a status of 402 (Payment Required)";
    expect(watch.problems.filter((p) => !allowed(p))).toEqual([]);
    expect(staffWatch.problems).toEqual([]);
  }, 120_000);
});
