/// <reference lib="dom" />
import path from "node:path";
import type { BrowserContext } from "playwright-core";
import type { DataSource } from "typeorm";
import { afterAll, beforeAll, describe, expect, inject, it } from "vitest";
import { Company, Membership } from "../../server/db/entities/index.js";
import { signUpCompany, TEST_PASSWORD, uniqueEmail } from "../support/accounts.js";
import { startTestApp, type TestApp } from "../support/app.js";
import { artifactsDir, closeBrowser, hasChromium, launchBrowser, watchPage } from "../support/browser.js";
import { linkIn, waitForMail } from "../support/mail.js";
import { openTestDb } from "../support/test-db.js";

describe.skipIf(!hasChromium)("accounts in headless Chromium: sign up, invite, accept from the e-mail, sign in", () => {
  let db: DataSource;
  let app: TestApp;
  let ownerBrowser: BrowserContext;
  let estimatorBrowser: BrowserContext;
  let extra: BrowserContext | undefined;
  const shots = artifactsDir("accounts");

  beforeAll(async () => {
    db = await openTestDb();
    app = await startTestApp(db, { clientDir: inject("clientDir") });
    ownerBrowser = await launchBrowser();
    estimatorBrowser = await launchBrowser();
  });
  afterAll(async () => {
    await closeBrowser(ownerBrowser);
    await closeBrowser(estimatorBrowser);
    await closeBrowser(extra);
    await app?.close();
    await db?.destroy();
  });

  it("a new company signs up, invites an estimator, who accepts from the catcher's e-mail and signs in again later", async () => {
    const company = `Heronsgate Off-Grid ${Date.now() % 100000}`;
    const ownerEmail = uniqueEmail("founder");
    const estimatorEmail = uniqueEmail("estimator");

    // The owner signs up.
    const owner = await ownerBrowser.newPage();
    const ownerWatch = watchPage(owner, app.url);
    await owner.goto(`${app.url}/sign-up`);
    await owner.getByRole("heading", { name: "Create your company account" }).waitFor();
    await owner.getByLabel("Company name").fill(company);
    await owner.getByLabel("Your name").fill("Hana Founder");
    await owner.getByLabel("E-mail").fill(ownerEmail);
    await owner.getByLabel("Password").fill(TEST_PASSWORD);
    await owner.screenshot({ path: path.join(shots, "1-sign-up.png") });
    await owner.getByRole("button", { name: "Create account" }).click();
    await owner.getByRole("heading", { level: 1, name: "Dashboard" }).waitFor();
    expect(await owner.getByText(company).count()).toBeGreaterThan(0);

    // The owner invites an estimator from the Team page.
    await owner.getByRole("navigation", { name: "Main" }).getByRole("link", { name: "Team" }).click();
    await owner.getByRole("heading", { level: 1, name: "Team" }).waitFor();
    await owner.getByRole("heading", { name: "Invite someone" }).waitFor();
    await owner.getByLabel("E-mail").fill(estimatorEmail);
    await owner.getByLabel("Role", { exact: true }).selectOption("estimator");
    await owner.getByRole("button", { name: "Send invitation" }).click();
    await owner.getByRole("status").filter({ hasText: `Invitation sent to ${estimatorEmail}` }).waitFor();
    await owner.getByText(estimatorEmail).first().waitFor();
    await owner.screenshot({ path: path.join(shots, "2-team-invited.png") });

    // The e-mail arrives in the local catcher; its link opens in the estimator's own browser.
    const mail = await waitForMail(estimatorEmail);
    expect(mail.subject).toContain(company);
    const link = linkIn(mail, `${app.url}/join#token=`);
    const estimator = await estimatorBrowser.newPage();
    const estimatorWatch = watchPage(estimator, app.url);
    await estimator.goto(link);
    await estimator.getByRole("heading", { name: `Join ${company}` }).waitFor();
    expect(await estimator.getByText(estimatorEmail).count()).toBeGreaterThan(0);
    await estimator.getByLabel("Your name").fill("Ravi Estimator");
    await estimator.getByLabel("Choose a password").fill(TEST_PASSWORD);
    await estimator.screenshot({ path: path.join(shots, "3-join.png") });
    await estimator.getByRole("button", { name: "Accept invitation" }).click();
    await estimator.getByRole("heading", { level: 1, name: "Dashboard" }).waitFor();
    expect(await estimator.getByText("Ravi Estimator").count()).toBeGreaterThan(0);

    const membership = await db.getRepository(Membership).findOne({ where: { user: { email: estimatorEmail } }, relations: { user: true, company: true } });
    expect(membership).toMatchObject({ role: "estimator", company: { name: company } });

    // Signed out, then signed in again with the chosen password; the Team page offers no invitations to an Estimator.
    await estimator.getByRole("button", { name: "Sign out" }).click();
    await estimator.getByRole("heading", { level: 1, name: "Sign in" }).waitFor();
    await estimator.goto(`${app.url}/team`);
    await estimator.waitForURL(/\/sign-in\?next=%2Fteam$/);
    await estimator.getByLabel("E-mail").fill(estimatorEmail);
    await estimator.getByLabel("Password").fill(TEST_PASSWORD);
    await estimator.getByRole("button", { name: "Sign in" }).click();
    await estimator.getByRole("heading", { level: 1, name: "Team" }).waitFor();
    await estimator.getByRole("table", { name: "Members" }).getByText("Hana Founder").waitFor();
    expect(await estimator.getByRole("heading", { name: "Invite someone" }).count()).toBe(0);
    await estimator.screenshot({ path: path.join(shots, "4-estimator-team.png") });

    // The owner's Team page now lists the estimator as a member.
    await owner.reload();
    await owner.getByRole("table", { name: "Members" }).getByText("Ravi Estimator").waitFor();

    expect(ownerWatch.problems).toEqual([]);
    expect(estimatorWatch.problems).toEqual([]);
  });

  it("forgot password: the e-mailed link sets a new password and signs in; the Owner saves company settings", async () => {
    const owner = await signUpCompany(app, "Brackenfold Marine DC");
    extra = await launchBrowser();
    const page = await extra.newPage();
    const watch = watchPage(page, app.url);
    await page.goto(`${app.url}/sign-in`);
    await page.getByRole("link", { name: "Forgot your password?" }).click();
    await page.getByRole("heading", { level: 1, name: "Reset your password" }).waitFor();
    await page.getByLabel("E-mail").fill(owner.email);
    await page.getByRole("button", { name: "Send reset link" }).click();
    await page.getByRole("status").filter({ hasText: "If an account uses that e-mail" }).waitFor();

    const mail = await waitForMail(owner.email);
    expect(mail.text).toContain("Brackenfold Marine DC");
    await page.goto(linkIn(mail, `${app.url}/reset-password#token=`));
    await page.getByRole("heading", { level: 1, name: "Set a new password" }).waitFor();
    await page.getByLabel("New password").fill("tide-table-lantern-42");
    await page.getByRole("button", { name: "Set password" }).click();
    await page.getByRole("heading", { level: 1, name: "Dashboard" }).waitFor();
    // The session the owner had before the reset is over.
    expect((await owner.api.get("/api/auth/session")).body).toEqual({ signedIn: false });

    await page.getByRole("navigation", { name: "Main" }).getByRole("link", { name: "Settings" }).click();
    await page.getByRole("heading", { name: "Company", exact: true }).waitFor();
    await page.getByLabel("Licence number").fill("MDC-2026-118");
    await page.getByLabel("Currency").fill("EUR");
    await page.getByLabel("Labour rate per hour").fill("87.50");
    await page.getByLabel("Deposit (%)").fill("40");
    await page.getByRole("button", { name: "Save settings" }).click();
    await page.getByRole("status").filter({ hasText: "Settings saved" }).waitFor();
    await page.screenshot({ path: path.join(shots, "5-settings-saved.png") });
    const company = await db.getRepository(Company).findOneByOrFail({ id: owner.companyId });
    expect(company).toMatchObject({ licenceNumber: "MDC-2026-118", currency: "EUR", labourRateMinor: 8750, depositPercent: 40 });
    expect(watch.problems).toEqual([]);
  });

  it("shows a wrong password beside the form, in words", async () => {
    const page = await ownerBrowser.newPage();
    const context = page.context();
    await context.clearCookies();
    await page.goto(`${app.url}/sign-in`);
    await page.getByLabel("E-mail").fill(uniqueEmail("nobody"));
    await page.getByLabel("Password").fill("not-a-real-password");
    await page.getByRole("button", { name: "Sign in" }).click();
    await page.getByRole("alert").filter({ hasText: "E-mail or password is wrong" }).waitFor();
    expect(page.url()).toContain("/sign-in");
  });
});
