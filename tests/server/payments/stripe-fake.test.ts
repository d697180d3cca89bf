import { randomBytes } from "node:crypto";
import { createServer, type IncomingHttpHeaders, type Server } from "node:http";
import type { AddressInfo } from "node:net";
import Stripe from "stripe";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { startStripeFake, type StripeFake } from "../../../server/fakes/stripe/index.js";

// The Stripe stand-in, driven the way the app drives it: the official SDK for /v1, plain HTTP for the payment
// page and the /_fake control API, and a real HTTP receiver for webhooks checked with the SDK's constructEvent.

const SECRET = "whsec_test_runwright_fake";

let fake: StripeFake;
const receivers: Receiver[] = [];

beforeAll(async () => {
  fake = await startStripeFake({ retryDelaysMs: [50, 100] });
});

afterAll(async () => {
  await Promise.all(receivers.map((receiver) => receiver.close()));
  await fake?.stop();
});

function newKey(): string {
  return `sk_test_${randomBytes(12).toString("hex")}`;
}

function sdk(key: string): Stripe {
  return new Stripe(key, { host: "127.0.0.1", port: fake.port, protocol: "http", maxNetworkRetries: 0, telemetry: false });
}

interface Answer {
  status: number;
  headers: Headers;
  body: any;
  text: string;
}

async function call(key: string | undefined, method: string, path: string, body?: unknown): Promise<Answer> {
  const headers: Record<string, string> = {};
  if (key !== undefined) headers.Authorization = `Bearer ${key}`;
  if (body !== undefined) headers["Content-Type"] = "application/json";
  const res = await fetch(`${fake.url}${path}`, { method, headers, body: body === undefined ? undefined : JSON.stringify(body) });
  const text = await res.text();
  let parsed: unknown = undefined;
  try {
    parsed = JSON.parse(text);
  } catch {
    // HTML pages stay text.
  }
  return { status: res.status, headers: res.headers, body: parsed, text };
}

async function getPage(sessionId: string): Promise<Answer> {
  const res = await fetch(`${fake.url}/pay/${sessionId}`, { redirect: "manual" });
  return { status: res.status, headers: res.headers, body: undefined, text: await res.text() };
}

const GOOD_FORM = { email: "buyer@example.com", cardNumber: "4242 4242 4242 4242", expiry: "12 / 49", cvc: "123", name: "Dana Volt" };

async function submitPage(sessionId: string, fields: Record<string, string>): Promise<Answer> {
  const res = await fetch(`${fake.url}/pay/${sessionId}`, {
    method: "POST",
    redirect: "manual",
    headers: { "Content-Type": "application/x-www-form-urlencoded" },
    body: new URLSearchParams(fields).toString(),
  });
  return { status: res.status, headers: res.headers, body: undefined, text: await res.text() };
}

function sessionParams(overrides: Partial<Stripe.Checkout.SessionCreateParams> = {}): Stripe.Checkout.SessionCreateParams {
  return {
    mode: "payment",
    success_url: "http://127.0.0.1:9/quotes/q1/paid?session={CHECKOUT_SESSION_ID}",
    cancel_url: "http://127.0.0.1:9/quotes/q1?cancelled=1",
    line_items: [
      { price_data: { currency: "USD", unit_amount: 1250, product_data: { name: "Deposit — quote Q-1001" } }, quantity: 2 },
      { price_data: { currency: "usd", unit_amount: 499, product_data: { name: "Cable survey" } }, quantity: 1 },
    ],
    client_reference_id: "quote-q1",
    metadata: { quoteId: "q1", company: "c7" },
    customer_email: "buyer@example.com",
    payment_intent_data: { metadata: { quoteId: "q1" } },
    ...overrides,
  };
}

interface Delivery {
  body: string;
  headers: IncomingHttpHeaders;
  status: number;
}

interface Receiver {
  url: string;
  deliveries: Delivery[];
  /** Answer 500 to the next n deliveries. */
  failNext(n: number): void;
  waitFor(count: number, timeoutMs?: number): Promise<Delivery[]>;
  close(): Promise<void>;
}

