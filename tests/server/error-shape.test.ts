import express from "express";
import request from "supertest";
import { CSRF_HEADER } from "../../shared/http.js";
import type { DataSource } from "typeorm";
import { z } from "zod";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { ApiErrorBody } from "../../shared/schemas/error.js";
import { MAX_JSON_BODY_BYTES } from "../../shared/limits.js";
import { createApp } from "../../server/app.js";
import { AppError, HTTP_STATUS } from "../../server/errors.js";
import { errorHandler } from "../../server/middleware/error-handler.js";
import { openTestDb } from "../support/test-db.js";

function expectErrorShape(body: unknown, code: string) {
  const parsed = ApiErrorBody.parse(body);
  expect(parsed.error.code).toBe(code);
  expect(parsed.error.message.length).toBeGreaterThan(0);
  // Nothing from a stack trace reaches the client.
  expect(JSON.stringify(body)).not.toMatch(/at .+\.(ts|js):\d+/);
  return parsed;
}

describe("the API's error shape", () => {
  let db: DataSource;
  let app: express.Express;
  beforeAll(async () => {
    db = await openTestDb();
    app = createApp({ db });
  });
  afterAll(async () => {
    await db.destroy();
  });

  it("answers invalid JSON with 400 invalid_json", async () => {
    const res = await request(app).post("/api/health").set("Content-Type", "application/json").send('{"name": "Kestrel",');
    expect(res.status).toBe(400);
    expect(res.headers["content-type"]).toMatch(/application\/json/);
    expectErrorShape(res.body, "invalid_json");
  });

  it("refuses a value that cannot be turned into a number where a length is read, 400 naming the field, on any route", async () => {
    // {"length": {"valueOf": 0, "toString": 0}} in place of text made zod's length check throw (a 500).
    // Sign-in and sign-up parse such a body without a session (a 500 before); signed-in routes share the parser.
    for (const path of ["/api/auth/sign-in", "/api/auth/sign-up"]) {
      const res = await request(app)
        .post(path)
        .set(CSRF_HEADER, "1")
        .set("Content-Type", "application/json")
        .send('{"email": {"length": {"valueOf": 0, "toString": 0}}, "name": {"length": {"valueOf": 0, "toString": 0}}, "password": "long enough password", "companyName": "Co"}');
      expect(res.status, JSON.stringify(res.body)).toBe(400);
      const body = expectErrorShape(res.body, "invalid_input");
      expect(body.error.message).toMatch(/^(email|name): /);
    }
  });

  it("answers a body over the limit with 413 payload_too_large", async () => {
    const big = JSON.stringify({ notes: "x".repeat(MAX_JSON_BODY_BYTES + 10) });
    const res = await request(app).post("/api/anything").set("Content-Type", "application/json").send(big);
    expect(res.status).toBe(413);
    expectErrorShape(res.body, "payload_too_large");
  });

  it.each([
    ["GET", "/api/no-such-thing"],
    ["POST", "/api/jobs/42/explode"],
    ["DELETE", "/api"],
  ])("answers %s %s with 404 not_found in JSON, not HTML", async (method, path) => {
    // With the CSRF header: without it a change is refused (403) before any routing (tests/server/accounts/abuse.test.ts).
    const res = await request(app)[method.toLowerCase() as "get" | "post" | "delete"](path).set(CSRF_HEADER, "1");
    expect(res.status).toBe(404);
    expect(res.headers["content-type"]).toMatch(/application\/json/);
    const body = expectErrorShape(res.body, "not_found");
    expect(body.error.message).toContain(path);
  });

  it("sets the security headers", async () => {
    const res = await request(app).get("/api/health");
    expect(res.headers["x-content-type-options"]).toBe("nosniff");
    expect(res.headers["content-security-policy"]).toContain("default-src 'self'");
    expect(res.headers["x-powered-by"]).toBeUndefined();
  });
});

describe("errorHandler", () => {
  // A tiny app with the real handler, and routes that fail in each way a later route can.
  const app = express();
  app.use(express.json());
  app.post("/zod", (req) => {
    z.object({ name: z.string().min(1), lengthM: z.number().positive() }).parse(req.body);
  });
  app.get("/conflict", () => {
    throw new AppError("conflict", "Someone saved this system after you opened it", { currentVersion: 7 });
  });
  app.get("/boom", () => {
    throw new Error("secret internal detail at /srv/db.ts:12");
  });
  app.get("/async-boom", async () => {
    await Promise.resolve();
    throw new TypeError("cannot read x of undefined");
  });
  app.get("/db-down", () => {
    throw Object.assign(new Error("connect ECONNREFUSED 127.0.0.1:5544"), { code: "ECONNREFUSED" });
  });
  app.use(errorHandler);

  it("turns a zod error into 400 invalid_input naming the field", async () => {
    const res = await request(app).post("/zod").send({ name: "Pump feeder", lengthM: -3 });
    expect(res.status).toBe(400);
    const body = expectErrorShape(res.body, "invalid_input");
    expect(body.error.message).toMatch(/^lengthM: /);
    expect(body.error.details).toEqual({ fields: { lengthM: expect.any(String) } });
  });

  it("keeps an AppError's status, message and details", async () => {
    const res = await request(app).get("/conflict");
    expect(res.status).toBe(409);
    const body = expectErrorShape(res.body, "conflict");
    expect(body.error.details).toEqual({ currentVersion: 7 });
  });

  it.each(["/boom", "/async-boom"])("hides the detail of an unexpected error at %s behind a generic 500", async (path) => {
    const res = await request(app).get(path);
    expect(res.status).toBe(500);
    const body = expectErrorShape(res.body, "internal");
    expect(body.error.message).not.toMatch(/secret|undefined/);
  });

  it("answers 503 service_unavailable when the database refuses connections", async () => {
    const res = await request(app).get("/db-down");
    expect(res.status).toBe(503);
    expectErrorShape(res.body, "service_unavailable");
  });

  it("has a status for every code, each in the 4xx/5xx range", () => {
    for (const status of Object.values(HTTP_STATUS)) expect(status).toBeGreaterThanOrEqual(400);
    expect(new AppError("rate_limited", "slow down").status).toBe(429);
    expect(new AppError("unprocessable", "no path to a source").status).toBe(422);
  });
});
