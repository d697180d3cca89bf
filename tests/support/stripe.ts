import { execFileSync } from "node:child_process";
import { mkdtempSync, rmSync, writeFileSync } from "node:fs";
import os from "node:os";
import path from "node:path";
import Stripe from "stripe";
import { expect } from "vitest";
import { ApiClient } from "./api.js";
import type { TestApp } from "./app.js";

export interface FakeEvent {
  id: string;
  type: string;
  created: number;
  event: Stripe.Event;
  attempts: Array<{ at: string; url: string; status?: number; error?: string }>;
}

/** The test controls of the run's Stripe fake, for one test app's account (its key). */
export function fakeStripe(app: TestApp) {
  const account = app.stripe;
  if (!account) throw new Error("this test app has payments off");
  const call = async (method: string, route: string, body?: unknown) => {
    const response = await fetch(`${account.apiBase}${route}`, {
      method,
      headers: { Authorization: `Bearer ${account.secretKey}`, "Content-Type": "application/json" },
      body: body === undefined ? undefined : JSON.stringify(body),
    });
    return { status: response.status, body: (await response.json()) as any };
  };
  const base = new URL(account.apiBase);
  return {
    /** The SDK as another Stripe user would use it (the dashboard's refunds, expiring a session). */
    sdk: new Stripe(account.secretKey, { host: base.hostname, port: Number(base.port), protocol: "http", maxNetworkRetries: 0, telemetry: false }),
    async hold() {
      expect((await call("PUT", "/_fake/settings", { delivery: "hold" })).status).toBe(200);
    },
    async deliverImmediately() {
      expect((await call("PUT", "/_fake/settings", { delivery: "immediate" })).status).toBe(200);
    },
    async events(type?: string): Promise<FakeEvent[]> {
      const answer = await call("GET", `/_fake/events${type ? `?type=${encodeURIComponent(type)}` : ""}`);
      expect(answer.status).toBe(200);
      return answer.body.data;
    },
    /** Delivers one event now (again), waiting for the app's answer. */
    async deliver(eventId: string): Promise<Array<{ url: string; status: number; body: string }>> {
      const answer = await call("POST", `/_fake/events/${eventId}/deliver`);
      expect(answer.status, JSON.stringify(answer.body)).toBe(200);
      return answer.body.results;
    },
    async pay(sessionId: string, card: string, overrides: { amountTotal?: number; currency?: string } = {}) {
      const answer = await call("POST", `/_fake/checkout/sessions/${sessionId}/pay`, { card, ...overrides });
      return answer.body as { outcome: "succeeded" | "declined" | "retry"; session: Stripe.Checkout.Session };
    },
    async sessions(): Promise<Stripe.Checkout.Session[]> {
      const answer = await call("GET", "/_fake/checkout/sessions");
      expect(answer.status).toBe(200);
      return answer.body.data;
    },
  };
}

export const CARDS = { success: "4242 4242 4242 4242", declined: "4000 0000 0000 0002", retry: "4000 0000 0000 0119" } as const;

export const sessionIdOf = (payUrl: string) => payUrl.slice(payUrl.lastIndexOf("/") + 1);

/** Fills in the fake's payment page like a client: GET the page, POST its form. Does not follow the redirect. */
export async function payOnPage(payUrl: string, card: string): Promise<{ status: number; location: string | null; html: string }> {
  const page = await fetch(payUrl);
  expect(page.status).toBe(200);
  const response = await fetch(payUrl, {
    method: "POST",
    redirect: "manual",
    headers: { "Content-Type": "application/x-www-form-urlencoded" },
    body: new URLSearchParams({ email: "tamsin@example.test", cardNumber: card, expiry: "12 / 39", cvc: "123", name: "Tamsin Fairweather" }).toString(),
  });
  return { status: response.status, location: response.headers.get("location"), html: await response.text() };
}

/** Polls until `check` returns a value (not undefined), up to `ms`. */
export async function eventually<T>(check: () => Promise<T | undefined>, ms = 10_000, what = "the condition"): Promise<T> {
  const deadline = Date.now() + ms;
  for (;;) {
    const value = await check();
    if (value !== undefined) return value;
    if (Date.now() > deadline) throw new Error(`${what} did not happen within ${ms} ms`);
    await new Promise((resolve) => setTimeout(resolve, 100));
  }
}

/** A PDF's text as poppler's pdftotext reads it (layout kept). */
export function pdfText(pdf: Buffer): string {
  const dir = mkdtempSync(path.join(os.tmpdir(), "runwright-pdf-"));
  try {
    const file = path.join(dir, "doc.pdf");
    writeFileSync(file, pdf);
    return execFileSync("/usr/bin/pdftotext", ["-layout", file, "-"], { encoding: "utf8" });
  } finally {
    rmSync(dir, { recursive: true, force: true });
  }
}

/** The client accepts the sent quote (unless already) and pays its deposit on the fake's page; the payment's id once the webhook recorded it. */
export async function payDeposit(app: TestApp, staff: ApiClient, jobId: string, token: string, { accept = true } = {}): Promise<string> {
  const client = new ApiClient(app.app);
  if (accept) {
    const answer = await client.post(`/api/quote-links/${token}/accept`, { name: "Paying Client", agree: true });
    expect(answer.status, JSON.stringify(answer.body)).toBe(200);
  }
  const checkout = await client.post(`/api/quote-links/${token}/deposit`);
  expect(checkout.status, JSON.stringify(checkout.body)).toBe(200);
  expect((await payOnPage(checkout.body.url, CARDS.success)).status).toBe(303);
  // Until the receipt e-mail was tried too (it updates the payment), so callers see a settled row.
  return eventually(
    async () => {
      const [payment] = (await staff.get(`/api/jobs/${jobId}/payments`)).body.items as Array<{ id: string; receiptSentAt: string | null; receiptError: string | null }>;
      return payment && (payment.receiptSentAt || payment.receiptError) ? payment.id : undefined;
    },
    10_000,
    "the deposit payment and its receipt",
  );
}
