// Hostile input and races around deposits (Stripe Checkout against the project's Stripe fake): odd
// but validly signed events, events out of order, refunds racing webhooks and each other, tenancy,
// what the client's page and the log may show. Each started as a review probe of a real bug.
import { randomUUID } from "node:crypto";
import pg from "pg";
import pino from "pino";
import type Stripe from "stripe";
import { describe, expect, it } from "vitest";
import { DepositCheckout, Payment, PaymentRefund, Quote, StripeEvent } from "../../../server/db/entities/index.js";
import { ApiClient } from "../../support/api.js";
import { useTestApp } from "../../support/app.js";
import { companyFixture, type CompanyFixture } from "../../support/fixtures.js";
import { mailsTo } from "../../support/mail.js";
import { testDatabaseUrl } from "../../support/test-db.js";
import { CARDS, eventually, fakeStripe, sessionIdOf } from "../../support/stripe.js";

describe("deposits: hostile input and races", () => {
  const t = useTestApp();

  // ------------------------------------------------------------------ helpers

  async function acceptedQuote() {
    const f = await companyFixture(t.db, t.app);
    const q = await f.accepted();
    const quote = await t.db.manager.findOneByOrFail(Quote, { id: q.quoteId });
    return { f, token: q.token, quoteId: q.quoteId, clientEmail: q.clientEmail, quote, client: new ApiClient(t.app.app) };
  }

  async function startCheckout(token: string): Promise<string> {
    const answer = await new ApiClient(t.app.app).post(`/api/quote-links/${token}/deposit`);
    expect(answer.status, JSON.stringify(answer.body)).toBe(200);
    return answer.body.url as string;
  }

  /** A paid deposit: the payment row and its PaymentIntent id. */
  async function paidDeposit(f: CompanyFixture) {
    const q = await f.paid();
    const payment = await t.db.manager.findOneByOrFail(Payment, { id: q.paymentId });
    expect(payment.stripePaymentIntentId).toMatch(/^pi_/);
    return { ...q, payment, intent: payment.stripePaymentIntentId! };
  }

  const eventOf = (type: string, object: unknown, created = Math.floor(Date.now() / 1000)) => ({
    id: `evt_probe_${randomUUID().replace(/-/g, "")}`,
    object: "event",
    api_version: "2025-01-01",
    created,
    livemode: false,
    type,
    data: { object },
  });

  /** POSTs a body to the webhook signed with this app's secret, like Stripe. */
  async function postSigned(body: unknown, contentType = "application/json") {
    const payload = typeof body === "string" ? body : JSON.stringify(body);
    const signature = fakeStripe(t.app).sdk.webhooks.generateTestHeaderString({ payload, secret: t.app.stripe!.webhookSecret });
    const response = await fetch(`${t.app.url}/api/webhooks/stripe`, { method: "POST", headers: { "Content-Type": contentType, "Stripe-Signature": signature }, body: payload });
    const text = await response.text();
    let json: any = null;
    try {
      json = JSON.parse(text);
    } catch {
      /* not JSON */
    }
    return { status: response.status, body: json, text };
  }

  const sessionObject = (id: string, quote: Quote, over: Record<string, unknown> = {}) => ({
    id,
    object: "checkout.session",
    mode: "payment",
    status: "complete",
    payment_status: "paid",
    amount_total: quote.depositMinor,
    currency: quote.currency.toLowerCase(),
    payment_intent: `pi_probe_${randomUUID().replace(/-/g, "").slice(0, 20)}`,
    metadata: { quoteId: quote.id },
    customer_details: { email: "payer@example.test", name: "Probe Payer" },
    ...over,
  });

  const paymentsOf = (quoteId: string) => t.db.manager.findBy(Payment, { quoteId });

  /** PostgreSQL's count of deadlocks detected in this database (its statistics lag a little). */
  async function deadlocks(): Promise<number> {
    await new Promise((resolve) => setTimeout(resolve, 1200));
    const [row]: Array<{ n: string }> = await t.db.query(`SELECT deadlocks AS n FROM pg_stat_database WHERE datname = current_database()`);
    return Number(row.n);
  }

  async function waitingAdvisoryLocks(): Promise<number> {
    const [row]: Array<{ n: string }> = await t.db.query(`SELECT count(*) AS n FROM pg_locks WHERE locktype = 'advisory' AND NOT granted`);
    return Number(row.n);
  }

  // ------------------------------------------------------------------ bugs

  it("an Owner's refund while a refund webhook of the same payment is being recorded: both succeed (no deadlock, no 500)", async () => {
    const f = await companyFixture(t.db, t.app);
    const { payment, intent } = await paidDeposit(f);
    const fake = fakeStripe(t.app);
    await fake.hold();
    const locker = new pg.Client({ connectionString: testDatabaseUrl() });
    await locker.connect();
    try {
      // Refunded from Stripe's dashboard: its refund.created is on its way to the app.
      const dashboardRefund = await fake.sdk.refunds.create({ payment_intent: intent, amount: 100 });
      const created = (await fake.events("refund.created")).find((e) => (e.event.data.object as Stripe.Refund).id === dashboardRefund.id)!;

      // Another delivery for this PaymentIntent holds its advisory lock for a moment (any event of it would).
      const deadlocksBefore = await deadlocks();
      await locker.query("BEGIN");
      await locker.query(`SELECT pg_advisory_xact_lock(hashtext('stripe-pi:' || $1))`, [intent]);
      const webhook = fake.deliver(created.id);
      await eventually(async () => ((await waitingAdvisoryLocks()) >= 1 ? true : undefined), 5000, "the webhook to wait for the PaymentIntent");
      // The Owner presses Refund: payment row locked, Stripe called, then the PaymentIntent's lock.
      const owner = f.owner.api.post(`/api/payments/${payment.id}/refunds`, { amountMinor: 200 });
      await eventually(async () => ((await waitingAdvisoryLocks()) >= 2 ? true : undefined), 5000, "the refund to wait for the PaymentIntent");
      await locker.query("COMMIT");

      const [delivered, refunded] = await Promise.all([webhook, owner]);
      const afterRow = await t.db.manager.findOneByOrFail(Payment, { id: payment.id });
      const rows = await t.db.manager.findBy(PaymentRefund, { stripePaymentIntentId: intent });
      const atStripe = (await fake.events("refund.created")).filter((e) => (e.event.data.object as Stripe.Refund).payment_intent === intent).length;
      const state = { webhook: delivered[0].status, owner: refunded.status, ownerError: refunded.body?.error?.code ?? null, refundsAtStripe: atStripe, refundedMinor: afterRow.refundedMinor, refundRows: rows.length, deadlocksSeen: (await deadlocks()) - deadlocksBefore };
      // Stripe made both refunds (100 + 200); the app must answer both and record both.
      expect(state).toEqual({ webhook: 200, owner: 201, ownerError: null, refundsAtStripe: 2, refundedMinor: 300, refundRows: 2, deadlocksSeen: 0 });
    } finally {
      await locker.query("ROLLBACK").catch(() => {});
      await locker.end();
      await fake.deliverImmediately();
    }
  });

  it("two partial refunds pressed at once (webhooks delivered as usual): both 201 and both recorded, never a 500", async () => {
    const f = await companyFixture(t.db, t.app);
    const { payment, intent } = await paidDeposit(f);
    expect(payment.amountMinor).toBeGreaterThan(600);
    const deadlocksBefore = await deadlocks();
    const answers = await Promise.all([
      f.owner.api.post(`/api/payments/${payment.id}/refunds`, { amountMinor: 300 }),
      f.owner.api.post(`/api/payments/${payment.id}/refunds`, { amountMinor: 300 }),
    ]);
    // Both refunds exist at Stripe whatever the app answered; their webhooks record them in the end.
    const atStripe = (await fakeStripe(t.app).events("refund.created")).filter((e) => (e.event.data.object as Stripe.Refund).payment_intent === intent).length;
    await eventually(async () => ((await t.db.manager.findOneByOrFail(Payment, { id: payment.id })).refundedMinor === 300 * atStripe ? true : undefined), 10_000, "the refunds recorded");
    const state = { statuses: answers.map((a) => a.status).sort(), refundsAtStripe: atStripe, deadlocksSeen: (await deadlocks()) - deadlocksBefore };
    expect(state).toEqual({ statuses: [201, 201], refundsAtStripe: 2, deadlocksSeen: 0 });
  });

  it("a flagged (wrong amount) payment refunded in full is not counted as a deposit received on the dashboard", async () => {
    const { f, token, quoteId, quote } = await acceptedQuote();
    const url = await startCheckout(token);
    const short = quote.depositMinor - 100;
    expect((await fakeStripe(t.app).pay(sessionIdOf(url), CARDS.success, { amountTotal: short })).outcome).toBe("succeeded");
    const [flagged] = await eventually(async () => {
      const found = await paymentsOf(quoteId);
      return found.length > 0 ? found : undefined;
    });
    expect(flagged.status).toBe("mismatch");
    const refund = await f.owner.api.post(`/api/payments/${flagged.id}/refunds`, {});
    expect(refund.status, JSON.stringify(refund.body)).toBe(201);
    const dash = await f.owner.api.get("/api/dashboard");
    // No deposit was received for this company: the only money was wrong, and it went back.
    expect(dash.body.deposits.receivedThisMonth).toEqual({ count: 0, amountMinor: 0, refundedMinor: 0 });
  });

  it("once a flagged payment is refunded in full, the page says the deposit is due and Pay deposit works", async () => {
    const { f, token, quoteId, quote, client } = await acceptedQuote();
    const url = await startCheckout(token);
    await fakeStripe(t.app).pay(sessionIdOf(url), CARDS.success, { amountTotal: quote.depositMinor + 500 });
    const [flagged] = await eventually(async () => {
      const found = await paymentsOf(quoteId);
      return found.length > 0 ? found : undefined;
    });
    expect((await f.owner.api.post(`/api/payments/${flagged.id}/refunds`, {})).status).toBe(201);
    const view = await client.get(`/api/quote-links/${token}`);
    expect(view.body.deposit).toMatchObject({ state: "due", online: true });
    // The page offers "Pay deposit"; pressing it must not answer "being checked".
    const pay = await client.post(`/api/quote-links/${token}/deposit`);
    expect(pay.status, JSON.stringify(pay.body)).toBe(200);
    // And the dashboard lists it as outstanding again.
    const dash = await f.owner.api.get("/api/dashboard");
    expect(dash.body.deposits.outstanding.count).toBe(1);
  });

  it("records a refund as Stripe has it now, whatever order its events come in and whatever a stale copy says", async () => {
    const f = await companyFixture(t.db, t.app);
    const { payment, intent } = await paidDeposit(f);
    const fake = fakeStripe(t.app);
    await fake.hold();
    try {
      const refund = await fake.sdk.refunds.create({ payment_intent: intent });
      const created = (await fake.events("refund.created")).find((e) => (e.event.data.object as Stripe.Refund).id === refund.id)!;
      const chargeRefunded = (await fake.events("charge.refunded")).find((e) => JSON.stringify(e.event.data.object).includes(refund.id))!;
      // Its events in reverse order, then a validly signed event whose copy of the refund is wrong
      // (says failed) arriving last: the app records what Stripe says now, not the event's copy.
      expect((await fake.deliver(chargeRefunded.id))[0].status).toBe(200);
      expect((await fake.deliver(created.id))[0].status).toBe(200);
      const stale = eventOf("refund.updated", { ...refund, status: "failed", failure_reason: "expired_or_canceled_card" }, created.created + 60);
      expect((await postSigned(stale)).status).toBe(200);
      const row = await t.db.manager.findOneByOrFail(PaymentRefund, { stripeRefundId: refund.id });
      const after = await t.db.manager.findOneByOrFail(Payment, { id: payment.id });
      expect({ refundStatus: row.status, refundedMinor: after.refundedMinor, status: after.status }).toEqual({ refundStatus: "succeeded", refundedMinor: payment.amountMinor, status: "refunded" });
      expect(await t.db.manager.countBy(PaymentRefund, { stripeRefundId: refund.id })).toBe(1);
    } finally {
      await fake.deliverImmediately();
    }
  });

  it("validly signed events of odd shapes answer 2xx/4xx, never 500, and record no payment", async () => {
    const { quote, token } = await acceptedQuote();
    await startCheckout(token);
    const cases: Array<[string, unknown]> = [
      ["JSON null", "null"],
      ["empty object", {}],
      ["no id", { type: "checkout.session.completed", data: { object: {} } }],
      ["no data", { id: `evt_probe_nodata_${randomUUID()}`, type: "checkout.session.completed", created: 1 }],
      ["data.object null (completed)", eventOf("checkout.session.completed", null)],
      ["data.object null (refund.created)", eventOf("refund.created", null)],
      ["data.object null (charge.refunded)", eventOf("charge.refunded", null)],
      ["data.object null (expired)", eventOf("checkout.session.expired", null)],
      ["expired without a session id", eventOf("checkout.session.expired", { object: "checkout.session", status: "expired" })],
      ["refund without an id", eventOf("refund.created", { object: "refund", amount: 100, payment_intent: "pi_probe_noid", status: "succeeded" })],
    ];
    const results: Record<string, number> = {};
    for (const [name, body] of cases) results[name] = (await postSigned(body)).status;
    const fiveHundreds = Object.entries(results).filter(([, status]) => status >= 500);
    // What must hold either way: nothing recorded, and no other checkout touched (TypeORM refuses an undefined WHERE value).
    expect(await paymentsOf(quote.id)).toEqual([]);
    expect((await t.db.manager.findOneByOrFail(DepositCheckout, { quoteId: quote.id })).status).toBe("open");
    expect(fiveHundreds, JSON.stringify(results)).toEqual([]);
  });


  it("a verified payment whose payer name holds a NUL character is still recorded (not 400 forever)", async () => {
    const { token, quote } = await acceptedQuote();
    const url = await startCheckout(token);
    const answer = await postSigned(eventOf("checkout.session.completed", sessionObject(sessionIdOf(url), quote, { customer_details: { email: "p@example.test", name: "Tam\u0000sin" } })));
    expect({ status: answer.status, body: answer.body }).toMatchObject({ status: 200 });
    expect(await paymentsOf(quote.id)).toHaveLength(1);
  });

  it("a refund Stripe refuses because the charge was already refunded elsewhere is a 409 conflict, not 502 'could not reach'", async () => {
    const f = await companyFixture(t.db, t.app);
    const { payment, intent } = await paidDeposit(f);
    const fake = fakeStripe(t.app);
    await fake.hold();
    try {
      await fake.sdk.refunds.create({ payment_intent: intent }); // from Stripe's dashboard; its webhook not here yet
      const answer = await f.owner.api.post(`/api/payments/${payment.id}/refunds`, {});
      expect(await t.db.manager.countBy(PaymentRefund, { stripePaymentIntentId: intent })).toBe(0);
      expect({ status: answer.status, code: answer.body.error?.code }).toEqual({ status: 409, code: "conflict" });
    } finally {
      await fake.deliverImmediately();
    }
  });

  // ------------------------------------------------------------------ behaviour that holds

  it("two full refunds pressed at once: one is made, the other is 409; refunded never exceeds paid", async () => {
    const f = await companyFixture(t.db, t.app);
    const { payment, intent } = await paidDeposit(f);
    const fake = fakeStripe(t.app);
    await fake.hold(); // webhooks out of the way: this probes the row lock alone
    try {
      const answers = await Promise.all([f.owner.api.post(`/api/payments/${payment.id}/refunds`, {}), f.owner.api.post(`/api/payments/${payment.id}/refunds`, {})]);
      expect(answers.map((a) => a.status).sort()).toEqual([201, 409]);
      const row = await t.db.manager.findOneByOrFail(Payment, { id: payment.id });
      expect(row).toMatchObject({ status: "refunded", refundedMinor: payment.amountMinor });
      const atStripe = (await fake.events("refund.created")).filter((e) => (e.event.data.object as Stripe.Refund).payment_intent === intent);
      expect(atStripe).toHaveLength(1);
    } finally {
      await fake.deliverImmediately();
    }
  });

  it("refund input: strings, negatives, zero, floats, too large, unknown fields and reasons are 400; other roles 403; other company 404", async () => {
    const f = await companyFixture(t.db, t.app);
    const { payment } = await paidDeposit(f);
    const bad = [{ amountMinor: "500" }, { amountMinor: -1 }, { amountMinor: 0 }, { amountMinor: 1.5 }, { amountMinor: 1e16 }, { amountMinor: payment.amountMinor + 1 }, { amount: 5 }, { reason: "changed_mind" }, [], "x"];
    for (const body of bad) {
      const answer = await f.owner.api.post(`/api/payments/${payment.id}/refunds`, body);
      expect(answer.status, JSON.stringify(body)).toBe(400);
    }
    expect((await f.installer.api.post(`/api/payments/${payment.id}/refunds`, {})).status).toBe(403);
    expect((await f.estimator.api.post(`/api/payments/${payment.id}/refunds`, {})).status).toBe(403);
    expect((await f.owner.api.post(`/api/payments/not-a-uuid/refunds`, {})).status).toBe(404);
    const other = await companyFixture(t.db, t.app);
    expect((await other.owner.api.post(`/api/payments/${payment.id}/refunds`, {})).status).toBe(404);
    expect((await other.owner.api.get(`/api/payments/${payment.id}/receipt.pdf`)).status).toBe(404);
    expect((await other.owner.api.get(`/api/jobs/${f.work.jobId}/payments`)).status).toBe(404);
    expect((await other.owner.api.get("/api/dashboard")).body.deposits.receivedThisMonth.count).toBe(0);
    expect(await t.db.manager.countBy(PaymentRefund, { paymentId: payment.id })).toBe(0);
    expect((await t.db.manager.findOneByOrFail(Payment, { id: payment.id })).refundedMinor).toBe(0);
  });

  it("checkout.session.completed 'unpaid' records nothing; a later paid event records one payment; two more paid events for the session (at once) add none", async () => {
    const { token, quote, clientEmail } = await acceptedQuote();
    const url = await startCheckout(token);
    const sessionId = sessionIdOf(url);
    const base = sessionObject(sessionId, quote);
    const unpaid = await postSigned(eventOf("checkout.session.completed", { ...base, payment_status: "unpaid" }));
    expect(unpaid).toMatchObject({ status: 200, body: { outcome: "ignored: not paid yet" } });
    expect(await paymentsOf(quote.id)).toEqual([]);
    const paid = await postSigned(eventOf("checkout.session.async_payment_succeeded", base));
    expect(paid).toMatchObject({ status: 200, body: { outcome: "payment recorded" } });
    const again = await Promise.all([postSigned(eventOf("checkout.session.completed", base)), postSigned(eventOf("checkout.session.async_payment_succeeded", base))]);
    expect(again.map((a) => a.status)).toEqual([200, 200]);
    expect(again.map((a) => a.body.outcome)).toEqual(["ignored: payment already recorded", "ignored: payment already recorded"]);
    const rows = await paymentsOf(quote.id);
    expect(rows).toHaveLength(1);
    expect(rows[0]).toMatchObject({ status: "paid", amountMinor: quote.depositMinor });
    await eventually(async () => ((await mailsTo(clientEmail)).some((m) => m.subject.startsWith("Receipt")) ? true : undefined), 10_000, "the receipt");
    await new Promise((resolve) => setTimeout(resolve, 300));
    expect((await mailsTo(clientEmail)).filter((m) => m.subject.startsWith("Receipt"))).toHaveLength(1);
  });

  it("amount_total null: flagged as 'check this payment', never the deposit, no public receipt", async () => {
    const a = await acceptedQuote();
    const urlA = await startCheckout(a.token);
    expect((await postSigned(eventOf("checkout.session.completed", sessionObject(sessionIdOf(urlA), a.quote, { amount_total: null })))).status).toBe(200);
    const [pa] = await paymentsOf(a.quoteId);
    expect(pa).toMatchObject({ status: "mismatch", amountMinor: 0 });
    expect((await t.db.manager.findOneByOrFail(Quote, { id: a.quoteId })).status).toBe("accepted");

    expect((await a.client.get(`/api/quote-links/${a.token}`)).body.deposit.state).toBe("review");
    expect((await a.client.get(`/api/quote-links/${a.token}/receipt.pdf`)).status).toBe(404);
    expect((await a.f.owner.api.get(`/api/payments/${pa.id}/receipt.pdf`)).status).toBe(200);
  });

  it("a paid session without a currency is flagged, answered 200, the estimator told, and its staff receipt renders", async () => {
    const b = await acceptedQuote();
    const urlB = await startCheckout(b.token);
    const { currency: _dropped, ...noCurrency } = sessionObject(sessionIdOf(urlB), b.quote);
    const answer = await postSigned(eventOf("checkout.session.completed", noCurrency));
    // Recorded (committed) before the failure:
    const [pb] = await paymentsOf(b.quoteId);
    expect(pb).toMatchObject({ status: "mismatch", currency: "XXX" });
    expect(pb.mismatchReason).toContain("unknown currency");
    expect((await b.client.get(`/api/quote-links/${b.token}`)).body.deposit.state).toBe("review");
    const receipt = await b.f.owner.api.get(`/api/payments/${pb.id}/receipt.pdf`);
    const notice = await eventually(async () => ((await mailsTo(b.f.owner.email)).some((m) => m.subject.startsWith("Check a payment")) ? true : undefined), 3000).catch(() => false);
    expect({ webhook: answer.status, staffReceipt: receipt.status, estimatorTold: notice }).toEqual({ webhook: 200, staffReceipt: 200, estimatorTold: true });
  });

  it("a session known to company A whose metadata names company B's quote is recorded on A's quote only", async () => {
    const a = await acceptedQuote();
    const b = await acceptedQuote();
    const urlA = await startCheckout(a.token);
    const answer = await postSigned(eventOf("checkout.session.completed", sessionObject(sessionIdOf(urlA), a.quote, { metadata: { quoteId: b.quoteId } })));
    expect(answer.status).toBe(200);
    expect(await paymentsOf(a.quoteId)).toHaveLength(1);
    expect(await paymentsOf(b.quoteId)).toEqual([]);
    expect((await t.db.manager.findOneByOrFail(Quote, { id: b.quoteId })).status).toBe("accepted");
    expect((await b.f.owner.api.get(`/api/jobs/${b.f.work.jobId}/payments`)).body.items).toEqual([]);
  });

  it("a refund event naming a refund Stripe does not know is acknowledged and records nothing", async () => {
    const intent = `pi_unknown_${randomUUID().replace(/-/g, "")}`;
    const refundId = `re_probe_${randomUUID().replace(/-/g, "")}`;
    const answer = await postSigned(eventOf("refund.created", { id: refundId, object: "refund", amount: 500, currency: "usd", payment_intent: intent, status: "succeeded", reason: null }));
    expect(answer).toMatchObject({ status: 200, body: { outcome: "ignored: Stripe does not know this refund" } });
    expect(await t.db.manager.countBy(PaymentRefund, { stripeRefundId: refundId })).toBe(0);
    expect(await t.db.manager.countBy(Payment, { stripePaymentIntentId: intent })).toBe(0);
  });

  it("webhook transport: text/plain 400, over 1 MB 413, unsigned 400, a signed event near 1 MB is stored; nothing leaks the secret", async () => {
    const plain = await postSigned(eventOf("ping", {}), "text/plain");
    expect(plain.status).toBe(400);
    const big = eventOf("customer.updated", { id: "cus_probe", object: "customer", metadata: { blob: "x".repeat(1_100_000) } });
    expect((await postSigned(big)).status).toBe(413);
    const nearly = eventOf("customer.updated", { id: "cus_probe", object: "customer", metadata: { blob: "x".repeat(1024 * 1024 - 600) } });
    expect(JSON.stringify(nearly).length).toBeLessThanOrEqual(1024 * 1024);
    expect(JSON.stringify(nearly).length).toBeGreaterThan(1024 * 1024 - 700);
    const stored = await postSigned(nearly);
    expect(stored).toMatchObject({ status: 200, body: { outcome: "ignored: not used" } });
    expect(await t.db.manager.countBy(StripeEvent, { id: nearly.id })).toBe(1);
    const unsigned = await fetch(`${t.app.url}/api/webhooks/stripe`, { method: "POST", headers: { "Content-Type": "application/json" }, body: JSON.stringify(eventOf("ping", {})) });
    expect(unsigned.status).toBe(400);
    const text = await unsigned.text();
    expect(text).not.toContain(t.app.stripe!.webhookSecret);
    expect(text).not.toContain(t.app.stripe!.secretKey);
  });

  it("Pay deposit: not yet accepted 409, declined 409, superseded 410, deposit 0 → 409 and state none, forged tokens 404", async () => {
    // Sent but not accepted.
    const f1 = await companyFixture(t.db, t.app);
    const sent = await f1.quotes();
    const client = new ApiClient(t.app.app);
    expect((await client.post(`/api/quote-links/${sent.token}/deposit`)).status).toBe(409);
    // A later revision sent: the first link is superseded.
    const r2 = await f1.owner.api.post(`/api/jobs/${f1.work.jobId}/quotes`, {});
    expect(r2.status, JSON.stringify(r2.body)).toBe(201);
    expect((await f1.owner.api.post(`/api/quotes/${r2.body.id}/send`, { to: sent.clientEmail })).status).toBe(200);
    expect((await client.post(`/api/quote-links/${sent.token}/deposit`)).status).toBe(410);

    // Declined.
    const f2 = await companyFixture(t.db, t.app);
    const declinedQ = await f2.quotes();
    expect((await client.post(`/api/quote-links/${declinedQ.token}/decline`, { reason: "too dear" })).status).toBe(200);
    expect((await client.post(`/api/quote-links/${declinedQ.token}/deposit`)).status).toBe(409);

    // Deposit 0.
    const zero = await acceptedQuote();
    await t.db.manager.update(Quote, { id: zero.quoteId }, { depositMinor: 0 });
    expect((await client.post(`/api/quote-links/${zero.token}/deposit`)).status).toBe(409);
    expect((await client.get(`/api/quote-links/${zero.token}`)).body.deposit.state).toBe("none");
    expect(await t.db.manager.countBy(DepositCheckout, { quoteId: zero.quoteId })).toBe(0);

    // Forged tokens: the right link id with another secret, junk, an over-long token.
    const [linkId] = zero.token.split(".");
    for (const forged of [`${linkId}.AAAAAAAAAAAAAAAAAAAAAAAAAAAAAAAAAAAAAAAAAAA`, "nonsense", `${randomUUID()}.x`, "a".repeat(300)]) {
      for (const path of [`/api/quote-links/${forged}`, `/api/quote-links/${forged}/receipt.pdf`]) {
        expect((await client.get(path)).status, path).toBe(404);
      }
      expect((await client.post(`/api/quote-links/${forged}/deposit`)).status).toBe(404);
    }
    // No receipt before any payment.
    expect((await client.get(`/api/quote-links/${zero.token}/receipt.pdf`)).status).toBe(404);
  });

  it("the client's page shows the deposit without staff-only payment details", async () => {
    const f = await companyFixture(t.db, t.app);
    const { token, payment } = await paidDeposit(f);
    const view = await new ApiClient(t.app.app).get(`/api/quote-links/${token}`);
    expect(view.status).toBe(200);
    expect(Object.keys(view.body.deposit).sort()).toEqual(["currency", "dueMinor", "online", "paidAt", "paidMinor", "receiptNumber", "state"]);
    for (const secret of [payment.stripePaymentIntentId!, payment.stripeCheckoutSessionId, payment.id, payment.payerEmail ?? "@@none@@"]) {
      expect(view.text).not.toContain(secret);
    }
  });
});

