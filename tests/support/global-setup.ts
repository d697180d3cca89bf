import { mkdtempSync } from "node:fs";
import os from "node:os";
import path from "node:path";
import type {} from "vitest";
import type { TestProject } from "vitest/node";
import { createDataSource } from "../../server/db/data-source.js";
import { buildClient } from "../../server/scripts/build-client.js";
import { testDatabaseUrl } from "./test-db.js";

declare module "vitest" {
  export interface ProvidedContext {
    /** The client, built once for the run (vite build output). */
    clientDir: string;
  }
}

// Once per run: migrate the test database, build the client.
export default async function setup(project: TestProject): Promise<void> {
  const db = createDataSource({ url: testDatabaseUrl() });
  await db.initialize();
  await db.runMigrations({ transaction: "all" });
  await db.destroy();

  const base = process.env.RUNWRIGHT_TEST_TMP ?? mkdtempSync(path.join(os.tmpdir(), "runwright-client-"));
  const clientDir = path.join(base, "client");
  await buildClient(clientDir);
  project.provide("clientDir", clientDir);
}
