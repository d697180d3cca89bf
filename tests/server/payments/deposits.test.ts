// Deposits through Stripe Checkout, against the project's Stripe fake (server/fakes/stripe): the
// app's own code runs unchanged — the SDK over HTTP to the fake, the fake's hosted page, webhooks
// signed with the SDK's scheme and verified by the app. Nothing we own is mocked.
import Stripe from "stripe";
import { describe, expect, it } from "vitest";
import { inject } from "vitest";
import { formatMoney } from "../../../shared/money.js";
import { DepositCheckout, Payment, PaymentRefund, Quote, StripeEvent } from "../../../server/db/entities/index.js";
import { useTestApp } from "../../support/app.js";
import { ApiClient } from "../../support/api.js";
import { companyFixture, type CompanyFixture } from "../../support/fixtures.js";
import { mailsTo, waitForMail } from "../../support/mail.js";
import { CARDS, eventually, fakeStripe, payOnPage, pdfText, sessionIdOf } from "../../support/stripe.js";

describe("deposits through Stripe Checkout", () => {
  const t = useTestApp();

  /** A company whose quote was sent and accepted by the client. */
  async function acceptedQuote(): Promise<{ f: CompanyFixture; token: string; quoteId: string; clientEmail: string; quote: Quote; client: ApiClient }> {
    const f = await companyFixture(t.db, t.app);
    const q = await f.accepted();
    const quote = await t.db.manager.findOneByOrFail(Quote, { id: q.quoteId });
    expect(quote.status).toBe("accepted");
    expect(quote.depositMinor).toBeGreaterThan(0);
    return { f, token: q.token, quoteId: q.quoteId, clientEmail: q.clientEmail, quote, client: new ApiClient(t.app.app) };
  }

  async function startCheckout(client: ApiClient, token: string): Promise<string> {
    const answer = await client.post(`/api/quote-links/${token}/deposit`);
    expect(answer.status, JSON.stringify(answer.body)).toBe(200);
    return answer.body.url as string;
  }

  const paymentsOf = (quoteId: string) => t.db.manager.findBy(Payment, { quoteId });

  it("takes the deposit: checkout session, the fake's page with the success card, a signed webhook, receipt e-mail", async () => {
    const { f, token, quoteId, clientEmail, quote, client } = await acceptedQuote();
    const before = await client.get(`/api/quote-links/${token}`);
    expect(before.body.deposit).toMatchObject({ state: "due", dueMinor: quote.depositMinor, currency: quote.currency, online: true, paidMinor: null });

    const url = await startCheckout(client, token);
    expect(url.startsWith(`${t.app.stripe!.apiBase}/pay/cs_test_`)).toBe(true);
    const session = await fakeStripe(t.app).sdk.checkout.sessions.retrieve(sessionIdOf(url));
    // What the app asked Stripe for: the deposit in minor units, the company's currency, the quote.
    expect(session.amount_total).toBe(quote.depositMinor);
    expect(session.currency).toBe(quote.currency.toLowerCase());
    expect(session.mode).toBe("payment");
    expect(session.client_reference_id).toBe(`${quoteId}:${quote.revision}`);
    expect(session.metadata).toMatchObject({ quoteId, quoteNumber: quote.number, revision: String(quote.revision) });
    expect(session.success_url).toBe(`${t.app.url}/q/${token}?deposit=returned&session_id={CHECKOUT_SESSION_ID}`);
    expect(session.cancel_url).toBe(`${t.app.url}/q/${token}?deposit=canceled`);

    const paid = await payOnPage(url, CARDS.success);
    expect(paid.status).toBe(303);
    expect(paid.location).toBe(`${t.app.url}/q/${token}?deposit=returned&session_id=${session.id}`);

    const after = await eventually(async () => {
      const view = await client.get(`/api/quote-links/${token}`);
      return view.body.deposit.state === "paid" ? view.body : undefined;
    }, 10_000, "the deposit to show as paid");
    expect(after.status).toBe("deposit paid");
    expect(after.deposit.paidMinor).toBe(quote.depositMinor);

    const [payment] = await paymentsOf(quoteId);
    expect(payment).toMatchObject({ status: "paid", amountMinor: quote.depositMinor, currency: quote.currency, expectedAmountMinor: quote.depositMinor, refundedMinor: 0, stripeCheckoutSessionId: session.id, mismatchReason: null });
    expect(payment.stripePaymentIntentId).toMatch(/^pi_/);
    expect(payment.receiptNumber).toBe(`${quote.number}-R${quote.revision}-D1`);
    const completed = (await fakeStripe(t.app).events("checkout.session.completed")).filter((e) => (e.event.data.object as Stripe.Checkout.Session).id === session.id);
    expect(completed).toHaveLength(1);
    expect(await t.db.manager.findOneByOrFail(StripeEvent, { id: completed[0].id })).toMatchObject({ type: "checkout.session.completed", outcome: "payment recorded" });
    expect((await t.db.manager.findOneByOrFail(DepositCheckout, { stripeSessionId: session.id })).status).toBe("complete");

    // The receipt: e-mail to the client with the PDF; a notice to the estimator who sent the quote.
    const mailed = await eventually(async () => {
      const row = await t.db.manager.findOneByOrFail(Payment, { id: payment.id });
      return row.receiptSentAt || row.receiptError ? row : undefined;
    }, 10_000, "the receipt to be sent");
    expect(mailed.receiptError).toBeNull();
    const receipt = await waitForMail(clientEmail, 2);
    const amount = formatMoney(quote.depositMinor, quote.currency);
    expect(receipt.subject).toContain(`Receipt ${payment.receiptNumber}`);
    expect(receipt.text).toContain(amount);
    expect(receipt.text).toContain(quote.number);
    const full = await fetch(`http://127.0.0.1:${inject("mailCatcher").webPort}/api/email/${receipt.id}`).then((r) => r.json());
    expect(full.attachments.map((a: { contentType: string }) => a.contentType)).toEqual(["application/pdf"]);
    const pdf = Buffer.from(await (await fetch(`${t.app.url}/api/quote-links/${token}/receipt.pdf`)).arrayBuffer());
    const text = pdfText(pdf);
    expect(text).toContain(payment.receiptNumber);
    expect(text).toContain(amount);
    expect(text).toContain(`${quote.number} R${quote.revision}`);
    expect(text).toContain(quote.snapshot.company.name);
    const notice = await eventually(async () => (await mailsTo(f.owner.email)).find((m) => m.subject.startsWith("Deposit paid")), 10_000, "the estimator's notice");
    expect(notice.text).toContain(amount);

    // Staff screens: the quote, the job, the dashboard.
    const detail = await f.owner.api.get(`/api/quotes/${quoteId}`);
    expect(detail.body.status).toBe("deposit paid");
    expect(detail.body.payments).toHaveLength(1);
    expect(detail.body.events.map((e: { type: string }) => e.type)).toContain("deposit_paid");
    const job = await f.installer.api.get(`/api/jobs/${f.work.jobId}/payments`);
    expect(job.status).toBe(200);
    expect(job.body.items.map((p: { id: string }) => p.id)).toEqual([payment.id]);
    const dash = await f.owner.api.get("/api/dashboard");
    expect(dash.body.deposits.receivedThisMonth).toEqual({ count: 1, amountMinor: quote.depositMinor, refundedMinor: 0 });
    expect(dash.body.deposits.outstanding).toEqual({ count: 0, amountMinor: 0 });
    expect(dash.body.deposits.flagged).toEqual([]);

    // Paid: "Pay deposit" now says so instead of opening another session.
    const again = await client.post(`/api/quote-links/${token}/deposit`);
    expect(again.status).toBe(409);
    expect(await fakeStripe(t.app).sessions()).toHaveLength(1);
  });

  it("records nothing for a declined card or a card that needs a retry, and takes the payment when the client tries again", async () => {
    const { token, quoteId, client } = await acceptedQuote();
    const url = await startCheckout(client, token);
    const declined = await payOnPage(url, CARDS.declined);
    expect(declined.status).toBe(402);
    expect(declined.html).toContain("declined");
    const retry = await payOnPage(url, CARDS.retry);
    expect(retry.status).toBe(402);
    expect(retry.html).toContain("try again");
    // Give a (wrong) webhook time to arrive: none must, and nothing is recorded.
    await new Promise((resolve) => setTimeout(resolve, 600));
    expect((await fakeStripe(t.app).events()).filter((e) => JSON.stringify(e.event).includes(sessionIdOf(url)))).toEqual([]);
    expect(await paymentsOf(quoteId)).toEqual([]);
    expect((await client.get(`/api/quote-links/${token}`)).body.deposit.state).toBe("due");
    // The same session is still open: pressing "Pay deposit" again returns it.
    expect(await startCheckout(client, token)).toBe(url);
    expect((await payOnPage(url, CARDS.success)).status).toBe(303);
    await eventually(async () => ((await paymentsOf(quoteId)).length === 1 ? true : undefined));
  });

  it("refuses a forged, missing or stale signature with 400 and records nothing", async () => {
    const { token, quoteId, quote, client } = await acceptedQuote();
    const url = await startCheckout(client, token);
    const sessionId = sessionIdOf(url);
    const event = {
      id: `evt_forged_${Date.now()}`,
      object: "event",
      type: "checkout.session.completed",
      created: Math.floor(Date.now() / 1000),
      data: { object: { id: sessionId, object: "checkout.session", mode: "payment", status: "complete", payment_status: "paid", amount_total: quote.depositMinor, currency: quote.currency.toLowerCase(), payment_intent: "pi_forged", metadata: { quoteId } } },
    };
    const payload = JSON.stringify(event);
    const stripe = fakeStripe(t.app).sdk;
    const post = (body: string, signature?: string) =>
      fetch(`${t.app.url}/api/webhooks/stripe`, { method: "POST", headers: { "Content-Type": "application/json", ...(signature ? { "Stripe-Signature": signature } : {}) }, body });
    const attempts = [
      post(payload, stripe.webhooks.generateTestHeaderString({ payload, secret: "whsec_not_the_apps_secret" })),
      post(payload),
      // Signed right, then changed: the amount raised after signing.
      post(payload.replace(String(quote.depositMinor), "1"), stripe.webhooks.generateTestHeaderString({ payload, secret: t.app.stripe!.webhookSecret })),
      // Signed right, but an hour old: a replay.
      post(payload, stripe.webhooks.generateTestHeaderString({ payload, secret: t.app.stripe!.webhookSecret, timestamp: Math.floor(Date.now() / 1000) - 3600 })),
    ];
    for (const response of await Promise.all(attempts)) {
      expect(response.status).toBe(400);
      const body = await response.json();
      expect(body.error.code).toBe("invalid_input");
      expect(body.error.message).toMatch(/Stripe-Signature/);
    }
    expect(await t.db.manager.countBy(StripeEvent, { id: event.id })).toBe(0);
    expect(await paymentsOf(quoteId)).toEqual([]);
    expect((await t.db.manager.findOneByOrFail(Quote, { id: quoteId })).status).toBe("accepted");
  });

  it("records one payment when the same event is delivered twice, one after the other and at the same time", async () => {
    const { token, quoteId, clientEmail, client } = await acceptedQuote();
    const fake = fakeStripe(t.app);
    await fake.hold();
    try {
      const url = await startCheckout(client, token);
      expect((await fake.pay(sessionIdOf(url), CARDS.success)).outcome).toBe("succeeded");
      const completed = (await fake.events("checkout.session.completed")).find((e) => (e.event.data.object as Stripe.Checkout.Session).id === sessionIdOf(url))!;
      const [first] = await fake.deliver(completed.id);
      expect(first.status).toBe(200);
      expect(JSON.parse(first.body)).toMatchObject({ received: true, duplicate: false, outcome: "payment recorded" });
      const [second] = await fake.deliver(completed.id);
      expect(second.status).toBe(200);
      expect(JSON.parse(second.body)).toMatchObject({ received: true, duplicate: true });
      expect(await paymentsOf(quoteId)).toHaveLength(1);

      // A second company: the same event twice at once.
      const other = await acceptedQuote();
      const otherUrl = await startCheckout(other.client, other.token);
      await fake.pay(sessionIdOf(otherUrl), CARDS.success);
      const otherEvent = (await fake.events("checkout.session.completed")).find((e) => (e.event.data.object as Stripe.Checkout.Session).id === sessionIdOf(otherUrl))!;
      const both = await Promise.all([fake.deliver(otherEvent.id), fake.deliver(otherEvent.id)]);
      expect(both.map(([r]) => r.status)).toEqual([200, 200]);
      expect(both.map(([r]) => JSON.parse(r.body).duplicate).sort()).toEqual([false, true]);
      expect(await paymentsOf(other.quoteId)).toHaveLength(1);
    } finally {
      await fake.deliverImmediately();
    }
    // One receipt for the first quote (the quote e-mail plus one receipt).
    await waitForMail(clientEmail, 2);
    await new Promise((resolve) => setTimeout(resolve, 300));
    expect((await mailsTo(clientEmail)).filter((m) => m.subject.startsWith("Receipt"))).toHaveLength(1);
  });

  it("ends in the right state when events come out of order or late", async () => {
    const fake = fakeStripe(t.app);
    await fake.hold();
    try {
      // 1. Refunded (say, from Stripe's dashboard) before the app heard of the payment at all.
      const a = await acceptedQuote();
      const urlA = await startCheckout(a.client, a.token);
      const paidA = await fake.pay(sessionIdOf(urlA), CARDS.success);
      const intent = paidA.session.payment_intent as string;
      const refund = await fake.sdk.refunds.create({ payment_intent: intent });
      const events = await fake.events();
      const byType = (type: string, id: string) => events.find((e) => e.type === type && JSON.stringify(e.event.data.object).includes(id))!;
      const order = [byType("charge.refunded", intent), byType("refund.created", refund.id), byType("checkout.session.completed", sessionIdOf(urlA))];
      for (const e of order) expect((await fake.deliver(e.id))[0].status).toBe(200);
      const [payment] = await paymentsOf(a.quoteId);
      expect(payment).toMatchObject({ status: "refunded", refundedMinor: a.quote.depositMinor, amountMinor: a.quote.depositMinor });
      expect(await t.db.manager.countBy(PaymentRefund, { paymentId: payment.id })).toBe(1);
      expect((await a.client.get(`/api/quote-links/${a.token}`)).body.deposit.state).toBe("refunded");

      // 2. A session that expired, a second session paid, and the first one's expiry arriving late.
      const b = await acceptedQuote();
      const urlB1 = await startCheckout(b.client, b.token);
      await fake.sdk.checkout.sessions.expire(sessionIdOf(urlB1));
      const urlB2 = await startCheckout(b.client, b.token);
      expect(urlB2).not.toBe(urlB1);
      expect(await t.db.manager.findBy(DepositCheckout, { quoteId: b.quoteId })).toHaveLength(2);
      await fake.pay(sessionIdOf(urlB2), CARDS.success);
      const later = await fake.events();
      const completedB2 = later.find((e) => e.type === "checkout.session.completed" && (e.event.data.object as Stripe.Checkout.Session).id === sessionIdOf(urlB2))!;
      const expiredB1 = later.find((e) => e.type === "checkout.session.expired" && (e.event.data.object as Stripe.Checkout.Session).id === sessionIdOf(urlB1))!;
      expect((await fake.deliver(completedB2.id))[0].status).toBe(200);
      expect((await fake.deliver(expiredB1.id))[0].status).toBe(200);
      expect((await fake.deliver(completedB2.id))[0].status).toBe(200);
      expect((await t.db.manager.findOneByOrFail(Quote, { id: b.quoteId })).status).toBe("deposit paid");
      expect(await paymentsOf(b.quoteId)).toHaveLength(1);
      expect((await t.db.manager.findOneByOrFail(DepositCheckout, { stripeSessionId: sessionIdOf(urlB2) })).status).toBe("complete");
    } finally {
      await fake.deliverImmediately();
    }
  });

  it("flags a payment whose amount does not match the deposit, and does not count it", async () => {
    const { f, token, quoteId, quote, clientEmail, client } = await acceptedQuote();
    const url = await startCheckout(client, token);
    const short = quote.depositMinor - 100;
    expect((await fakeStripe(t.app).pay(sessionIdOf(url), CARDS.success, { amountTotal: short })).outcome).toBe("succeeded");
    const [payment] = await eventually(async () => {
      const found = await paymentsOf(quoteId);
      return found.length > 0 ? found : undefined;
    });
    expect(payment.status).toBe("mismatch");
    expect(payment.amountMinor).toBe(short);
    expect(payment.mismatchReason).toContain(formatMoney(quote.depositMinor, quote.currency));
    expect((await t.db.manager.findOneByOrFail(Quote, { id: quoteId })).status).toBe("accepted");
    expect((await client.get(`/api/quote-links/${token}`)).body.deposit.state).toBe("review");
    const dash = await f.owner.api.get("/api/dashboard");
    expect(dash.body.deposits.flagged.map((p: { id: string }) => p.id)).toEqual([payment.id]);
    expect(dash.body.deposits.receivedThisMonth.count).toBe(0);
    expect(dash.body.deposits.outstanding.count).toBe(0);
    const notice = await eventually(async () => (await mailsTo(f.owner.email)).find((m) => m.subject.startsWith("Check a payment")), 10_000, "the flag e-mail");
    expect(notice.text).toContain(formatMoney(short, quote.currency));
    // No receipt claims a deposit that was not the deposit.
    expect((await mailsTo(clientEmail)).filter((m) => m.subject.startsWith("Receipt"))).toEqual([]);
    expect((await client.post(`/api/quote-links/${token}/deposit`)).status).toBe(409);
  });

  it("gives two concurrent Pay presses one checkout session", async () => {
    const { token, quoteId, client } = await acceptedQuote();
    const answers = await Promise.all(Array.from({ length: 4 }, () => client.post(`/api/quote-links/${token}/deposit`)));
    expect(answers.map((a) => a.status)).toEqual([200, 200, 200, 200]);
    expect(new Set(answers.map((a) => a.body.url)).size).toBe(1);
    expect((await fakeStripe(t.app).sessions()).filter((s) => s.metadata?.quoteId === quoteId)).toHaveLength(1);
    expect(await t.db.manager.countBy(DepositCheckout, { quoteId })).toBe(1);
  });

  it("lets the Owner refund through Stripe, once per press, recorded from the answer and its webhooks", async () => {
    const { f, token, quoteId, quote, client } = await acceptedQuote();
    const url = await startCheckout(client, token);
    expect((await payOnPage(url, CARDS.success)).status).toBe(303);
    const [payment] = await eventually(async () => {
      const found = await paymentsOf(quoteId);
      return found.length > 0 ? found : undefined;
    });

    const byEstimator = await f.estimator.api.post(`/api/payments/${payment.id}/refunds`, { amountMinor: 500 });
    expect(byEstimator.status).toBe(403);
    const tooMuch = await f.owner.api.post(`/api/payments/${payment.id}/refunds`, { amountMinor: quote.depositMinor + 1 });
    expect(tooMuch.status).toBe(400);
    expect(tooMuch.body.error.details.fields).toHaveProperty("amountMinor");
    const notMoney = await f.owner.api.post(`/api/payments/${payment.id}/refunds`, { amountMinor: 12.5, reason: "because" });
    expect(notMoney.status).toBe(400);
    expect(await t.db.manager.countBy(PaymentRefund, { paymentId: payment.id })).toBe(0);

    const part = await f.owner.api.post(`/api/payments/${payment.id}/refunds`, { amountMinor: 500, reason: "requested_by_customer" });
    expect(part.status, JSON.stringify(part.body)).toBe(201);
    expect(part.body).toMatchObject({ status: "partially refunded", refundedMinor: 500 });
    expect(part.body.refunds).toHaveLength(1);
    expect(part.body.refunds[0]).toMatchObject({ amountMinor: 500, reason: "requested_by_customer", createdBy: "Olive Owner" });
    // Its webhooks (refund.created, charge.refunded) arrive and find it recorded.
    await eventually(async () => {
      const events = await fakeStripe(t.app).events("charge.refunded");
      const mine = events.filter((e) => JSON.stringify(e.event.data.object).includes(payment.stripePaymentIntentId!));
      return mine.length === 1 && mine[0].attempts.some((a) => a.status === 200) ? true : undefined;
    }, 10_000, "the refund's webhook");
    expect(await t.db.manager.countBy(PaymentRefund, { paymentId: payment.id })).toBe(1);
    expect((await t.db.manager.findOneByOrFail(Payment, { id: payment.id })).refundedMinor).toBe(500);

    const rest = await f.owner.api.post(`/api/payments/${payment.id}/refunds`, {});
    expect(rest.status).toBe(201);
    expect(rest.body).toMatchObject({ status: "refunded", refundedMinor: quote.depositMinor });
    const nothingLeft = await f.owner.api.post(`/api/payments/${payment.id}/refunds`, {});
    expect(nothingLeft.status).toBe(409);
    const intent = await fakeStripe(t.app).sdk.paymentIntents.retrieve(payment.stripePaymentIntentId!);
    expect(intent.amount).toBe(quote.depositMinor);
    const dash = await f.owner.api.get("/api/dashboard");
    expect(dash.body.deposits.receivedThisMonth).toEqual({ count: 1, amountMinor: quote.depositMinor, refundedMinor: quote.depositMinor });
    const receipt = await f.installer.api.get(`/api/payments/${payment.id}/receipt.pdf`);
    expect(receipt.status).toBe(200);
    expect(receipt.headers["content-type"]).toBe("application/pdf");
  });
});