async function startReceiver(): Promise<Receiver> {
  const deliveries: Delivery[] = [];
  let failures = 0;
  const server: Server = createServer((req, res) => {
    const chunks: Buffer[] = [];
    req.on("data", (chunk: Buffer) => chunks.push(chunk));
    req.on("end", () => {
      const status = failures > 0 ? 500 : 200;
      if (failures > 0) failures--;
      deliveries.push({ body: Buffer.concat(chunks).toString("utf8"), headers: req.headers, status });
      res.writeHead(status, { "Content-Type": "application/json" }).end(JSON.stringify({ received: status === 200 }));
    });
  });
  await new Promise<void>((resolve) => server.listen(0, "127.0.0.1", resolve));
  const receiver: Receiver = {
    url: `http://127.0.0.1:${(server.address() as AddressInfo).port}/webhooks/stripe`,
    deliveries,
    failNext(n) {
      failures = n;
    },
    async waitFor(count, timeoutMs = 5000) {
      const until = Date.now() + timeoutMs;
      while (deliveries.length < count) {
        if (Date.now() > until) throw new Error(`expected ${count} deliveries, got ${deliveries.length}`);
        await sleep(10);
      }
      return deliveries;
    },
    close: () => new Promise<void>((resolve) => server.close(() => resolve())),
  };
  receivers.push(receiver);
  return receiver;
}

function sleep(ms: number): Promise<void> {
  return new Promise((resolve) => setTimeout(resolve, ms));
}

/** A fresh account with a receiver registered as its webhook endpoint. */
async function accountWithReceiver() {
  const key = newKey();
  const stripe = sdk(key);
  const receiver = await startReceiver();
  const registered = await call(key, "POST", "/_fake/webhook-endpoints", { url: receiver.url, secret: SECRET });
  expect(registered.status).toBe(201);
  expect(registered.body).toEqual({ id: expect.stringMatching(/^we_/), url: receiver.url });
  return { key, stripe, receiver };
}

function verify(delivery: Delivery): Stripe.Event {
  return sdk(newKey()).webhooks.constructEvent(delivery.body, delivery.headers["stripe-signature"] as string, SECRET);
}

async function captureError(promise: Promise<unknown>): Promise<any> {
  try {
    await promise;
  } catch (error) {
    return error;
  }
  throw new Error("expected the call to fail");
}

