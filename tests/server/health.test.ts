import { readFileSync } from "node:fs";
import net from "node:net";
import request from "supertest";
import type { DataSource } from "typeorm";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { HealthStatus } from "../../shared/schemas/health.js";
import { createApp } from "../../server/app.js";
import { createDataSource } from "../../server/db/data-source.js";
import { findFreePort } from "../../server/scripts/port-check.js";
import { tcpRelay } from "../support/relay.js";
import { openTestDb, testDatabaseUrl } from "../support/test-db.js";

const packageVersion = JSON.parse(readFileSync("package.json", "utf8")).version;

describe("GET /api/health", () => {
  let db: DataSource;
  beforeAll(async () => {
    db = await openTestDb();
  });
  afterAll(async () => {
    await db.destroy();
  });

  it("answers 200 with the database up and the package version", async () => {
    const res = await request(createApp({ db })).get("/api/health");
    expect(res.status).toBe(200);
    expect(HealthStatus.parse(res.body)).toEqual({ status: "ok", db: "up", version: packageVersion });
  });

  it("answers 503 with db down when the database is unreachable, within the timeout", async () => {
    // A port nobody listens on: the connection is refused.
    const closedPort = await findFreePort();
    const unreachable = createDataSource({ url: `postgres://runwright@127.0.0.1:${closedPort}/nowhere`, connectTimeoutMs: 1000 });
    const started = Date.now();
    const res = await request(createApp({ db: unreachable, dbTimeoutMs: 1500 })).get("/api/health");
    expect(res.status).toBe(503);
    expect(res.body).toEqual({ status: "degraded", db: "down", version: packageVersion });
    expect(Date.now() - started).toBeLessThan(5000);
  });

  it("answers 503 while the database does not answer at all", async () => {
    // A listener that accepts TCP connections but never speaks: the ping times out.
    const sockets: net.Socket[] = [];
    const silent = net.createServer((socket) => sockets.push(socket));
    await new Promise<void>((resolve) => silent.listen(0, "127.0.0.1", resolve));
    const port = (silent.address() as net.AddressInfo).port;
    const hanging = createDataSource({ url: `postgres://runwright@127.0.0.1:${port}/nowhere`, connectTimeoutMs: 500 });
    const started = Date.now();
    const res = await request(createApp({ db: hanging, dbTimeoutMs: 800 })).get("/api/health");
    expect(res.status).toBe(503);
    expect(res.body.db).toBe("down");
    expect(Date.now() - started).toBeLessThan(3000);
    for (const socket of sockets) socket.destroy();
    await new Promise((resolve) => silent.close(resolve));
  });

  it("goes down with the database and comes back with it, without restarting the app", async () => {
    // The app reaches the real test database through a TCP relay that the test cuts and restores.
    const target = new URL(testDatabaseUrl());
    const relayPort = await findFreePort();
    const relay = tcpRelay(relayPort, Number(target.port));
    const url = new URL(target);
    url.port = String(relayPort);
    const viaRelay = createDataSource({ url: url.toString(), connectTimeoutMs: 1000 });
    const app = createApp({ db: viaRelay, dbTimeoutMs: 1500 });
    try {
      expect((await request(app).get("/api/health")).status).toBe(503); // relay closed: refused
      await relay.open();
      expect((await request(app).get("/api/health")).body.db).toBe("up");
      await relay.cut();
      expect((await request(app).get("/api/health")).status).toBe(503);
      await relay.open();
      const back = await request(app).get("/api/health");
      expect(back.status).toBe(200);
      expect(back.body.db).toBe("up");
    } finally {
      await relay.cut();
      if (viaRelay.isInitialized) await viaRelay.destroy();
    }
  });
});