describe("deposits when Stripe is unreachable or not set up", () => {
  it("answers 502 when Stripe cannot be reached, and records no session", async () => {
    const { createPayments } = await import("../../../server/payments/stripe-client.js");
    const { findFreePort } = await import("../../../server/scripts/port-check.js");
    const { openTestDb } = await import("../../support/test-db.js");
    const { startTestApp } = await import("../../support/app.js");
    const db = await openTestDb();
    const closedPort = await findFreePort();
    const app = await startTestApp(db, { payments: createPayments({ secretKey: "sk_test_unreachable", webhookSecret: "whsec_unreachable", apiBase: `http://127.0.0.1:${closedPort}` }) });
    try {
      const f = await companyFixture(db, app);
      const q = await f.accepted();
      const answer = await new ApiClient(app.app).post(`/api/quote-links/${q.token}/deposit`);
      expect(answer.status).toBe(502);
      expect(answer.body.error.code).toBe("payment_failed");
      expect(answer.body.error.message).toMatch(/nothing was charged/);
      expect(await db.manager.countBy(DepositCheckout, { quoteId: q.quoteId })).toBe(0);
    } finally {
      await app.close();
      await db.destroy();
    }
  });

  it("says whom to contact when online payment is off, and has no webhook", async () => {
    const { openTestDb } = await import("../../support/test-db.js");
    const { startTestApp } = await import("../../support/app.js");
    const db = await openTestDb();
    const app = await startTestApp(db, { payments: null });
    try {
      const f = await companyFixture(db, app);
      const q = await f.accepted();
      const client = new ApiClient(app.app);
      expect((await client.get(`/api/quote-links/${q.token}`)).body.deposit).toMatchObject({ state: "due", online: false });
      const answer = await client.post(`/api/quote-links/${q.token}/deposit`);
      expect(answer.status).toBe(503);
      expect(answer.body.error.message).toMatch(/contact/);
      const hook = await fetch(`${app.url}/api/webhooks/stripe`, { method: "POST", headers: { "Content-Type": "application/json" }, body: "{}" });
      expect(hook.status).toBe(404);
    } finally {
      await app.close();
      await db.destroy();
    }
  });
});
