import type { DataSource } from "typeorm";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { createApp } from "../../../server/app.js";
import { Company } from "../../../server/db/entities/index.js";
import { AUTH_RATE_LIMIT } from "../../../server/middleware/rate-limit.js";
import { ApiClient } from "../../support/api.js";
import { signUpCompany, TEST_PASSWORD, uniqueEmail } from "../../support/accounts.js";
import { startTestApp, useTestApp } from "../../support/app.js";
import { openTestDb } from "../../support/test-db.js";

describe("rate limits: 10 per 15 minutes, per IP and per e-mail", () => {
  let db: DataSource;

  beforeAll(async () => {
    db = await openTestDb();
  });
  afterAll(async () => {
    await db?.destroy();
  });

  it("is the documented limit", () => {
    expect(AUTH_RATE_LIMIT).toEqual({ limit: 10, windowMs: 15 * 60 * 1000 });
  });

  it("the 11th sign-in from one IP gets 429 with Retry-After, even with a right password", async () => {
    // Each app has its own counters; the real limit applies here.
    const app = await startTestApp(db, { authRateLimit: AUTH_RATE_LIMIT });
    try {
      const owner = await signUpCompany(app);
      // Requests arrive through a proxy on loopback, which the app trusts for the client address.
      const fromIp = new ApiClient(app.app, { "X-Forwarded-For": "203.0.113.7" });
      for (let i = 0; i < 10; i++) {
        expect((await fromIp.post("/api/auth/sign-in", { email: uniqueEmail("guess"), password: "wrong-password" })).status).toBe(401);
      }
      const blocked = await fromIp.post("/api/auth/sign-in", { email: owner.email, password: TEST_PASSWORD });
      expect(blocked.status).toBe(429);
      expect(blocked.body.error.code).toBe("rate_limited");
      const retryAfter = Number(blocked.headers["retry-after"]);
      expect(retryAfter).toBeGreaterThan(0);
      expect(retryAfter).toBeLessThanOrEqual(15 * 60);
      // Another IP is not held back.
      const other = new ApiClient(app.app, { "X-Forwarded-For": "203.0.113.8" });
      expect((await other.post("/api/auth/sign-in", { email: owner.email, password: TEST_PASSWORD })).status).toBe(200);
    } finally {
      await app.close();
    }
  });

  it("one e-mail tried from many IPs is limited too", async () => {
    const app = await startTestApp(db, { authRateLimit: AUTH_RATE_LIMIT });
    try {
      const target = uniqueEmail("target");
      for (let i = 0; i < 10; i++) {
        const client = new ApiClient(app.app, { "X-Forwarded-For": `198.51.100.${i + 1}` });
        expect((await client.post("/api/auth/sign-in", { email: target, password: "wrong-password" })).status).toBe(401);
      }
      const fresh = new ApiClient(app.app, { "X-Forwarded-For": "198.51.100.200" });
      const blocked = await fresh.post("/api/auth/sign-in", { email: target.toUpperCase(), password: "wrong-password" });
      expect(blocked.status).toBe(429);
      expect(blocked.headers["retry-after"]).toBeDefined();
    } finally {
      await app.close();
    }
  });

  it("password-reset requests are limited the same way, by e-mail", async () => {
    const app = await startTestApp(db, { authRateLimit: AUTH_RATE_LIMIT });
    try {
      const email = uniqueEmail("resetter");
      for (let i = 0; i < 10; i++) {
        const client = new ApiClient(app.app, { "X-Forwarded-For": `192.0.2.${i + 1}` });
        expect((await client.post("/api/auth/forgot-password", { email })).status).toBe(202);
      }
      const blocked = await new ApiClient(app.app, { "X-Forwarded-For": "192.0.2.99" }).post("/api/auth/forgot-password", { email });
      expect(blocked.status).toBe(429);
      expect(Number(blocked.headers["retry-after"])).toBeGreaterThan(0);
    } finally {
      await app.close();
    }
  });
});

