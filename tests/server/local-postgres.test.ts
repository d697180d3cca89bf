import { chmodSync, chownSync, mkdtempSync, rmSync, statSync, writeFileSync } from "node:fs";
import net from "node:net";
import os from "node:os";
import path from "node:path";
import pg from "pg";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { findFreePort } from "../../server/scripts/port-check.js";
import { LocalPostgres } from "../../server/scripts/postgres.js";
import { StartupError } from "../../server/scripts/startup-error.js";

// The project's own cluster management, on a cluster of its own for this file.
describe("LocalPostgres", () => {
  let tmp: string;
  let cluster: LocalPostgres;
  const make = (root: string, port: number) =>
    new LocalPostgres({ root, port, portVariable: "RUNWRIGHT_DB_PORT", rootVariable: "RUNWRIGHT_DATA_DIR", throwaway: true });

  beforeAll(async () => {
    tmp = mkdtempSync(path.join(os.tmpdir(), "runwright-pgtest-"));
    chmodSync(tmp, 0o755);
    cluster = make(path.join(tmp, "pg"), await findFreePort());
    await cluster.ensureRunning();
  });
  afterAll(() => {
    cluster?.stop({ force: true });
    rmSync(tmp, { recursive: true, force: true });
  });

  async function canQuery(c: LocalPostgres): Promise<boolean> {
    const client = new pg.Client({ connectionString: c.url("postgres"), connectionTimeoutMillis: 3000 });
    await client.connect();
    const result = await client.query("SELECT 41 + 1 AS answer");
    await client.end();
    return result.rows[0].answer === 42;
  }

  it("creates a cluster and serves on 127.0.0.1 at the chosen port", async () => {
    expect(cluster.runningServerPort()).toBe(cluster.port);
    expect(await canQuery(cluster)).toBe(true);
  });

  it("creates a database once and leaves it alone the second time", async () => {
    await cluster.ensureDatabase("twice");
    await cluster.ensureDatabase("twice");
    const client = new pg.Client({ connectionString: cluster.url("twice") });
    await client.connect();
    expect((await client.query("SELECT current_database() AS name")).rows[0].name).toBe("twice");
    await client.end();
  });

  it("reuses a server already running on the folder and does not stop it on behalf of the other", async () => {
    const second = make(path.join(tmp, "pg"), cluster.port);
    await second.ensureRunning();
    second.stop();
    expect(cluster.runningServerPort()).toBe(cluster.port);
  });

  it("recovers from a stale postmaster.pid left by a crash", async () => {
    cluster.stop({ force: true });
    expect(cluster.runningServerPort()).toBeUndefined();
    // A pid file naming a process that does not exist, as a crash leaves it.
    const pidFile = path.join(cluster.dataDir, "postmaster.pid");
    writeFileSync(pidFile, `999999\n${cluster.dataDir}\n1700000000\n${cluster.port}\n\n127.0.0.1\n`);
    const { uid, gid } = statSync(cluster.dataDir);
    chownSync(pidFile, uid, gid); // as the server would have written it
    const restarted = make(path.join(tmp, "pg"), cluster.port);
    await restarted.ensureRunning();
    expect(await canQuery(restarted)).toBe(true);
    cluster = restarted;
  });

  it("names the port and its variable when the port is taken", async () => {
    const blocker = net.createServer();
    const port = await findFreePort();
    await new Promise<void>((resolve) => blocker.listen(port, "127.0.0.1", resolve));
    try {
      const other = make(path.join(tmp, "other"), port);
      const failure = await other.ensureRunning().then(() => undefined, (error: unknown) => error);
      expect(failure).toBeInstanceOf(StartupError);
      expect((failure as Error).message).toMatch(new RegExp(`Port ${port} .*in use.*RUNWRIGHT_DB_PORT`));
      other.stop({ force: true });
    } finally {
      await new Promise((resolve) => blocker.close(resolve));
    }
  });

  it.runIf(process.getuid?.() === 0)("says what to do when the data folder belongs to another user", async () => {
    const root = path.join(tmp, "foreign");
    const foreign = make(root, await findFreePort());
    await foreign.ensureRunning();
    foreign.stop({ force: true });
    chownSync(foreign.dataDir, 0, 0); // now root's, while the server must run as postgres
    const failure = await make(root, foreign.port).ensureRunning().then(() => undefined, (error: unknown) => error);
    expect(failure).toBeInstanceOf(StartupError);
    expect((failure as Error).message).toMatch(/owned by uid 0.*RUNWRIGHT_DATA_DIR/);
  });
});