describe("checkout sessions through the SDK", () => {
  it("creates and retrieves a session with the totals, lower-case currency and a payment page URL", async () => {
    const stripe = sdk(newKey());
    const before = Math.floor(Date.now() / 1000);
    const session = await stripe.checkout.sessions.create(sessionParams());
    expect(session.id).toMatch(/^cs_test_[A-Za-z0-9]{24}$/);
    expect(session).toMatchObject({
      object: "checkout.session",
      amount_subtotal: 2999,
      amount_total: 2999,
      currency: "usd",
      mode: "payment",
      status: "open",
      payment_status: "unpaid",
      payment_intent: null,
      client_reference_id: "quote-q1",
      metadata: { quoteId: "q1", company: "c7" },
      customer_email: "buyer@example.com",
      customer_details: null,
      success_url: "http://127.0.0.1:9/quotes/q1/paid?session={CHECKOUT_SESSION_ID}",
      cancel_url: "http://127.0.0.1:9/quotes/q1?cancelled=1",
      url: `${fake.url}/pay/${session.id}`,
      livemode: false,
    });
    expect(session.created).toBeGreaterThanOrEqual(before);
    expect(session.expires_at).toBe(session.created + 24 * 60 * 60);

    const again = await stripe.checkout.sessions.retrieve(session.id);
    expect(again.id).toBe(session.id);
    expect(again.amount_total).toBe(2999);
    expect(again.url).toBe(session.url);

    const bare = await stripe.checkout.sessions.create(
      sessionParams({ metadata: undefined, client_reference_id: undefined, customer_email: undefined, expires_at: session.created + 3600 }),
    );
    expect(bare.metadata).toEqual({});
    expect(bare.client_reference_id).toBeNull();
    expect(bare.customer_email).toBeNull();
    expect(bare.expires_at).toBe(session.created + 3600);
  });

  it("names the parameter at fault in a validation error", async () => {
    const key = newKey();
    const stripe = sdk(key);
    const cases: [Stripe.Checkout.SessionCreateParams, string][] = [
      [sessionParams({ line_items: [{ price_data: { currency: "usd", unit_amount: 100, product_data: { name: "x" } } }] }), "line_items[0][quantity]"],
      [sessionParams({ line_items: [{ price_data: { currency: "usd", unit_amount: -5, product_data: { name: "x" } }, quantity: 1 }] }), "line_items[0][price_data][unit_amount]"],
      [sessionParams({ line_items: [{ price_data: { currency: "dollars", unit_amount: 100, product_data: { name: "x" } }, quantity: 1 }] }), "line_items[0][price_data][currency]"],
      [sessionParams({ line_items: [] }), "line_items"],
      [sessionParams({ success_url: undefined }), "success_url"],
      [sessionParams({ mode: "subscription" }), "mode"],
      [sessionParams({ expires_at: 1 }), "expires_at"],
    ];
    for (const [params, param] of cases) {
      const error = await captureError(stripe.checkout.sessions.create(params));
      expect(error).toBeInstanceOf(stripe.errors.StripeInvalidRequestError);
      expect(error.statusCode).toBe(400);
      expect(error.param).toBe(param);
    }
    expect((await call(key, "GET", "/_fake/checkout/sessions")).body.data).toEqual([]);
  });

  it("replays the stored answer for a repeated Idempotency-Key and refuses the key with other parameters", async () => {
    const key = newKey();
    const stripe = sdk(key);
    const first = await stripe.checkout.sessions.create(sessionParams(), { idempotencyKey: "quote-q1-rev-1" });
    const second = await stripe.checkout.sessions.create(sessionParams(), { idempotencyKey: "quote-q1-rev-1" });
    expect(second.id).toBe(first.id);
    expect(second.lastResponse.headers["idempotent-replayed"]).toBe("true");
    expect(first.lastResponse.headers["idempotent-replayed"]).toBeUndefined();

    const listed = await call(key, "GET", "/_fake/checkout/sessions");
    expect(listed.body.data.map((session: { id: string }) => session.id)).toEqual([first.id]);

    const error = await captureError(
      stripe.checkout.sessions.create(sessionParams({ client_reference_id: "quote-q2" }), { idempotencyKey: "quote-q1-rev-1" }),
    );
    expect(error).toBeInstanceOf(stripe.errors.StripeIdempotencyError);
    expect(error.statusCode).toBe(400);
    expect((await call(key, "GET", "/_fake/checkout/sessions")).body.data).toHaveLength(1);

    // The same key in another account is another key.
    const other = await sdk(newKey()).checkout.sessions.create(sessionParams(), { idempotencyKey: "quote-q1-rev-1" });
    expect(other.id).not.toBe(first.id);
  });

  it("creates one session for concurrent requests with one Idempotency-Key", async () => {
    const key = newKey();
    const stripe = sdk(key);
    const results = await Promise.all(
      Array.from({ length: 6 }, () => stripe.checkout.sessions.create(sessionParams(), { idempotencyKey: "concurrent-1" })),
    );
    expect(new Set(results.map((session) => session.id)).size).toBe(1);
    const listed = await call(key, "GET", "/_fake/checkout/sessions");
    expect(listed.body.data).toHaveLength(1);
    expect(listed.body.data[0].id).toBe(results[0].id);
  });

  it("keeps each secret key's objects to itself", async () => {
    const owner = sdk(newKey());
    const otherKey = newKey();
    const other = sdk(otherKey);
    const session = await owner.checkout.sessions.create(sessionParams());
    const error = await captureError(other.checkout.sessions.retrieve(session.id));
    expect(error).toBeInstanceOf(other.errors.StripeInvalidRequestError);
    expect(error.statusCode).toBe(404);
    expect(error.code).toBe("resource_missing");
    const expire = await captureError(other.checkout.sessions.expire(session.id));
    expect(expire.statusCode).toBe(404);
    expect((await call(otherKey, "GET", "/_fake/checkout/sessions")).body.data).toEqual([]);
    expect((await owner.checkout.sessions.retrieve(session.id)).status).toBe("open");
  });

  it("answers 401 without a test secret key", async () => {
    const missing = await call(undefined, "GET", "/v1/checkout/sessions/cs_test_x");
    expect(missing.status).toBe(401);
    expect(missing.body.error).toMatchObject({ type: "invalid_request_error", message: "Invalid API Key provided" });
    const live = await captureError(sdk("sk_live_nope").checkout.sessions.create(sessionParams()));
    expect(live).toBeInstanceOf(Stripe.errors.StripeAuthenticationError);
    expect(live.statusCode).toBe(401);
    expect((await call(undefined, "GET", "/_fake/events")).status).toBe(401);
    expect((await call(undefined, "GET", "/_fake/health")).body).toEqual({ ok: true });
  });

  it("answers an unknown /v1 path with a 404 in the error shape", async () => {
    const res = await call(newKey(), "GET", "/v1/customers");
    expect(res.status).toBe(404);
    expect(res.body.error.type).toBe("invalid_request_error");
  });
});

