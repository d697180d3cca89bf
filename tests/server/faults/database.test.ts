// The database fails under a running app, on a PostgreSQL cluster of this file's own (the rest of
// the suite keeps its database): stopped and started again → 503 in the error shape during the
// outage, quickly, and service again afterwards with the same sessions and no restart of the app; a
// Stripe webhook during the outage is answered 5xx and recorded once when it is redelivered; and a
// failure injected by a trigger half-way through a transaction leaves nothing half-written.
import { chmodSync, mkdtempSync, rmSync } from "node:fs";
import path from "node:path";
import type { DataSource } from "typeorm";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { createDataSource } from "../../../server/db/data-source.js";
import { findFreePort } from "../../../server/scripts/port-check.js";
import { LocalPostgres } from "../../../server/scripts/postgres.js";
import { signUpCompany, type SignedInOwner } from "../../support/accounts.js";
import { ApiClient } from "../../support/api.js";
import { startTestApp, type TestApp } from "../../support/app.js";
import { createJobWork, type JobWork } from "../../support/jobs.js";
import { CABIN_PRICES, createQuoteWork } from "../../support/quotes.js";
import { CARDS, fakeStripe, payOnPage } from "../../support/stripe.js";

const DATABASE = "runwright_faults";
/** The app's wait for a pooled connection (ms); a request in the outage must not hang much longer. */
const CONNECT_TIMEOUT_MS = 1000;

