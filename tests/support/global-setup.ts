import { mkdtempSync } from "node:fs";
import os from "node:os";
import path from "node:path";
import type {} from "vitest";
import type { TestProject } from "vitest/node";
import { createDataSource } from "../../server/db/data-source.js";
import { startMailCatcher } from "../../server/mail/catcher.js";
import { buildClient } from "../../server/scripts/build-client.js";
import { findFreePort } from "../../server/scripts/port-check.js";
import { testDatabaseUrl } from "./test-db.js";
import { startStripeFake } from "../../server/fakes/stripe/index.js";

declare module "vitest" {
  export interface ProvidedContext {
    /** The client, built once for the run (vite build output). */
    clientDir: string;
    /** The run's local SMTP catcher: send to smtpPort, read back through webPort's REST API. */
    mailCatcher: { smtpPort: number; webPort: number };
    /** The run's local Stripe fake; each test app registers its own key and webhook with it. */
    stripeFake: { url: string };
  }
}

// Once per run: migrate the test database, start the mail catcher, build the client.
export default async function setup(project: TestProject): Promise<() => Promise<void>> {
  const db = createDataSource({ url: testDatabaseUrl() });
  await db.initialize();
  await db.runMigrations({ transaction: "all" });
  await db.destroy();

  const base = process.env.RUNWRIGHT_TEST_TMP ?? mkdtempSync(path.join(os.tmpdir(), "runwright-client-"));
  const clientDir = path.join(base, "client");
  await buildClient(clientDir);
  project.provide("clientDir", clientDir);

  const catcher = await startMailCatcher(await findFreePort(), await findFreePort(), path.join(base, "mail"));
  project.provide("mailCatcher", { smtpPort: catcher.smtpPort, webPort: catcher.webPort });
  // Webhook retries come quickly in tests (a test that stops the app sees them give up soon).
  const stripeFake = await startStripeFake({ retryDelaysMs: [200, 500, 1000] });
  project.provide("stripeFake", { url: stripeFake.url });
  return async () => {
    await stripeFake.stop();
    await catcher.stop();
  };
}
