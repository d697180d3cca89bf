import type { DataSource } from "typeorm";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { createApp } from "../../../server/app.js";
import { Company } from "../../../server/db/entities/index.js";
import { AUTH_RATE_LIMIT } from "../../../server/middleware/rate-limit.js";
import { ApiClient } from "../../support/api.js";
import { signUpCompany, TEST_PASSWORD, uniqueEmail } from "../../support/accounts.js";
import { startTestApp, useTestApp } from "../../support/app.js";
import { openTestDb } from "../../support/test-db.js";
import { createJobWork, exampleSystem } from "../../support/jobs.js";
import { createQuoteWork } from "../../support/quotes.js";
import { payDeposit } from "../../support/stripe.js";

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

describe("every limited route: the 11th request within 15 minutes gets 429", () => {
  let db: DataSource;
  beforeAll(async () => {
    db = await openTestDb();
  });
  afterAll(async () => {
    await db?.destroy();
  });

  const NO_SUCH_TOKEN = `00000000-0000-4000-8000-000000000000.${"A".repeat(43)}`;
  // [route, body of the i-th request, what is counted]
  const LIMITED: Array<[string, (i: number, email: string) => Record<string, unknown>, "ip" | "email"]> = [
    ["/api/auth/sign-in", (i) => ({ email: `ip-${i}-${Date.now()}@example.test`, password: "wrong-password" }), "ip"],
    ["/api/auth/forgot-password", (i) => ({ email: `ip-${i}-${Date.now()}@example.test` }), "ip"],
    ["/api/auth/sign-up", (i) => ({ companyName: `Limit ${i}`, name: "L", email: uniqueEmail(`limit${i}`), password: TEST_PASSWORD }), "ip"],
    ["/api/auth/sign-up", (_i, email) => ({ companyName: "Limit", name: "L", email, password: TEST_PASSWORD }), "email"],
    ["/api/auth/reset-password", () => ({ token: NO_SUCH_TOKEN, password: TEST_PASSWORD }), "ip"],
    ["/api/invitations/lookup", () => ({ token: NO_SUCH_TOKEN }), "ip"],
    ["/api/invitations/accept", () => ({ token: NO_SUCH_TOKEN, name: "N", password: TEST_PASSWORD }), "ip"],
    // The client's answers and "Pay deposit": counted before the token is looked at.
    [`/api/quote-links/${NO_SUCH_TOKEN}/accept`, () => ({ name: "N", agree: true }), "ip"],
    [`/api/quote-links/${NO_SUCH_TOKEN}/decline`, () => ({ reason: "R" }), "ip"],
    [`/api/quote-links/${NO_SUCH_TOKEN}/deposit`, () => ({}), "ip"],
  ];

  it("has a row for every route that has a rate limiter", async () => {
    const { rateLimitedRoutes } = await import("../hostile/route-walk.js");
    const app = await startTestApp(db, { authRateLimit: AUTH_RATE_LIMIT });
    try {
      const limited = rateLimitedRoutes(app.app).map((key) => key.replace(":token", NO_SUCH_TOKEN));
      expect(limited.length).toBeGreaterThanOrEqual(9);
      expect(limited.filter((key) => !LIMITED.some(([route]) => key === `POST ${route}`)), "limited routes missing from LIMITED").toEqual([]);
    } finally {
      await app.close();
    }
  });

  for (const [route, body, counted] of LIMITED) {
    it(`${route}, counted by ${counted}`, async () => {
      const app = await startTestApp(db, { authRateLimit: AUTH_RATE_LIMIT });
      try {
        const email = uniqueEmail("counted");
        // By IP: one address sends them all. By e-mail: every request from its own address.
        const client = (i: number) => new ApiClient(app.app, { "X-Forwarded-For": counted === "ip" ? "203.0.113.50" : `198.51.100.${i + 1}` });
        for (let i = 0; i < 10; i++) expect((await client(i).post(route, body(i, email))).status, `request ${i + 1}`).not.toBe(429);
        const blocked = await client(10).post(route, body(10, email));
        expect(blocked.status).toBe(429);
        expect(Number(blocked.headers["retry-after"])).toBeGreaterThan(0);
      } finally {
        await app.close();
      }
    });
  }
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

  it("every state-changing route refuses a request without the header (403) and nothing changes", async () => {
    const { listRoutes } = await import("../../../server/routes/route-table.js");
    const { companyFixture, companySnapshot } = await import("../../support/fixtures.js");
    const f = await companyFixture(t.db, t.app);
    // Stripe's webhook carries no session and no Origin: its signature is its proof (400 without one, tested in payments).
    const changes = listRoutes(t.app.app).filter((r) => r.path.startsWith("/api") && r.method !== "GET" && r.path !== "/api/webhooks/stripe");
    expect(changes.length).toBeGreaterThan(10);
    const before = await companySnapshot(t.db, f.companyId);
    const companies = await t.db.query(`SELECT count(*)::int AS n FROM company`);
    for (const route of changes) {
      const path = route.path.replace(":userId", f.spare.userId).replace(":id", f.invitationId);
      const response = await f.owner.api.call(route.method, path, { email: f.spare.email, role: "installer", companyName: "Forged", name: "F", password: TEST_PASSWORD }, { csrf: false });
      expect(response.status, `${route.method} ${route.path}`).toBe(403);
    }
    const unsigned = await f.owner.api.post("/api/webhooks/stripe", { id: "evt_csrf", type: "checkout.session.completed" }, { csrf: false });
    expect(unsigned.status).toBe(400);
    expect(await companySnapshot(t.db, f.companyId)).toEqual(before);
    expect(await t.db.query(`SELECT count(*)::int AS n FROM company`)).toEqual(companies);
  });

  it("accepts the public address as the origin behind a proxy that rewrites Host", async () => {
    const { startTestApp: start } = await import("../../support/app.js");
    const proxied = await start(t.db, { publicUrl: "https://dc.example.test" });
    try {
      const owner = await signUpCompany(proxied);
      const browser = new ApiClient(proxied.app, { Origin: "https://dc.example.test" });
      expect((await browser.post("/api/auth/sign-in", { email: owner.email, password: TEST_PASSWORD })).status).toBe(200);
      const other = new ApiClient(proxied.app, { Origin: "https://elsewhere.example.test" });
      expect((await other.post("/api/auth/sign-in", { email: owner.email, password: TEST_PASSWORD })).status).toBe(403);
    } finally {
      await proxied.close();
    }
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
  it("the shared helper that checks every response would catch one", async () => {
    const { expectNoSecrets } = await import("../../support/api.js");
    expect(() => expectNoSecrets('{"passwordHash":"$argon2id$v=19$m=19456"}')).toThrow();
    expect(() => expectNoSecrets(`{"x":"${"ab12".repeat(16)}"}`)).toThrow();
    expect(() => expectNoSecrets('{"name":"ok","id":"5e1d0000-0000-4000-8000-00000000d001"}')).not.toThrow();
  });
});

describe("hostile input on every route that reads a body", () => {
  const t = useTestApp();

  // A valid body per route; each field is then replaced by hostile values one at a time.
  const VALID: Record<string, Record<string, unknown>> = {
    "POST /api/auth/sign-up": { companyName: "Hostile Co", name: "H", email: "hostile@example.test", password: TEST_PASSWORD },
    "POST /api/auth/sign-in": { email: "hostile@example.test", password: TEST_PASSWORD },
    "POST /api/auth/switch-company": { companyId: "5e1d0000-0000-4000-8000-00000000d001" },
    "POST /api/auth/forgot-password": { email: "hostile@example.test" },
    "POST /api/auth/reset-password": { token: `00000000-0000-4000-8000-000000000000.${"A".repeat(43)}`, password: TEST_PASSWORD },
    "PATCH /api/company": { name: "N", licenceNumber: "L", contactEmail: "c@example.test", phone: "1", address: "A", currency: "USD", taxRatePercent: 1, defaultMarkupPercent: 1, labourRateMinor: 1, depositPercent: 1 },
    "PATCH /api/members/:userId": { role: "installer" },
    "POST /api/invitations": { email: "hostile-invite@example.test", role: "installer" },
    "POST /api/invitations/lookup": { token: `00000000-0000-4000-8000-000000000000.${"A".repeat(43)}` },
    "POST /api/invitations/accept": { token: `00000000-0000-4000-8000-000000000000.${"A".repeat(43)}`, name: "N", password: TEST_PASSWORD },
    "POST /api/clients": { name: "C", email: "c@client.test", phone: "1", billingAddress: "A", notes: "N" },
    "PATCH /api/clients/:clientId": { name: "C", email: "c@client.test", phone: "1", billingAddress: "A", notes: "N" },
    "POST /api/jobs": { clientId: "5e1d0000-0000-4000-8000-00000000d001", title: "T", siteAddress: "S", status: "lead", notes: "N" },
    "PATCH /api/jobs/:jobId": { title: "T", siteAddress: "S", status: "won", notes: "N" },
    "POST /api/jobs/:jobId/systems": { name: "S", nominalVoltage: 24, units: "metric", limitProfileId: null, document: exampleSystem("telecom-48v") },
    "POST /api/jobs/:jobId/attachments": { file: "x" },
    "PUT /api/systems/:systemId": { version: 1, name: "S", limitProfileId: null, document: exampleSystem("cabin-24v") },
    "POST /api/systems/:systemId/solve": { document: exampleSystem("cabin-24v") },
    "POST /api/systems/:systemId/autosize": { document: exampleSystem("telecom-48v") },
    "POST /api/systems/:systemId/runs.csv": { version: 1, file: "id,from,to,length,size" },
    "POST /api/limit-profiles": { name: "L", branchPercent: 3, totalPercent: 5, criticalPercent: 3, nearFraction: 0.8, notes: "N" },
    "PATCH /api/limit-profiles/:profileId": { name: "L", branchPercent: 3, totalPercent: 5, criticalPercent: 3, nearFraction: 0.8, notes: "N" },
    "POST /api/price-list": { sku: "H-1", description: "D", category: "cable", unit: "m", unitCostMinor: 100, sellPriceMinor: 150, cableSize: "16 mm2", cableMaterial: "copper", conductors: 1, ratingA: null },
    "PATCH /api/price-list/:itemId": { sku: "H-2", description: "D", category: "fuse", unit: "each", unitCostMinor: 100, ratingA: 60 },
    "POST /api/price-list/import.csv": { file: "sku,description,category,unit,unit_cost" },
    "PATCH /api/company/estimating": { wastePercent: 10, labourMinutesPerRun: 20, labourMinutesPerMetre: 1, labourMinutesPerTermination: 4, quoteValidDays: 30, quoteTerms: "T" },
    "POST /api/company/logo": { file: "x" },
    "POST /api/jobs/:jobId/estimate/generate": {},
    "PUT /api/jobs/:jobId/estimate": {
      version: 1,
      markupPercent: 10,
      discountMinor: 0,
      taxRatePercent: 5,
      depositMode: "percent",
      depositPercent: 30,
      depositFixedMinor: 0,
      wastePercent: 10,
      manual: [{ category: "other", description: "M", quantity: 1, unit: "each", unitCostMinor: 100, markupPercent: null }],
      overrides: { labour: { markupPercent: 5 } },
      supplied: [],
    },
    "POST /api/jobs/:jobId/quotes": { validUntil: "2099-01-01", terms: "T" },
    "POST /api/quotes/:quoteId/send": { to: "hostile-client@example.test", message: "M" },
    "POST /api/quotes/:quoteId/link": {},
    "POST /api/quote-links/:token/accept": { name: "N", agree: true },
    "POST /api/quote-links/:token/decline": { reason: "R" },
    "POST /api/quote-links/:token/deposit": {},
    "POST /api/payments/:paymentId/refunds": { amountMinor: 100, reason: "duplicate" },
    "POST /api/webhooks/stripe": { id: "evt_hostile", type: "checkout.session.completed", data: { object: {} } },
  };
  const HOSTILE: unknown[] = [
    "a\u0000b",
    "line\nbreak\u0007",
    "x".repeat(100_000),
    `${"-".repeat(36)}.${"A".repeat(43)}`,
    `${"a".repeat(36)}.${"A".repeat(43)}`,
    "' OR 1=1 --",
    "\ud800",
    12345,
    1e308,
    -1,
    null,
    true,
    ["a"],
    { $gt: "" },
  ];
  const WHOLE_BODIES: unknown[] = [[], "a string", 42, null];

  it("never answers 500: every refusal is a 4xx in the error shape", async () => {
    const { listRoutes } = await import("../../../server/routes/route-table.js");
    const owner = await signUpCompany(t.app);
    const work = await createJobWork(owner.api);
    const quotes = await createQuoteWork(owner.api, work.jobId, t.app.url);
    const ids: Record<string, string> = {
      userId: owner.userId,
      clientId: work.clientId,
      jobId: work.jobId,
      systemId: work.systemId,
      profileId: work.profileId,
      itemId: quotes.priceItemId,
      quoteId: quotes.quoteId,
      token: quotes.token,
      paymentId: await payDeposit(t.app, owner.api, work.jobId, quotes.token),
    };
    const writes = listRoutes(t.app.app).filter((r) => r.path.startsWith("/api") && ["POST", "PATCH", "PUT"].includes(r.method) && r.path !== "/api/auth/sign-out");
    expect(writes.map((r) => `${r.method} ${r.path}`).filter((key) => !(key in VALID)), "routes without a VALID body").toEqual([]);
    let requests = 0;
    for (const route of writes) {
      const key = `${route.method} ${route.path}`;
      const path = route.path.replace(/:(\w+)/g, (_, name: string) => ids[name] ?? `:${name}`);
      const bodies = [...WHOLE_BODIES];
      for (const field of Object.keys(VALID[key])) for (const value of HOSTILE) bodies.push({ ...VALID[key], [field]: value });
      for (const body of bodies) {
        const response = await owner.api.call(route.method, path, body);
        requests++;
        const label = `${key} ${JSON.stringify(body).slice(0, 120)}`;
        expect(response.status, label).toBeLessThan(500);
        if (response.status >= 400) expect(typeof response.body.error?.message, label).toBe("string");
      }
    }
    const expected = writes.reduce((n, r) => n + WHOLE_BODIES.length + Object.keys(VALID[`${r.method} ${r.path}`]).length * HOSTILE.length, 0);
    expect(requests).toBe(expected);
    expect(requests).toBeGreaterThan(400);
    // About 1,000 requests, some rendering a quote PDF: a sweep, not a speed check.
  }, 180_000);
});
