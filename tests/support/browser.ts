import { existsSync, mkdirSync, mkdtempSync, rmSync } from "node:fs";
import os from "node:os";
import path from "node:path";
import { chromium, type BrowserContext, type Page } from "playwright-core";
import { CHROMIUM_ARGS as ARGS, CHROMIUM_PATH } from "../../server/scripts/chromium.js";

export { CHROMIUM_PATH };

/** Debian's Chromium is installed by .ci/run; on a developer machine without it, browser tests skip and say why. */
export const hasChromium = existsSync(CHROMIUM_PATH);
if (!hasChromium && process.env.CI) {
  throw new Error(`Chromium is missing at ${CHROMIUM_PATH}; .ci/run should have installed it (apt-get install -y chromium).`);
}


/** A fresh Chromium with an empty profile; closeBrowser() ends it and removes the profile. */
export async function launchBrowser(): Promise<BrowserContext> {
  const profile = mkdtempSync(path.join(os.tmpdir(), "runwright-chromium-"));
  const context = await chromium.launchPersistentContext(profile, {
    executablePath: CHROMIUM_PATH,
    headless: true,
    args: ARGS,
    viewport: { width: 1280, height: 800 },
  });
  profiles.set(context, profile);
  return context;
}

const profiles = new WeakMap<BrowserContext, string>();

export async function closeBrowser(context: BrowserContext | undefined): Promise<void> {
  if (!context) return;
  await context.close();
  const profile = profiles.get(context);
  // Chromium may still be flushing the profile for a moment after close.
  if (profile) rmSync(profile, { recursive: true, force: true, maxRetries: 20, retryDelay: 100 });
}

/** Records console errors and failed or foreign requests on a page, for a test to assert empty. */
export function watchPage(page: Page, origin: string): { problems: string[] } {
  const problems: string[] = [];
  page.on("console", (msg) => {
    if (msg.type() === "error") problems.push(`console error: ${msg.text()}`);
  });
  page.on("pageerror", (error) => problems.push(`page error: ${error.message}`));
  page.on("requestfailed", (req) => {
    const error = req.failure()?.errorText ?? "";
    // A read or a solve the app cancelled itself (TanStack Query aborts a fetch it replaces; the
    // editor aborts a solve that a newer edit supersedes) is not a failure.
    if (error === "net::ERR_ABORTED" && (req.method() === "GET" || req.url().endsWith("/solve"))) return;
    problems.push(`request failed: ${req.url()} ${error}`);
  });
  page.on("request", (req) => {
    const url = req.url();
    if (!url.startsWith(origin) && !url.startsWith("data:")) problems.push(`foreign request: ${url}`);
  });
  page.on("response", (res) => {
    if (res.status() >= 400 && !res.url().endsWith("/api/health")) problems.push(`HTTP ${res.status()}: ${res.url()}`);
  });
  return { problems };
}

/** Folder for screenshots (ignored by git). */
export function artifactsDir(name: string): string {
  const dir = path.resolve("tests", ".artifacts", name);
  mkdirSync(dir, { recursive: true });
  return dir;
}
