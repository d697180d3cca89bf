// Two app processes on different ports and one database, as behind a load balancer: a session made
// on one is valid on the other, an edit on one is seen by the other, a queued e-mail is sent once
// though both run workers, a Stripe event delivered to both is recorded once; and SIGTERM lets a
// request in flight finish before the process exits.
import http from "node:http";
import { randomBytes } from "node:crypto";
import { afterAll, beforeAll, describe, expect, inject, it, vi } from "vitest";
import pg from "pg";
import { connectToStripeFake } from "../../../server/payments/local-fake.js";
import { findFreePort } from "../../../server/scripts/port-check.js";
import { TEST_PASSWORD, uniqueEmail } from "../../support/accounts.js";
import { ApiClient, type ApiResponse } from "../../support/api.js";
import { startInstance, type Instance } from "../../support/instances.js";
import { mailsTo, linkIn, waitForMail } from "../../support/mail.js";
import { CABIN_PRICES } from "../../support/quotes.js";
import { tcpRelay, type Relay } from "../../support/relay.js";
import { CARDS, payOnPage } from "../../support/stripe.js";
import { createEmptyDatabase } from "../../support/test-db.js";
import { exampleSystem } from "../../support/jobs.js";

const sessionCookie = (response: ApiResponse) => ([] as string[]).concat(response.headers["set-cookie"] ?? []).find((c) => c.startsWith("runwright.sid="))!.split(";")[0];