describe("database faults under a running app", () => {
  let folder: string;
  let cluster: LocalPostgres;
  let db: DataSource;
  let app: TestApp;
  let owner: SignedInOwner;
  let work: JobWork;

  beforeAll(async () => {
    // Inside the run's folder, which the postgres user can reach.
    folder = mkdtempSync(path.join(process.env.RUNWRIGHT_TEST_TMP ?? "/var/tmp", "faults-"));
    chmodSync(folder, 0o755);
    cluster = new LocalPostgres({ root: path.join(folder, "pg"), port: await findFreePort(), portVariable: "(test)", rootVariable: "(test)", throwaway: true });
    await cluster.ensureRunning();
    await cluster.ensureDatabase(DATABASE);
    db = createDataSource({ url: cluster.url(DATABASE), connectTimeoutMs: CONNECT_TIMEOUT_MS });
    await db.initialize();
    await db.runMigrations({ transaction: "all" });
    app = await startTestApp(db, { dbTimeoutMs: 1500 });
    owner = await signUpCompany(app);
    work = await createJobWork(owner.api);
  }, 60_000);
  afterAll(async () => {
    await app?.close();
    if (db?.isInitialized) await db.destroy();
    cluster?.stop({ force: true });
    if (folder) rmSync(folder, { recursive: true, force: true });
  });

  it("answers 503 in the error shape while PostgreSQL is stopped, within the timeout, and serves again once it is back", async () => {
    expect((await owner.api.get(`/api/jobs/${work.jobId}`)).status).toBe(200);
    cluster.stop({ force: true });
    try {
      const anonymous = new ApiClient(app.app);
      const attempts = [
        () => owner.api.get(`/api/jobs/${work.jobId}`),
        () => owner.api.get("/api/jobs"),
        () => owner.api.post("/api/clients", { name: "Written during the outage" }),
        () => owner.api.post(`/api/systems/${work.systemId}/solve`, {}),
        () => anonymous.post("/api/auth/sign-in", { email: owner.email, password: "whatever-it-is" }),
      ];
      for (const attempt of attempts) {
        const started = Date.now();
        const response = await attempt();
        const took = Date.now() - started;
        expect(response.status, JSON.stringify(response.body)).toBe(503);
        expect(response.body).toEqual({ error: { code: "service_unavailable", message: expect.stringMatching(/database/i) } });
        expect(JSON.stringify(response.body)).not.toMatch(/ECONNREFUSED|at .*\.ts|stack/i);
        // The pool's connect timeout plus a little: no hang.
        expect(took).toBeLessThan(CONNECT_TIMEOUT_MS + 4000);
      }
      const health = await anonymous.get("/api/health");
      expect(health.status).toBe(503);
      expect(health.body).toMatchObject({ status: "degraded", db: "down" });
    } finally {
      await cluster.ensureRunning();
    }
    // The same app and the same signed-in session, without a restart.
    let back = await owner.api.get(`/api/jobs/${work.jobId}`);
    for (let i = 0; back.status !== 200 && i < 20; i++) {
      await new Promise((resolve) => setTimeout(resolve, 250));
      back = await owner.api.get(`/api/jobs/${work.jobId}`);
    }
    expect(back.status).toBe(200);
    expect(back.body.id).toBe(work.jobId);
    const client = await owner.api.post("/api/clients", { name: "Written after the outage" });
    expect(client.status).toBe(201);
    // Nothing from the outage was written.
    expect(await db.query(`SELECT name FROM client WHERE company_id = $1 AND name LIKE 'Written %'`, [owner.companyId])).toEqual([{ name: "Written after the outage" }]);
  }, 60_000);

  it("answers a Stripe webhook 5xx while the database is down, so Stripe retries; the redelivery is recorded once", async () => {
    const q = await createQuoteWork(owner.api, work.jobId, app.url);
    const client = new ApiClient(app.app);
    expect((await client.post(`/api/quote-links/${q.token}/accept`, { name: "Outage Client", agree: true })).status).toBe(200);
    const stripe = fakeStripe(app);
    await stripe.hold();
    try {
      const checkout = await client.post(`/api/quote-links/${q.token}/deposit`);
      expect(checkout.status).toBe(200);
      expect((await payOnPage(checkout.body.url, CARDS.success)).status).toBe(303);
      const [completed] = await stripe.events("checkout.session.completed");
      expect(completed).toBeDefined();

      cluster.stop({ force: true });
      let during: Array<{ status: number; body: string }>;
      try {
        during = await stripe.deliver(completed.id);
      } finally {
        await cluster.ensureRunning();
      }
      expect(during).toHaveLength(1);
      expect(during[0].status).toBeGreaterThanOrEqual(500);
      expect(JSON.parse(during[0].body)).toMatchObject({ error: { code: "service_unavailable" } });

      // Back up: the pool reconnects on the next query. Stripe's retry (here: the test's redelivery) is recorded.
      let again = await stripe.deliver(completed.id);
      for (let i = 0; again[0].status !== 200 && i < 20; i++) {
        await new Promise((resolve) => setTimeout(resolve, 250));
        again = await stripe.deliver(completed.id);
      }
      expect(again[0].status).toBe(200);
      const repeat = await stripe.deliver(completed.id);
      expect(repeat[0].status).toBe(200);
      expect(JSON.parse(repeat[0].body)).toMatchObject({ duplicate: true });
      expect(await db.query(`SELECT status FROM payment WHERE quote_id = $1`, [q.quoteId])).toEqual([{ status: "paid" }]);
      expect(await db.query(`SELECT count(*)::int AS n FROM stripe_event WHERE id = $1`, [completed.id])).toEqual([{ n: 1 }]);
      expect((await owner.api.get(`/api/quotes/${q.quoteId}`)).body.status).toBe("deposit paid");
    } finally {
      await stripe.deliverImmediately();
    }
  }, 90_000);

  describe("a failure half-way through a transaction", () => {
    // A trigger raises on one table for this company only: the writes before it in the same
    // transaction must be rolled back with it.
    async function failInserts(table: string, companyId: string, condition = "true") {
      await db.query(`
        CREATE OR REPLACE FUNCTION runwright_injected_failure() RETURNS trigger LANGUAGE plpgsql AS $$
        BEGIN
          IF NEW.company_id = TG_ARGV[0]::uuid AND (${condition}) THEN RAISE EXCEPTION 'injected failure'; END IF;
          RETURN NEW;
        END $$`);
      await db.query(`CREATE TRIGGER runwright_injected_failure BEFORE INSERT ON ${table} FOR EACH ROW EXECUTE FUNCTION runwright_injected_failure('${companyId}')`);
      return () => db.query(`DROP TRIGGER runwright_injected_failure ON ${table}`);
    }
    const expectInternalError = (response: { status: number; body: unknown }) => {
      expect(response.status).toBe(500);
      expect(response.body).toEqual({ error: { code: "internal", message: expect.any(String) } });
      expect(JSON.stringify(response.body)).not.toMatch(/injected|trigger|at .*\.ts/);
    };

    it("a price-list import that fails at its third row saves none of them", async () => {
      const fresh = await signUpCompany(app);
      const restore = await failInserts("price_item", fresh.companyId, `(SELECT count(*) FROM price_item WHERE company_id = NEW.company_id) >= 2`);
      try {
        const csv = ["sku,description,category,unit,unit_cost", "A-1,First,device,each,1.00", "A-2,Second,device,each,2.00", "A-3,Third,device,each,3.00"].join("\n");
        const response = await fresh.api.upload("/api/price-list/import.csv?apply=1", { content: csv, name: "prices.csv", type: "text/csv" });
        expectInternalError(response);
      } finally {
        await restore();
      }
      expect(await db.query(`SELECT count(*)::int AS n FROM price_item WHERE company_id = $1`, [fresh.companyId])).toEqual([{ n: 0 }]);
    });

    it("a quote whose history row fails is not made, and its number is not used up", async () => {
      const fresh = await signUpCompany(app);
      const job = await createJobWork(fresh.api);
      for (const item of CABIN_PRICES) expect((await fresh.api.post("/api/price-list", item)).status).toBe(201);
      expect((await fresh.api.post(`/api/jobs/${job.jobId}/estimate/generate`)).status).toBe(200);
      const restore = await failInserts("quote_event", fresh.companyId);
      try {
        expectInternalError(await fresh.api.post(`/api/jobs/${job.jobId}/quotes`, {}));
      } finally {
        await restore();
      }
      expect(await db.query(`SELECT count(*)::int AS n FROM quote WHERE company_id = $1`, [fresh.companyId])).toEqual([{ n: 0 }]);
      const made = await fresh.api.post(`/api/jobs/${job.jobId}/quotes`, {});
      expect(made.status).toBe(201);
      expect(made.body.number).toMatch(/^Q-\d{4}-0001$/);
    });

    it("a deposit webhook that fails after the payment row records nothing, and its redelivery records it once", async () => {
      const fresh = await signUpCompany(app);
      const job = await createJobWork(fresh.api);
      const q = await createQuoteWork(fresh.api, job.jobId, app.url);
      const client = new ApiClient(app.app);
      expect((await client.post(`/api/quote-links/${q.token}/accept`, { name: "Trigger Client", agree: true })).status).toBe(200);
      const stripe = fakeStripe(app);
      await stripe.hold();
      try {
        const checkout = await client.post(`/api/quote-links/${q.token}/deposit`);
        expect((await payOnPage(checkout.body.url, CARDS.success)).status).toBe(303);
        const completed = (await stripe.events("checkout.session.completed")).find((e) => (e.event.data.object as { id: string }).id === checkout.body.url.slice(checkout.body.url.lastIndexOf("/") + 1));
        expect(completed).toBeDefined();
        // The payment row is written before the quote's history row; the history row fails.
        const restore = await failInserts("quote_event", fresh.companyId, `NEW.type = 'deposit_paid'`);
        let failed: Array<{ status: number }>;
        try {
          failed = await stripe.deliver(completed!.id);
        } finally {
          await restore();
        }
        expect(failed[0].status).toBe(500);
        expect(await db.query(`SELECT count(*)::int AS n FROM payment WHERE quote_id = $1`, [q.quoteId])).toEqual([{ n: 0 }]);
        expect(await db.query(`SELECT count(*)::int AS n FROM stripe_event WHERE id = $1`, [completed!.id])).toEqual([{ n: 0 }]);
        expect((await fresh.api.get(`/api/quotes/${q.quoteId}`)).body.status).toBe("accepted");

        expect((await stripe.deliver(completed!.id))[0].status).toBe(200);
        expect((await stripe.deliver(completed!.id))[0].status).toBe(200);
        expect(await db.query(`SELECT count(*)::int AS n FROM payment WHERE quote_id = $1`, [q.quoteId])).toEqual([{ n: 1 }]);
        expect((await fresh.api.get(`/api/quotes/${q.quoteId}`)).body.status).toBe("deposit paid");
      } finally {
        await stripe.deliverImmediately();
      }
    });
  });
});
