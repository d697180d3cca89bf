import { spawn } from "node:child_process";
import { chmodSync, existsSync, mkdtempSync, readFileSync, rmSync } from "node:fs";
import net from "node:net";
import os from "node:os";
import path from "node:path";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { findFreePort } from "../../server/scripts/port-check.js";
import { LocalPostgres } from "../../server/scripts/postgres.js";

// `npm start` as a person runs it (node server/scripts/start.mjs), in a data
// folder and on ports of its own.
interface Run {
  code: number | null;
  stdout: string;
  stderr: string;
}

function startCommand(env: Record<string, string>, onLine?: (line: string, kill: () => void) => void): Promise<Run> {
  return new Promise((resolve) => {
    const child = spawn(process.execPath, ["server/scripts/start.mjs"], {
      env: { ...process.env, LOG_LEVEL: "warn", NODE_ENV: "development", DATABASE_URL: "", ...env },
      stdio: ["ignore", "pipe", "pipe"],
    });
    let stdout = "";
    let stderr = "";
    child.stdout.on("data", (chunk: Buffer) => {
      stdout += chunk;
      for (const line of chunk.toString().split("\n")) if (line) onLine?.(line, () => child.kill("SIGTERM"));
    });
    child.stderr.on("data", (chunk: Buffer) => (stderr += chunk));
    child.on("exit", (code) => resolve({ code, stdout, stderr }));
  });
}

describe("npm start", () => {
  let tmp: string;
  beforeAll(() => {
    tmp = mkdtempSync(path.join(os.tmpdir(), "runwright-start-"));
    chmodSync(tmp, 0o755);
  });
  afterAll(() => rmSync(tmp, { recursive: true, force: true }));

  it("brings up its database, serves the app and the API, and stops both on SIGTERM", async () => {
    const port = await findFreePort();
    const dbPort = await findFreePort();
    const dataDir = path.join(tmp, "data");
    const smtpPort = await findFreePort();
    const webPort = await findFreePort();
    const stripePort = await findFreePort();
    let health: unknown;
    let inbox = 0;
    let stripeFake = 0;
    let page = "";
    const env = { PORT: String(port), RUNWRIGHT_DB_PORT: String(dbPort), RUNWRIGHT_DATA_DIR: dataDir, RUNWRIGHT_MAIL_SMTP_PORT: String(smtpPort), RUNWRIGHT_MAIL_WEB_PORT: String(webPort), RUNWRIGHT_STRIPE_FAKE_PORT: String(stripePort), STRIPE_SECRET_KEY: "", STRIPE_WEBHOOK_SECRET: "", STRIPE_API_BASE: "" };
    const run = await startCommand(env, (line, kill) => {
      if (!line.startsWith("Runwright is running at")) return;
      void (async () => {
        health = await (await fetch(`http://127.0.0.1:${port}/api/health`)).json();
        inbox = (await fetch(`http://127.0.0.1:${webPort}/api/healthz`)).status;
        stripeFake = (await fetch(`http://127.0.0.1:${stripePort}/_fake/health`)).status;
        page = await (await fetch(`http://127.0.0.1:${port}/price-list`)).text();
        kill();
      })();
    });
    expect(run.stdout).toContain(`Runwright is running at http://127.0.0.1:${port}/`);
    expect(run.stdout).toContain(`Mail goes to the local catcher: SMTP on 127.0.0.1:${smtpPort}, inbox at http://127.0.0.1:${webPort}/`);
    expect(inbox).toBe(200);
    expect(run.stdout).toContain(`Deposits go to the local Stripe fake at http://127.0.0.1:${stripePort}/`);
    expect(stripeFake).toBe(200);
    expect(health).toMatchObject({ status: "ok", db: "up" });
    // The development session secret was made and kept in the data folder.
    expect(readFileSync(path.join(dataDir, "session-secret"), "utf8").trim().length).toBeGreaterThanOrEqual(32);
    expect(page).toContain('<div id="root"></div>');
    expect(run.code).toBe(0);
    // The database it started is stopped again.
    const cluster = new LocalPostgres({ root: path.join(dataDir, "postgres"), port: dbPort, portVariable: "", rootVariable: "" });
    expect(cluster.runningServerPort()).toBeUndefined();
  }, 120000);

  it("refuses a port in use with one line naming the port and PORT", async () => {
    const port = await findFreePort();
    const blocker = net.createServer();
    await new Promise<void>((resolve) => blocker.listen(port, "127.0.0.1", resolve));
    try {
      const run = await startCommand({ PORT: String(port), RUNWRIGHT_DATA_DIR: path.join(tmp, "unused") });
      expect(run.code).toBe(1);
      expect(run.stderr.trim()).toBe(
        `runwright: Port ${port} on 127.0.0.1 is already in use (is Runwright already running?); set PORT to another port.`,
      );
    } finally {
      await new Promise((resolve) => blocker.close(resolve));
    }
  });

  it("says what is wrong, in one line without a stack trace, when the PostgreSQL binaries are not where it was told", async () => {
    const run = await startCommand({
      PORT: String(await findFreePort()),
      RUNWRIGHT_DB_PORT: String(await findFreePort()),
      RUNWRIGHT_DATA_DIR: path.join(tmp, "nobin"),
      PG_BIN_DIR: "/nonexistent/postgresql/bin",
    });
    expect(run.code).toBe(1);
    expect(run.stderr.trim()).toBe(
      "runwright: PG_BIN_DIR is /nonexistent/postgresql/bin, which holds no pg_ctl; point it at PostgreSQL's server binaries or unset it.",
    );
  });

  it("refuses to start in production without SESSION_SECRET, in one line", async () => {
    const run = await startCommand({ NODE_ENV: "production", PORT: String(await findFreePort()), RUNWRIGHT_DATA_DIR: path.join(tmp, "prod") });
    expect(run.code).toBe(1);
    expect(run.stderr.trim()).toMatch(/^runwright: SESSION_SECRET is not set; production needs a random secret of at least 32 characters/);
    expect(existsSync(path.join(tmp, "prod", "postgres"))).toBe(false);
  });

  it("refuses to start in production on the Stripe fake's key, in one line, before starting anything", async () => {
    const run = await startCommand({
      NODE_ENV: "production",
      SESSION_SECRET: "s".repeat(40),
      STRIPE_SECRET_KEY: "sk_test_runwright_fake_0123",
      STRIPE_WEBHOOK_SECRET: "whsec_0123",
      PORT: String(await findFreePort()),
      RUNWRIGHT_DATA_DIR: path.join(tmp, "prod-fake"),
    });
    expect(run.code).toBe(1);
    expect(run.stderr.trim()).toBe("runwright: STRIPE_SECRET_KEY is the local Stripe fake's key; production needs a real Stripe secret key.");
    expect(existsSync(path.join(tmp, "prod-fake", "postgres"))).toBe(false);
  });

  it("names the variable when the environment is wrong", async () => {
    const run = await startCommand({ PORT: "not-a-port" });
    expect(run.code).toBe(1);
    expect(run.stderr.trim()).toMatch(/^runwright: Invalid environment: PORT: .+$/);
  });
});
