import Stripe from "stripe";
import type { PaymentsSettings } from "../config/payments.js";

/** What the app needs to take deposits: the SDK client and the webhook signing secret. */
export interface Payments {
  stripe: Stripe;
  webhookSecret: string;
}

/**
 * The official SDK, pointed at Stripe, or at a Stripe-compatible fake with the SDK's own
 * host/port/protocol options. No automatic retries against the fake (tests see every call);
 * against Stripe the SDK retries network failures with the same idempotency key.
 */
export function createPayments(settings: PaymentsSettings): Payments {
  const options: ConstructorParameters<typeof Stripe>[1] = { telemetry: false, timeout: 10_000, maxNetworkRetries: 2 };
  if (settings.apiBase) {
    const base = new URL(settings.apiBase);
    Object.assign(options, {
      host: base.hostname,
      port: Number(base.port || (base.protocol === "https:" ? 443 : 80)),
      protocol: base.protocol.replace(":", "") as "http" | "https",
      maxNetworkRetries: 0,
    });
  }
  return { stripe: new Stripe(settings.secretKey, options), webhookSecret: settings.webhookSecret };
}