describe("the test payment page", () => {
  it("shows the order, the amount, labelled fields and escapes what it prints", async () => {
    const stripe = sdk(newKey());
    const session = await stripe.checkout.sessions.create(
      sessionParams({
        line_items: [
          { price_data: { currency: "usd", unit_amount: 2500, product_data: { name: '<script>alert("x")</script> Panel' } }, quantity: 1 },
        ],
      }),
    );
    const page = await getPage(session.id);
    expect(page.status).toBe(200);
    expect(page.headers.get("content-type")).toMatch(/^text\/html/);
    const html = page.text;
    expect(html).toContain('<html lang="en">');
    expect(html).toContain("<title>Test payment — local Stripe stand-in</title>");
    expect(html).toContain('<meta name="viewport" content="width=device-width, initial-scale=1">');
    expect(html).toContain("&lt;script&gt;alert(&quot;x&quot;)&lt;/script&gt; Panel");
    expect(html).not.toContain("<script");
    expect(html).toContain("$25.00");
    expect(html).toMatch(/<button type="submit">Pay \$25\.00<\/button>/);
    for (const [name, label] of [
      ["email", "Email"],
      ["cardNumber", "Card number"],
      ["expiry", "Expiry (MM / YY)"],
      ["cvc", "CVC"],
      ["name", "Name on card"],
    ]) {
      expect(html).toContain(`<label for="${name}">${label}</label>`);
      expect(html).toMatch(new RegExp(`<input id="${name}" name="${name}"`));
    }
    expect(html).toContain('value="buyer@example.com"');
    expect(html).toContain(`<form method="post" action="/pay/${session.id}"`);
    expect(html).toContain(`<a class="back" href="http://127.0.0.1:9/quotes/q1?cancelled=1">← Back without paying</a>`);
    expect(html).toContain("4242 4242 4242 4242");
    expect(html).toContain("4000 0000 0000 0002");
    expect(html).toContain("4000 0000 0000 0119");
    expect(html).toMatch(/no real money/i);
    expect(html).not.toMatch(/https?:\/\/(?!127\.0\.0\.1)/);
  });

  it("pays with the success card: 303 to success_url, session paid, PaymentIntent retrievable, signed event delivered", async () => {
    const { key, stripe, receiver } = await accountWithReceiver();
    const session = await stripe.checkout.sessions.create(sessionParams());
    const res = await submitPage(session.id, { ...GOOD_FORM, cardNumber: "4242-4242-4242-4242" });
    expect(res.status).toBe(303);
    expect(res.headers.get("location")).toBe(`http://127.0.0.1:9/quotes/q1/paid?session=${session.id}`);

    const paid = await stripe.checkout.sessions.retrieve(session.id);
    expect(paid).toMatchObject({
      status: "complete",
      payment_status: "paid",
      url: null,
      customer_details: { email: "buyer@example.com", name: "Dana Volt" },
    });
    expect(paid.payment_intent).toMatch(/^pi_/);

    const paymentIntent = await stripe.paymentIntents.retrieve(paid.payment_intent as string);
    expect(paymentIntent).toMatchObject({
      id: paid.payment_intent,
      object: "payment_intent",
      amount: 2999,
      amount_received: 2999,
      currency: "usd",
      status: "succeeded",
      metadata: { quoteId: "q1" },
      livemode: false,
    });
    expect(paymentIntent.latest_charge).toMatch(/^ch_/);

    const [delivery] = await receiver.waitFor(1);
    expect(delivery.headers["content-type"]).toBe("application/json");
    const event = verify(delivery);
    expect(delivery.body).toBe(JSON.stringify(JSON.parse(delivery.body), null, 2));
    expect(event).toMatchObject({
      object: "event",
      type: "checkout.session.completed",
      api_version: Stripe.API_VERSION,
      livemode: false,
      pending_webhooks: 1,
      request: { id: null, idempotency_key: null },
    });
    expect(event.id).toMatch(/^evt_/);
    const object = event.data.object as Stripe.Checkout.Session;
    expect(object).toMatchObject({ id: session.id, payment_status: "paid", status: "complete", payment_intent: paid.payment_intent, amount_total: 2999 });

    const events = await call(key, "GET", "/_fake/events");
    expect(events.body.data).toHaveLength(1);
    expect(events.body.data[0]).toMatchObject({ id: event.id, type: "checkout.session.completed" });
    expect(events.body.data[0].attempts).toEqual([{ at: expect.any(String), url: receiver.url, status: 200 }]);

    // Paying again is not possible: the page says it is complete and links on.
    const done = await getPage(session.id);
    expect(done.status).toBe(200);
    expect(done.text).toContain("This payment is complete");
    expect(done.text).toContain(`href="http://127.0.0.1:9/quotes/q1/paid?session=${session.id}"`);
    const repost = await submitPage(session.id, GOOD_FORM);
    expect(repost.status).toBe(200);
    expect((await call(key, "GET", "/_fake/events")).body.data).toHaveLength(1);
  });

  it("shows the decline on the page with 402 and changes nothing", async () => {
    const { key, stripe, receiver } = await accountWithReceiver();
    const session = await stripe.checkout.sessions.create(sessionParams());
    const res = await submitPage(session.id, { ...GOOD_FORM, cardNumber: "4000 0000 0000 0002" });
    expect(res.status).toBe(402);
    expect(res.text).toMatch(/<div class="alert" role="alert">Your card was declined\. Try another card\.<\/div>/);
    expect(res.text).toContain('value="Dana Volt"');
    expect(res.text).toContain('value="12 / 49"');
    expect(res.text).not.toContain("4000 0000 0000 0002\"");
    const after = await stripe.checkout.sessions.retrieve(session.id);
    expect(after).toMatchObject({ status: "open", payment_status: "unpaid", payment_intent: null, url: session.url });
    expect((await call(key, "GET", "/_fake/events")).body.data).toEqual([]);
    expect(receiver.deliveries).toEqual([]);
  });

  it("shows a processing error with 402, then accepts the success card", async () => {
    const { key, stripe, receiver } = await accountWithReceiver();
    const session = await stripe.checkout.sessions.create(sessionParams());
    const retry = await submitPage(session.id, { ...GOOD_FORM, cardNumber: "4000000000000119" });
    expect(retry.status).toBe(402);
    expect(retry.text).toContain('role="alert">We could not process your card just now. Please try again.</div>');
    expect((await stripe.checkout.sessions.retrieve(session.id)).status).toBe("open");
    expect((await call(key, "GET", "/_fake/events")).body.data).toEqual([]);

    const ok = await submitPage(session.id, GOOD_FORM);
    expect(ok.status).toBe(303);
    expect((await stripe.checkout.sessions.retrieve(session.id)).payment_status).toBe("paid");
    await receiver.waitFor(1);
    expect(verify(receiver.deliveries[0]).type).toBe("checkout.session.completed");
  });

  it("refuses an unknown card and bad fields with 400, naming each field and keeping what was typed", async () => {
    const stripe = sdk(newKey());
    const session = await stripe.checkout.sessions.create(sessionParams());
    const unknownCard = await submitPage(session.id, { ...GOOD_FORM, cardNumber: "5555 5555 5555 4444" });
    expect(unknownCard.status).toBe(400);
    expect(unknownCard.text).toMatch(/role="alert">[^]*Card number:/);
    expect(unknownCard.text).not.toContain("5555");
    expect(unknownCard.text).toContain('id="cardNumber" name="cardNumber" type="text" autocomplete="cc-number" value=""');

    const badFields = await submitPage(session.id, { email: "buyer@example.com", cardNumber: "4242424242424242", expiry: "01 / 20", cvc: "12", name: " " });
    expect(badFields.status).toBe(400);
    const alert = /<div class="alert" role="alert">([^]*?)<\/div>/.exec(badFields.text)?.[1] ?? "";
    expect(alert).toContain("Expiry (MM / YY):");
    expect(alert).toContain("CVC:");
    expect(alert).toContain("Name on card:");
    expect(alert).not.toContain("Card number:");
    expect(badFields.text).toContain('value="01 / 20"');
    expect(badFields.text).toContain('aria-invalid="true" aria-describedby="cvc-error"');
    expect((await stripe.checkout.sessions.retrieve(session.id)).status).toBe("open");
  });

  it("expires a session: event, 410 page, no second expiry; unknown ids are 404", async () => {
    const { key, stripe, receiver } = await accountWithReceiver();
    const session = await stripe.checkout.sessions.create(sessionParams());
    const expired = await stripe.checkout.sessions.expire(session.id);
    expect(expired).toMatchObject({ id: session.id, status: "expired", url: null, payment_status: "unpaid" });
    const [delivery] = await receiver.waitFor(1);
    const event = verify(delivery);
    expect(event.type).toBe("checkout.session.expired");
    expect((event.data.object as Stripe.Checkout.Session).status).toBe("expired");

    const page = await getPage(session.id);
    expect(page.status).toBe(410);
    expect(page.text).toContain("This payment page has expired");
    expect(page.text).toContain('href="http://127.0.0.1:9/quotes/q1?cancelled=1"');
    expect((await submitPage(session.id, GOOD_FORM)).status).toBe(410);

    const again = await captureError(stripe.checkout.sessions.expire(session.id));
    expect(again).toBeInstanceOf(stripe.errors.StripeInvalidRequestError);
    expect(again.statusCode).toBe(400);
    expect((await call(key, "GET", "/_fake/events?type=checkout.session.expired")).body.data).toHaveLength(1);

    const unknown = await getPage("cs_test_doesnotexist000000000000");
    expect(unknown.status).toBe(404);
    expect(unknown.text).toContain("No such payment");
  });
});

