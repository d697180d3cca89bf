import http, { type ClientRequest } from "node:http";
import https from "node:https";
import Stripe from "stripe";
import { nowSeconds, randomId, type Account, type EventRecord, type StripeEvent } from "./store.js";

/** The API version the installed SDK is pinned to, so events look like what the app's SDK expects. */
export const API_VERSION: string = Stripe.API_VERSION;

/** How long one delivery waits for the receiver (ms). */
const DELIVERY_TIMEOUT_MS = 10_000;
/** How much of a receiver's answer is kept for /_fake/events/:id/deliver (characters). */
const MAX_ANSWER_CHARS = 64 * 1024;

export interface DeliveryResult {
  url: string;
  /** 0 on a network error. */
  status: number;
  body: string;
  error?: string;
}

/**
 * Creates events and posts them to the account's webhook endpoints, signed with the SDK's own scheme.
 * Delivery never blocks the API answer: it starts on a timer, and every timer and request is dropped by stop().
 */
export class EventHub {
  private readonly timers = new Set<NodeJS.Timeout>();
  private readonly requests = new Set<ClientRequest>();
  private stopped = false;

  constructor(private readonly defaultRetryDelaysMs: readonly number[]) {}

  retryDelaysFor(account: Account): number[] {
    return [...(account.settings.retryDelaysMs ?? this.defaultRetryDelaysMs)];
  }

  /** Records an event of the account (data.object is a copy taken now) and, in immediate mode, starts delivering it. */
  emit(account: Account, type: string, object: unknown): EventRecord {
    const event: StripeEvent = {
      id: randomId("evt_"),
      object: "event",
      api_version: API_VERSION,
      created: nowSeconds(),
      data: { object: structuredClone(object) },
      livemode: false,
      pending_webhooks: account.endpoints.size,
      request: { id: null, idempotency_key: null },
      type,
    };
    const record: EventRecord = { event, attempts: [] };
    account.events.push(record);
    if (account.settings.delivery === "immediate") {
      const delays = this.retryDelaysFor(account);
      for (const url of account.endpoints.keys()) this.schedule(account, record, url, 0, delays);
    }
    return record;
  }

  /** Delivers the event once to every endpoint of the account now and waits for the answers (no retries). */
  deliverNow(account: Account, record: EventRecord): Promise<DeliveryResult[]> {
    return Promise.all([...account.endpoints.keys()].map((url) => this.attempt(account, record, url)));
  }

  /** Drops pending retries and aborts deliveries in flight; nothing is sent afterwards. */
  stop(): void {
    this.stopped = true;
    for (const timer of this.timers) clearTimeout(timer);
    this.timers.clear();
    for (const request of this.requests) request.destroy(new Error("the stand-in stopped"));
    this.requests.clear();
  }

  private schedule(account: Account, record: EventRecord, url: string, waitMs: number, laterDelays: number[]): void {
    if (this.stopped) return;
    const timer = setTimeout(() => {
      this.timers.delete(timer);
      void this.attempt(account, record, url).then((result) => {
        if (result.status >= 200 && result.status < 300) return;
        const [next, ...rest] = laterDelays;
        if (next !== undefined) this.schedule(account, record, url, next, rest);
      });
    }, waitMs);
    timer.unref();
    this.timers.add(timer);
  }

  private async attempt(account: Account, record: EventRecord, url: string): Promise<DeliveryResult> {
    const endpoint = account.endpoints.get(url);
    const at = new Date().toISOString();
    if (!endpoint || this.stopped) {
      const error = this.stopped ? "the stand-in stopped" : "endpoint no longer registered";
      return { url, status: 0, body: "", error };
    }
    const payload = JSON.stringify(record.event, null, 2);
    // A fresh timestamp per attempt, as the receiver checks the signature's age.
    const signature = Stripe.webhooks.generateTestHeaderString({ payload, secret: endpoint.secret });
    const result = await this.post(url, payload, signature);
    record.attempts.push(result.error === undefined ? { at, url, status: result.status } : { at, url, error: result.error });
    return result;
  }

  private post(url: string, payload: string, signature: string): Promise<DeliveryResult> {
    return new Promise((resolve) => {
      let settled = false;
      const finish = (result: DeliveryResult) => {
        if (settled) return;
        settled = true;
        this.requests.delete(request);
        resolve(result);
      };
      const target = new URL(url);
      const send = target.protocol === "https:" ? https.request : http.request;
      const request = send(target, {
        method: "POST",
        agent: false,
        timeout: DELIVERY_TIMEOUT_MS,
        headers: {
          "Content-Type": "application/json",
          "Content-Length": Buffer.byteLength(payload),
          "Stripe-Signature": signature,
          "User-Agent": "runwright-stripe-fake",
        },
      });
      this.requests.add(request);
      request.on("response", (response) => {
        let body = "";
        response.setEncoding("utf8");
        response.on("data", (chunk: string) => {
          if (body.length < MAX_ANSWER_CHARS) body += chunk.slice(0, MAX_ANSWER_CHARS - body.length);
        });
        response.on("end", () => finish({ url, status: response.statusCode ?? 0, body }));
        response.on("error", (error) => finish({ url, status: 0, body: "", error: error.message }));
        // A receiver that hangs up mid-answer still answered with its status.
        response.on("close", () => finish({ url, status: response.statusCode ?? 0, body }));
      });
      request.on("timeout", () => request.destroy(new Error(`no answer within ${DELIVERY_TIMEOUT_MS} ms`)));
      request.on("error", (error) => finish({ url, status: 0, body: "", error: error.message || String(error) }));
      request.end(payload);
    });
  }
}