describe("two instances on one database", () => {
  let database: { url: string; drop: () => Promise<void> };
  let relay: Relay;
  let a: Instance;
  let b: Instance;
  let sql: pg.Client;
  let stripeAccount: { secretKey: string; apiBase: string };

  beforeAll(async () => {
    database = await createEmptyDatabase(`runwright_scale_${randomBytes(3).toString("hex")}`);
    relay = tcpRelay(await findFreePort(), inject("mailCatcher").smtpPort);
    await relay.open();
    const [portA, portB] = [await findFreePort(), await findFreePort()];
    // One Stripe account with a webhook endpoint on each instance, both signed with the same secret.
    const stripe = await connectToStripeFake(inject("stripeFake").url, `http://127.0.0.1:${portA}/api/webhooks/stripe`);
    const second = await fetch(`${stripe.apiBase}/_fake/webhook-endpoints`, {
      method: "POST",
      headers: { Authorization: `Bearer ${stripe.secretKey}`, "Content-Type": "application/json" },
      body: JSON.stringify({ url: `http://127.0.0.1:${portB}/api/webhooks/stripe`, secret: stripe.webhookSecret }),
    });
    expect(second.status).toBe(201);
    stripeAccount = { secretKey: stripe.secretKey, apiBase: stripe.apiBase! };
    const shared = {
      DATABASE_URL: database.url,
      // The balancer's address in e-mailed links, whichever instance sends them (here: A's).
      PUBLIC_URL: `http://127.0.0.1:${portA}`,
      SESSION_SECRET: randomBytes(32).toString("base64url"),
      SMTP_HOST: "127.0.0.1",
      SMTP_PORT: String(relay.port),
      STRIPE_SECRET_KEY: stripe.secretKey,
      STRIPE_WEBHOOK_SECRET: stripe.webhookSecret,
      STRIPE_API_BASE: stripe.apiBase!,
      JOB_RETRY_LIMIT: "5",
      JOB_RETRY_DELAY_SECONDS: "1",
      JOB_POLL_SECONDS: "0.5",
      DB_CONNECT_TIMEOUT_MS: "2000",
    };
    // Started together on an empty database: both migrate, one after the other (an advisory lock).
    [a, b] = await Promise.all([startInstance({ ...shared, PORT: String(portA) }), startInstance({ ...shared, PORT: String(portB) })]);
    sql = new pg.Client({ connectionString: database.url });
    await sql.connect();
  }, 120_000);
  afterAll(async () => {
    for (const instance of [a, b]) {
      if (instance && instance.child.exitCode === null) {
        instance.kill("SIGTERM");
        await instance.exited;
      }
    }
    await sql?.end();
    await relay?.cut();
    await database?.drop();
  });

  it("migrated once, and shares sessions and edits between the instances", async () => {
    const migrations = await sql.query(`SELECT count(*)::int AS n, count(DISTINCT name)::int AS names FROM typeorm_migrations`);
    expect(migrations.rows[0].n).toBe(migrations.rows[0].names);
    expect(migrations.rows[0].n).toBeGreaterThan(0);

    const onA = new ApiClient(a.url);
    const email = uniqueEmail("scale-owner");
    const signUp = await onA.post("/api/auth/sign-up", { companyName: "Twin Ridge Power (test)", name: "Sky Owner", email, password: TEST_PASSWORD });
    expect(signUp.status).toBe(201);
    // The session made on A, presented to B.
    const onB = new ApiClient(b.url, { Cookie: sessionCookie(signUp) });
    const me = await onB.get("/api/auth/session");
    expect(me.status).toBe(200);
    expect(me.body.user.email).toBe(email);

    const client = await onA.post("/api/clients", { name: "Made on A" });
    expect(client.status).toBe(201);
    const seen = await onB.get("/api/clients");
    expect(seen.status).toBe(200);
    expect(seen.body.items.map((c: { name: string }) => c.name)).toContain("Made on A");
    expect((await onB.patch(`/api/clients/${client.body.id}`, { name: "Renamed on B" })).status).toBe(200);
    expect((await onA.get(`/api/clients/${client.body.id}`)).body.name).toBe("Renamed on B");
    // Signing out on B ends the session on A too.
    expect((await onB.post("/api/auth/sign-out")).status).toBe(204);
    expect((await onA.get("/api/clients")).status).toBe(401);
  });

  it("sends a queued e-mail once though both instances run workers, and records a Stripe event delivered to both once", async () => {
    const owner = new ApiClient(a.url);
    const signUp = await owner.post("/api/auth/sign-up", { companyName: "Twin Ridge Quotes (test)", name: "Sky Owner", email: uniqueEmail("scale-quotes"), password: TEST_PASSWORD });
    expect(signUp.status).toBe(201);
    const onB = new ApiClient(b.url, { Cookie: sessionCookie(signUp) });
    for (const item of CABIN_PRICES) expect((await owner.post("/api/price-list", item)).status).toBe(201);
    const clientEmail = uniqueEmail("scale-client");
    const client = await owner.post("/api/clients", { name: "Wren Holloway (test)", email: clientEmail });
    const job = await owner.post("/api/jobs", { clientId: client.body.id, title: "Boathouse lighting", siteAddress: "Slip 4" });
    expect((await owner.post(`/api/jobs/${job.body.id}/systems`, { name: "Boathouse", document: exampleSystem("cabin-24v") })).status).toBe(201);
    expect((await owner.post(`/api/jobs/${job.body.id}/estimate/generate`)).status).toBe(200);
    const quote = await onB.post(`/api/jobs/${job.body.id}/quotes`, {});
    expect(quote.status).toBe(201);

    // The mail server is down when A sends: a job is queued; both instances poll for it.
    await relay.refuse("421 mail.test Service not available\r\n");
    const pending = await owner.post(`/api/quotes/${quote.body.id}/send`, { to: clientEmail });
    expect(pending.status).toBe(202);
    await vi.waitFor(() => expect(relay.connections.length).toBeGreaterThanOrEqual(2), { timeout: 20_000, interval: 100 });
    await relay.open();
    await vi.waitFor(async () => expect((await onB.get(`/api/quotes/${quote.body.id}`)).body.status).toBe("sent"), { timeout: 30_000, interval: 200 });
    const mail = await waitForMail(clientEmail);
    await new Promise((resolve) => setTimeout(resolve, 2000));
    expect(await mailsTo(clientEmail)).toHaveLength(1);
    const jobs = await sql.query(`SELECT state FROM pgboss.job WHERE name = 'quote-send' AND data->>'quoteId' = $1`, [quote.body.id]);
    expect(jobs.rows).toEqual([{ state: "completed" }]);

    // The client accepts and pays; the fake delivers the event to both instances.
    const link = linkIn(mail, `${a.url}/q/`);
    const token = link.slice(link.lastIndexOf("/") + 1);
    const payer = new ApiClient(b.url);
    expect((await payer.post(`/api/quote-links/${token}/accept`, { name: "Wren Holloway", agree: true })).status).toBe(200);
    const checkout = await payer.post(`/api/quote-links/${token}/deposit`);
    expect(checkout.status).toBe(200);
    expect((await payOnPage(checkout.body.url, CARDS.success)).status).toBe(303);
    await vi.waitFor(async () => expect((await owner.get(`/api/quotes/${quote.body.id}`)).body.status).toBe("deposit paid"), { timeout: 20_000, interval: 200 });
    const sessionId = checkout.body.url.slice(checkout.body.url.lastIndexOf("/") + 1);
    // Both endpoints got the event and answered 200: one recorded it, the other found it recorded.
    const event = await vi.waitFor(
      async () => {
        const listed = await fetch(`${stripeAccount.apiBase}/_fake/events?type=checkout.session.completed`, { headers: { Authorization: `Bearer ${stripeAccount.secretKey}` } });
        const found = ((await listed.json()) as { data: Array<{ id: string; event: { data: { object: { id: string } } }; attempts: Array<{ url: string; status?: number }> }> }).data.find((e) => e.event.data.object.id === sessionId);
        expect(found).toBeDefined();
        expect(new Set(found!.attempts.filter((t) => t.status === 200).map((t) => new URL(t.url).port))).toEqual(new Set([new URL(a.url).port, new URL(b.url).port]));
        return found!;
      },
      { timeout: 15_000, interval: 200 },
    );
    expect((await sql.query(`SELECT count(*)::int AS n FROM stripe_event WHERE id = $1`, [event.id])).rows[0].n).toBe(1);
    const recorded = await sql.query(`SELECT count(*)::int AS n FROM payment WHERE stripe_checkout_session_id = $1`, [sessionId]);
    expect(recorded.rows[0].n).toBe(1);
    const receipts = await vi.waitFor(async () => {
      const found = (await mailsTo(clientEmail)).filter((m) => /receipt/i.test(m.subject));
      expect(found.length).toBeGreaterThanOrEqual(1);
      return found;
    }, { timeout: 10_000, interval: 200 });
    await new Promise((resolve) => setTimeout(resolve, 1500));
    expect((await mailsTo(clientEmail)).filter((m) => /receipt/i.test(m.subject))).toHaveLength(receipts.length);
    expect(receipts).toHaveLength(1);
  }, 90_000);

  it("finishes a request in flight on SIGTERM, then exits 0; the other instance keeps serving", async () => {
    const owner = new ApiClient(b.url);
    const email = uniqueEmail("graceful");
    expect((await owner.post("/api/auth/sign-up", { companyName: "Graceful Co (test)", name: "Gale Owner", email, password: TEST_PASSWORD })).status).toBe(201);
    // A sign-in whose body arrives in two parts, SIGTERM between them.
    const body = JSON.stringify({ email, password: TEST_PASSWORD });
    const url = new URL("/api/auth/sign-in", a.url);
    const answer = new Promise<{ status: number; text: string }>((resolve, reject) => {
      const req = http.request(url, { method: "POST", headers: { "Content-Type": "application/json", "Content-Length": Buffer.byteLength(body), "X-Runwright-Request": "1" } }, (res) => {
        let text = "";
        res.on("data", (c) => (text += c));
        res.on("end", () => resolve({ status: res.statusCode ?? 0, text }));
      });
      req.on("error", reject);
      req.write(body.slice(0, 10));
      setTimeout(() => {
        a.kill("SIGTERM");
        setTimeout(() => req.end(body.slice(10)), 500);
      }, 300);
    });
    const finished = await answer;
    expect(finished.status, finished.text).toBe(200);
    expect(JSON.parse(finished.text).user.email).toBe(email);
    expect(await a.exited).toBe(0);
    expect(a.output.join("")).toMatch(/SIGTERM: finishing requests in flight/);
    // A new connection to the stopped instance is refused; B still answers.
    await expect(fetch(`${a.url}/api/health`)).rejects.toThrow();
    expect((await fetch(`${b.url}/api/health`)).status).toBe(200);
  }, 60_000);
});