describe("webhook delivery", () => {
  it("retries after 500 answers with the configured delays, each attempt freshly signed and recorded", async () => {
    const { key, stripe, receiver } = await accountWithReceiver();
    receiver.failNext(2);
    const session = await stripe.checkout.sessions.create(sessionParams());
    await call(key, "POST", `/_fake/checkout/sessions/${session.id}/pay`, { card: "4242424242424242" });
    const deliveries = await receiver.waitFor(3);
    expect(deliveries.map((delivery) => delivery.status)).toEqual([500, 500, 200]);
    const ids = deliveries.map((delivery) => verify(delivery).id);
    expect(new Set(ids).size).toBe(1);
    const events = await call(key, "GET", "/_fake/events");
    expect(events.body.data[0].attempts.map((attempt: { status: number }) => attempt.status)).toEqual([500, 500, 200]);
  });

  it("gives up after the last retry and records a receiver that cannot be reached", async () => {
    const { key, stripe, receiver } = await accountWithReceiver();
    receiver.failNext(10);
    await call(key, "POST", "/_fake/webhook-endpoints", { url: "http://127.0.0.1:9/nobody-listens", secret: SECRET });
    const session = await stripe.checkout.sessions.create(sessionParams());
    await stripe.checkout.sessions.expire(session.id);
    await receiver.waitFor(3);
    await sleep(400);
    expect(receiver.deliveries).toHaveLength(3);
    const [record] = (await call(key, "GET", "/_fake/events")).body.data;
    const toReceiver = record.attempts.filter((attempt: { url: string }) => attempt.url === receiver.url);
    const toNobody = record.attempts.filter((attempt: { url: string }) => attempt.url !== receiver.url);
    expect(toReceiver.map((attempt: { status: number }) => attempt.status)).toEqual([500, 500, 500]);
    expect(toNobody).toHaveLength(3);
    for (const attempt of toNobody) {
      expect(attempt.status).toBeUndefined();
      expect(attempt.error).toEqual(expect.any(String));
    }
  });

  it("holds events until asked, then delivers the same event as often as asked", async () => {
    const { key, stripe, receiver } = await accountWithReceiver();
    const settings = await call(key, "PUT", "/_fake/settings", { delivery: "hold" });
    expect(settings.status).toBe(200);
    expect(settings.body).toEqual({ delivery: "hold", retryDelaysMs: [50, 100] });
    const session = await stripe.checkout.sessions.create(sessionParams());
    await call(key, "POST", `/_fake/checkout/sessions/${session.id}/pay`, { card: "4242 4242 4242 4242" });
    await sleep(150);
    expect(receiver.deliveries).toEqual([]);

    const [record] = (await call(key, "GET", "/_fake/events")).body.data;
    expect(record.type).toBe("checkout.session.completed");
    expect(record.attempts).toEqual([]);
    const first = await call(key, "POST", `/_fake/events/${record.id}/deliver`);
    expect(first.status).toBe(200);
    expect(first.body.results).toEqual([{ url: receiver.url, status: 200, body: JSON.stringify({ received: true }) }]);
    const second = await call(key, "POST", `/_fake/events/${record.id}/deliver`);
    expect(second.body.results[0].status).toBe(200);
    expect(receiver.deliveries).toHaveLength(2);
    expect(receiver.deliveries.map((delivery) => verify(delivery).id)).toEqual([record.id, record.id]);
    expect((await call(key, "GET", "/_fake/events")).body.data[0].attempts).toHaveLength(2);

    const missing = await call(key, "POST", "/_fake/events/evt_nope/deliver");
    expect(missing.status).toBe(404);
    expect(missing.body.error.code).toBe("resource_missing");
    expect((await call(key, "PUT", "/_fake/settings", { delivery: "later" })).status).toBe(400);
  });

  it("uses the account's own retry delays and the latest secret for an endpoint registered again", async () => {
    const { key, stripe, receiver } = await accountWithReceiver();
    const settings = await call(key, "PUT", "/_fake/settings", { retryDelaysMs: [10] });
    expect(settings.body).toEqual({ delivery: "immediate", retryDelaysMs: [10] });
    const again = await call(key, "POST", "/_fake/webhook-endpoints", { url: receiver.url, secret: "whsec_second" });
    expect(again.status).toBe(201);
    receiver.failNext(5);
    const session = await stripe.checkout.sessions.create(sessionParams());
    await stripe.checkout.sessions.expire(session.id);
    await receiver.waitFor(2);
    await sleep(200);
    expect(receiver.deliveries).toHaveLength(2);
    const delivery = receiver.deliveries[0];
    const event = sdk(key).webhooks.constructEvent(delivery.body, delivery.headers["stripe-signature"] as string, "whsec_second");
    expect(event.type).toBe("checkout.session.expired");
    expect(() => verify(delivery)).toThrow();
  });

  it("signs so that a tampered body or a wrong secret fails constructEvent", async () => {
    const { key, stripe, receiver } = await accountWithReceiver();
    const session = await stripe.checkout.sessions.create(sessionParams());
    await call(key, "POST", `/_fake/checkout/sessions/${session.id}/pay`, { card: "4242424242424242" });
    const [delivery] = await receiver.waitFor(1);
    const header = delivery.headers["stripe-signature"] as string;
    expect(header).toMatch(/^t=\d+,v1=[0-9a-f]{64}/);
    expect(verify(delivery).type).toBe("checkout.session.completed");
    const tampered = delivery.body.replace('"amount_total": 2999', '"amount_total": 1');
    expect(tampered).not.toBe(delivery.body);
    expect(() => stripe.webhooks.constructEvent(tampered, header, SECRET)).toThrow(Stripe.errors.StripeSignatureVerificationError);
    expect(() => stripe.webhooks.constructEvent(delivery.body, header, "whsec_wrong")).toThrow(Stripe.errors.StripeSignatureVerificationError);
  });

  it("sends nothing after stop(): pending retries are dropped", async () => {
    const own = await startStripeFake({ retryDelaysMs: [100] });
    try {
      const key = newKey();
      const receiver = await startReceiver();
      receiver.failNext(5);
      await fetch(`${own.url}/_fake/webhook-endpoints`, {
        method: "POST",
        headers: { Authorization: `Bearer ${key}`, "Content-Type": "application/json" },
        body: JSON.stringify({ url: receiver.url, secret: SECRET }),
      });
      const stripe = new Stripe(key, { host: "127.0.0.1", port: own.port, protocol: "http", maxNetworkRetries: 0, telemetry: false });
      const session = await stripe.checkout.sessions.create(sessionParams());
      await stripe.checkout.sessions.expire(session.id);
      await receiver.waitFor(1);
      await own.stop();
      await sleep(300);
      expect(receiver.deliveries).toHaveLength(1);
      const refused = await captureError(fetch(`${own.url}/_fake/health`));
      expect(refused).toBeInstanceOf(Error);
    } finally {
      await own.stop();
    }
  });
});