describe("deposits: what reaches the log", () => {
  const lines: string[] = [];
  const logger = pino({ level: "debug" }, { write: (line: string) => void lines.push(line) });
  const t = useTestApp({ logger });

  it("no client token, Stripe key, webhook secret or signature in the log of a whole deposit (pay, webhook, receipt, return page, refund)", async () => {
    const f = await companyFixture(t.db, t.app);
    const { token, paymentId } = await f.paid();
    const client = new ApiClient(t.app.app);
    expect((await client.get(`/api/quote-links/${token}`)).status).toBe(200);
    expect((await client.get(`/api/quote-links/${token}/receipt.pdf`)).status).toBe(200);
    await fetch(`${t.app.url}/q/${token}?deposit=returned&session_id=cs_test_x`);
    expect((await f.owner.api.post(`/api/payments/${paymentId}/refunds`, { amountMinor: 100 })).status).toBe(201);
    // A bad signature is logged as a 400 too.
    await fetch(`${t.app.url}/api/webhooks/stripe`, { method: "POST", headers: { "Content-Type": "application/json", "Stripe-Signature": "t=1,v1=deadbeef" }, body: "{}" });
    await new Promise((resolve) => setTimeout(resolve, 500));
    const log = lines.join("");
    expect(log).toContain("stripe event");
    const secret = token.slice(token.indexOf(".") + 1);
    for (const [what, value] of [["token", secret], ["secret key", t.app.stripe!.secretKey], ["webhook secret", t.app.stripe!.webhookSecret]] as const) {
      expect(log.includes(value), `${what} in the log`).toBe(false);
    }
    expect(log).not.toMatch(/v1=[0-9a-f]{64}/);
  });

  it("a Stripe that cannot be reached: 502 and the warning carries no secret key", async () => {
    const { createPayments } = await import("../../../server/payments/stripe-client.js");
    const { findFreePort } = await import("../../../server/scripts/port-check.js");
    const { startTestApp } = await import("../../support/app.js");
    const key = `sk_test_probe_${randomUUID().replace(/-/g, "")}`;
    const own: string[] = [];
    const app = await startTestApp(t.db, { logger: pino({ level: "debug" }, { write: (line: string) => void own.push(line) }), payments: createPayments({ secretKey: key, webhookSecret: "whsec_probe_secret_value", apiBase: `http://127.0.0.1:${await findFreePort()}` }) });
    try {
      const f = await companyFixture(t.db, app);
      const q = await f.accepted();
      const answer = await new ApiClient(app.app).post(`/api/quote-links/${q.token}/deposit`);
      expect(answer.status).toBe(502);
      const log = own.join("");
      expect(log).toContain("Stripe: creating a checkout session failed");
      expect(log.includes(key)).toBe(false);
      expect(log.includes(key.slice(-12))).toBe(false);
      expect(log.includes(q.token.slice(q.token.indexOf(".") + 1))).toBe(false);
    } finally {
      await app.close();
    }
  });
});