describe("CSRF: state-changing requests need the custom header and our own origin", () => {
  const t = useTestApp();

  it("refuses a cookie-authenticated change without X-Runwright-Request (403) and changes nothing", async () => {
    const owner = await signUpCompany(t.app, "Before CSRF");
    const forged = await owner.api.patch("/api/company", { name: "Hijacked" }, { csrf: false });
    expect(forged.status).toBe(403);
    expect(forged.body.error.code).toBe("forbidden");
    expect(forged.body.error.message).toContain("X-Runwright-Request");
    expect((await t.db.getRepository(Company).findOneByOrFail({ id: owner.companyId })).name).toBe("Before CSRF");
    // Sign-out and sign-in are guarded too (no forced sign-out, no login CSRF).
    expect((await owner.api.post("/api/auth/sign-out", undefined, { csrf: false })).status).toBe(403);
    expect((await owner.api.get("/api/auth/session")).body.signedIn).toBe(true);
    expect((await new ApiClient(t.app.app).post("/api/auth/sign-in", { email: owner.email, password: TEST_PASSWORD }, { csrf: false })).status).toBe(403);
  });

  it("refuses a request from another origin even with the header", async () => {
    const owner = await signUpCompany(t.app);
    const evil = new ApiClient(t.app.app, { Origin: "http://evil.example" });
    expect((await evil.post("/api/auth/sign-in", { email: owner.email, password: TEST_PASSWORD })).status).toBe(403);
    const opaque = new ApiClient(t.app.app, { Origin: "null" });
    expect((await opaque.post("/api/auth/sign-in", { email: owner.email, password: TEST_PASSWORD })).status).toBe(403);
    // Against the running server, so Host is known and Origin can match it.
    const same = new ApiClient(t.app.url, { Origin: t.app.url });
    expect((await same.post("/api/auth/sign-in", { email: owner.email, password: TEST_PASSWORD })).status).toBe(200);
  });

  it("reads need no header", async () => {
    const owner = await signUpCompany(t.app);
    expect((await owner.api.get("/api/company")).status).toBe(200);
  });
});

describe("no password hash in any answer", () => {
  it("the shared helper would catch one", async () => {
    const { expectNoSecrets } = await import("../../support/api.js");
    expect(() => expectNoSecrets('{"passwordHash":"$argon2id$v=19$m=19456"}')).toThrow();
    expect(() => expectNoSecrets('{"name":"ok"}')).not.toThrow();
  });

  it("an app without a mail server still answers sign-up without leaking (the helper checks every response)", async () => {
    const db = await openTestDb();
    try {
      const api = new ApiClient(createApp({ db }));
      const response = await api.post("/api/auth/sign-up", { companyName: "Leak Check", name: "L", email: uniqueEmail("leak"), password: TEST_PASSWORD });
      expect(response.status).toBe(201);
      expect(JSON.stringify(response.body)).not.toMatch(/hash/i);
    } finally {
      await db.destroy();
    }
  });
});

describe("hostile bodies on every route that reads one", () => {
  const t = useTestApp();

  // Wrong types, nesting, huge and odd strings: each must get a 4xx in the error shape, never a 500.
  const BODIES: unknown[] = [
    [],
    [1, 2, 3],
    "a string",
    42,
    { email: ["a@b.test"], password: { $gt: "" } },
    { email: "x".repeat(100_000), password: "y".repeat(100_000), token: "z".repeat(5000) },
    { email: "a@b.test", password: null, name: 7, role: ["owner"], companyId: "' OR 1=1 --" },
    { companyName: "\u0000\u202e", name: "\ud800", email: "a@b.test", password: "p".repeat(12), token: "../../etc/passwd" },
    { currency: { toString: "USD" }, depositPercent: "NaN", taxRatePercent: 1e308, labourRateMinor: -0.5 },
  ];

  it("answers 4xx with the error shape, and the app keeps serving", async () => {
    const { listRoutes } = await import("../../../server/routes/route-table.js");
    const owner = await signUpCompany(t.app);
    const spare = (await owner.api.get("/api/members")).body.members[0].userId as string;
    const writes = listRoutes(t.app.app).filter((r) => r.path.startsWith("/api") && ["POST", "PATCH", "PUT"].includes(r.method));
    expect(writes.length).toBeGreaterThan(8);
    for (const route of writes) {
      if (route.path === "/api/auth/sign-out") continue; // reads no body
      const path = route.path.replace(":userId", spare).replace(":id", spare);
      for (const body of BODIES) {
        const response = await owner.api.call(route.method, path, body);
        expect(response.status, `${route.method} ${route.path} ${JSON.stringify(body).slice(0, 80)}`).toBeGreaterThanOrEqual(400);
        expect(response.status, `${route.method} ${route.path} ${JSON.stringify(body).slice(0, 80)}`).toBeLessThan(500);
        expect(typeof response.body.error?.message).toBe("string");
      }
    }
    expect((await owner.api.get("/api/auth/session")).body.signedIn).toBe(true);
  });
});