describe("the control API's pay", () => {
  it("charges an overridden amount and currency, reflected in the session, PaymentIntent and event", async () => {
    const { key, stripe, receiver } = await accountWithReceiver();
    const session = await stripe.checkout.sessions.create(sessionParams());
    const paid = await call(key, "POST", `/_fake/checkout/sessions/${session.id}/pay`, { card: "4242424242424242", amountTotal: 1999, currency: "EUR" });
    expect(paid.status).toBe(200);
    expect(paid.body.outcome).toBe("succeeded");
    expect(paid.body.session).toMatchObject({ id: session.id, amount_total: 1999, currency: "eur", status: "complete", payment_status: "paid" });
    const paymentIntent = await stripe.paymentIntents.retrieve(paid.body.session.payment_intent);
    expect(paymentIntent).toMatchObject({ amount: 1999, amount_received: 1999, currency: "eur" });
    const [delivery] = await receiver.waitFor(1);
    const object = verify(delivery).data.object as Stripe.Checkout.Session;
    expect(object.amount_total).toBe(1999);
    expect(object.currency).toBe("eur");
  });

  it("reports declines and processing errors as outcomes, and refuses other cards and closed sessions", async () => {
    const key = newKey();
    const stripe = sdk(key);
    const session = await stripe.checkout.sessions.create(sessionParams());
    const declined = await call(key, "POST", `/_fake/checkout/sessions/${session.id}/pay`, { card: "4000000000000002" });
    expect(declined.body).toMatchObject({ outcome: "declined", session: { status: "open", payment_intent: null } });
    const retry = await call(key, "POST", `/_fake/checkout/sessions/${session.id}/pay`, { card: "4000 0000 0000 0119" });
    expect(retry.body.outcome).toBe("retry");
    const unknown = await call(key, "POST", `/_fake/checkout/sessions/${session.id}/pay`, { card: "1234" });
    expect(unknown.status).toBe(400);
    expect(unknown.body.error.param).toBe("card");
    expect((await call(key, "GET", "/_fake/events")).body.data).toEqual([]);
    await call(key, "POST", `/_fake/checkout/sessions/${session.id}/pay`, { card: "4242424242424242" });
    const twice = await call(key, "POST", `/_fake/checkout/sessions/${session.id}/pay`, { card: "4242424242424242" });
    expect(twice.status).toBe(400);
    expect((await call(newKey(), "POST", `/_fake/checkout/sessions/${session.id}/pay`, { card: "4242424242424242" })).status).toBe(404);
  });
});

