// The whole suite against its own throwaway PostgreSQL: a temporary cluster on
// a free port, removed afterwards. Extra arguments go to vitest
// (npm test -- tests/server/health.test.ts).
import { spawn } from "node:child_process";
import { chmodSync, existsSync, mkdtempSync, readFileSync, rmSync } from "node:fs";
import os from "node:os";
import path from "node:path";
import { findFreePort } from "./port-check.js";
import { ensureTestTools } from "./test-tools.js";
import { LocalPostgres } from "./postgres.js";
import { projectRoot } from "./project-root.js";
import { exitWithStartupError } from "./startup-error.js";

const TEST_DATABASE = "runwright_test";

async function main(): Promise<number> {
  ensureTestTools();
  const tmp = mkdtempSync(path.join(os.tmpdir(), "runwright-test-"));
  // The postgres user (when we are root) must be able to walk into it.
  chmodSync(tmp, 0o755);
  const port = process.env.RUNWRIGHT_TEST_DB_PORT ? Number(process.env.RUNWRIGHT_TEST_DB_PORT) : await findFreePort();
  const cluster = new LocalPostgres({
    root: path.join(tmp, "postgres"),
    port,
    portVariable: "RUNWRIGHT_TEST_DB_PORT",
    rootVariable: "TMPDIR",
    throwaway: true,
  });
  const cleanUp = () => {
    cluster.stop();
    rmSync(tmp, { recursive: true, force: true });
  };
  try {
    await cluster.ensureRunning();
    await cluster.ensureDatabase(TEST_DATABASE);
  } catch (error) {
    cleanUp();
    throw error;
  }

  const summaryFile = path.join(tmp, "summary.json");
  const vitest = path.join(projectRoot, "node_modules", "vitest", "vitest.mjs");
  const args = [vitest, "run", "--reporter=default", "--reporter=./tests/support/summary-reporter.ts", ...process.argv.slice(2)];
  const child = spawn(process.execPath, args, {
    cwd: projectRoot,
    stdio: ["ignore", "inherit", "inherit"],
    env: {
      ...process.env,
      NODE_ENV: "test",
      DATABASE_URL: cluster.url(TEST_DATABASE),
      RUNWRIGHT_TEST_ADMIN_URL: cluster.url("postgres"),
      RUNWRIGHT_TEST_TMP: tmp,
      RUNWRIGHT_SUMMARY_FILE: summaryFile,
      ...(process.env.CI ? { NO_COLOR: "1" } : {}),
    },
  });
  const forward = (signal: NodeJS.Signals) => child.kill(signal);
  process.on("SIGINT", forward);
  process.on("SIGTERM", forward);
  const code = await new Promise<number>((resolve) => child.on("exit", (status) => resolve(status ?? 1)));

  const summary = existsSync(summaryFile)
    ? (JSON.parse(readFileSync(summaryFile, "utf8")) as { passed: number; failed: number; skipped: number })
    : { passed: 0, failed: 1, skipped: 0 }; // vitest died before reporting
  cleanUp();
  const failed = code !== 0 && summary.failed === 0 ? 1 : summary.failed;
  // The plain closing line, last on purpose.
  console.log(`\n${summary.passed} passed, ${failed} failed, ${summary.skipped} skipped`);
  return code;
}

main().then((code) => process.exit(code), exitWithStartupError);
