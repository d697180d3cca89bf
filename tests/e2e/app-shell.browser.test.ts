/// <reference lib="dom" />
import path from "node:path";
import type { BrowserContext } from "playwright-core";
import type { DataSource } from "typeorm";
import { afterAll, beforeAll, describe, expect, inject, it } from "vitest";
import { signUpCompany, TEST_PASSWORD } from "../support/accounts.js";
import { startTestApp, type TestApp } from "../support/app.js";
import { artifactsDir, closeBrowser, hasChromium, launchBrowser, watchPage } from "../support/browser.js";
import { openTestDb } from "../support/test-db.js";

describe.skipIf(!hasChromium)("the app shell in headless Chromium", () => {
  let db: DataSource;
  let server: TestApp;
  let browser: BrowserContext;
  let email: string;
  const shots = artifactsDir("app-shell");

  beforeAll(async () => {
    db = await openTestDb();
    server = await startTestApp(db, { clientDir: inject("clientDir") });
    email = (await signUpCompany(server, "Shell Test Co")).email;
    browser = await launchBrowser();
    // Sign in once; the session cookie serves every test of this file.
    const page = await browser.newPage();
    await page.goto(`${server.url}/sign-in`);
    await page.getByLabel("E-mail").fill(email);
    await page.getByLabel("Password").fill(TEST_PASSWORD);
    await page.getByRole("button", { name: "Sign in" }).click();
    await page.getByRole("heading", { level: 1, name: "Dashboard" }).waitFor();
    await page.close();
  });
  afterAll(async () => {
    await closeBrowser(browser);
    await server?.close();
    await db?.destroy();
  });

  it("renders the dashboard with the database shown up, and every screen has its empty state", async () => {
    const page = await browser.newPage();
    const watch = watchPage(page, server.url);
    await page.goto(`${server.url}/`);
    await expect.poll(() => page.getByRole("status", { name: "Database up" }).count(), { timeout: 10000 }).toBe(1);
    expect(await page.getByRole("heading", { level: 1 }).textContent()).toBe("Dashboard");
    await page.screenshot({ path: path.join(shots, "dashboard.png") });

    const screens: Array<[string, string]> = [
      ["Jobs", "No jobs yet"],
      ["Clients", "No clients yet"],
      ["Price list", "Your price list is empty"],
      ["Team", "Invite someone"],
      ["Settings", "Company"],
    ];
    for (const [link, emptyTitle] of screens) {
      await page.getByRole("navigation", { name: "Main" }).getByRole("link", { name: link }).click();
      await page.getByRole("heading", { name: emptyTitle, exact: true }).waitFor();
      expect(await page.getByRole("link", { name: link }).getAttribute("aria-current")).toBe("page");
    }
    await page.screenshot({ path: path.join(shots, "settings.png") });

    // The fonts come from our own origin and are in use.
    const fonts = await page.evaluate(async () => {
      await document.fonts.ready;
      return [...document.fonts].filter((f) => f.status === "loaded").map((f) => `${f.family} ${f.weight}`);
    });
    expect(fonts.some((f) => f.startsWith("Inter"))).toBe(true);
    expect(watch.problems).toEqual([]);
  });

  it("shows the 404 page for an unknown address and links back", async () => {
    const page = await browser.newPage();
    const watch = watchPage(page, server.url);
    await page.goto(`${server.url}/no/such/page`);
    await page.getByRole("heading", { name: "Page not found" }).waitFor();
    expect(await page.getByText("/no/such/page").count()).toBe(1);
    await page.getByRole("link", { name: "Go to the dashboard" }).click();
    await page.getByRole("heading", { name: "Dashboard" }).waitFor();
    expect(watch.problems).toEqual([]);
  });

  it("sends a signed-out visitor to sign in, and back to the page afterwards", async () => {
    const other = await launchBrowser();
    try {
      const page = await other.newPage();
      const watch = watchPage(page, server.url);
      await page.goto(`${server.url}/clients`);
      await page.waitForURL(/\/sign-in\?next=%2Fclients$/);
      await page.getByLabel("E-mail").fill(email);
      await page.getByLabel("Password").fill(TEST_PASSWORD);
      await page.keyboard.press("Enter");
      await page.getByRole("heading", { name: "No clients yet" }).waitFor();
      expect(new URL(page.url()).pathname).toBe("/clients");
      expect(watch.problems).toEqual([]);
    } finally {
      await closeBrowser(other);
    }
  });

  it("can be driven by keyboard: the skip link lands on the content", async () => {
    const page = await browser.newPage();
    await page.goto(`${server.url}/jobs`);
    await page.getByRole("heading", { name: "No jobs yet" }).waitFor();
    await page.keyboard.press("Tab");
    expect(await page.evaluate(() => document.activeElement?.textContent)).toBe("Skip to content");
    await page.keyboard.press("Enter");
    expect(await page.evaluate(() => location.hash)).toBe("#main");
  });
});