describe("refunds", () => {
  it("refunds part then the rest, refuses more, and emits refund.created and charge.refunded", async () => {
    const { key, stripe, receiver } = await accountWithReceiver();
    await call(key, "PUT", "/_fake/settings", { delivery: "hold" });
    const session = await stripe.checkout.sessions.create(sessionParams());
    const paid = await call(key, "POST", `/_fake/checkout/sessions/${session.id}/pay`, { card: "4242424242424242" });
    const paymentIntentId: string = paid.body.session.payment_intent;
    const paymentIntent = await stripe.paymentIntents.retrieve(paymentIntentId);

    const partial = await stripe.refunds.create({ payment_intent: paymentIntentId, amount: 1000, reason: "requested_by_customer", metadata: { note: "part" } });
    expect(partial).toMatchObject({
      object: "refund",
      amount: 1000,
      currency: "usd",
      payment_intent: paymentIntentId,
      charge: paymentIntent.latest_charge,
      status: "succeeded",
      reason: "requested_by_customer",
      metadata: { note: "part" },
    });
    expect(partial.id).toMatch(/^re_/);

    const tooMuch = await captureError(stripe.refunds.create({ payment_intent: paymentIntentId, amount: 2000 }));
    expect(tooMuch).toBeInstanceOf(stripe.errors.StripeInvalidRequestError);
    expect(tooMuch.statusCode).toBe(400);
    expect(tooMuch.code).toBe("amount_too_large");

    const rest = await stripe.refunds.create({ payment_intent: paymentIntentId });
    expect(rest.amount).toBe(1999);
    expect(rest.reason).toBeNull();
    expect((await stripe.refunds.retrieve(partial.id)).amount).toBe(1000);

    const nothingLeft = await captureError(stripe.refunds.create({ payment_intent: paymentIntentId, amount: 1 }));
    expect(nothingLeft.statusCode).toBe(400);
    expect(nothingLeft.code).toBe("charge_already_refunded");
    const badReason = await captureError(stripe.refunds.create({ payment_intent: paymentIntentId, reason: "changed_mind" as "duplicate" }));
    expect(badReason.param).toBe("reason");
    const missing = await captureError(stripe.refunds.create({ payment_intent: "pi_unknown" }));
    expect(missing.code).toBe("resource_missing");
    expect(missing.param).toBe("payment_intent");

    const created = (await call(key, "GET", "/_fake/events?type=refund.created")).body.data;
    expect(created.map((record: any) => record.event.data.object.id)).toEqual([partial.id, rest.id]);
    const refunded = (await call(key, "GET", "/_fake/events?type=charge.refunded")).body.data;
    expect(refunded).toHaveLength(2);
    expect(refunded[0].event.data.object).toMatchObject({ object: "charge", id: paymentIntent.latest_charge, amount: 2999, amount_refunded: 1000, refunded: false });
    expect(refunded[0].event.data.object.refunds.data.map((refund: { id: string }) => refund.id)).toEqual([partial.id]);
    expect(refunded[1].event.data.object).toMatchObject({ amount_refunded: 2999, refunded: true });
    expect(refunded[1].event.data.object.refunds.data.map((refund: { id: string }) => refund.id).sort()).toEqual([partial.id, rest.id].sort());

    // Delivered on request, charge.refunded verifies and carries the refunded amount.
    await call(key, "POST", `/_fake/events/${refunded[1].id}/deliver`);
    const [delivery] = await receiver.waitFor(1);
    const event = verify(delivery);
    expect(event.type).toBe("charge.refunded");
    expect((event.data.object as Stripe.Charge).amount_refunded).toBe(2999);

    const otherAccount = await captureError(sdk(newKey()).refunds.retrieve(partial.id));
    expect(otherAccount.statusCode).toBe(404);
  });

  it("replays a refund for a repeated Idempotency-Key instead of refunding twice", async () => {
    const key = newKey();
    const stripe = sdk(key);
    const session = await stripe.checkout.sessions.create(sessionParams());
    const paid = await call(key, "POST", `/_fake/checkout/sessions/${session.id}/pay`, { card: "4242424242424242" });
    const paymentIntentId: string = paid.body.session.payment_intent;
    const [first, second] = await Promise.all([
      stripe.refunds.create({ payment_intent: paymentIntentId, amount: 500 }, { idempotencyKey: "refund-1" }),
      stripe.refunds.create({ payment_intent: paymentIntentId, amount: 500 }, { idempotencyKey: "refund-1" }),
    ]);
    expect(second.id).toBe(first.id);
    expect((await call(key, "GET", "/_fake/events?type=refund.created")).body.data).toHaveLength(1);
    const charge = (await call(key, "GET", "/_fake/events?type=charge.refunded")).body.data[0].event.data.object;
    expect(charge.amount_refunded).toBe(500);
  });
});
