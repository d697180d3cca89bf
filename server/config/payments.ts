import type { Env } from "./env.js";

/** The secret key prefix of the local Stripe fake; a production start refuses it. */
export const FAKE_SECRET_KEY_PREFIX = "sk_test_runwright_fake";

export interface PaymentsSettings {
  secretKey: string;
  webhookSecret: string;
  /** A Stripe-compatible API instead of Stripe itself (the local fake); null: Stripe. */
  apiBase: string | null;
}

export class PaymentsConfigError extends Error {
  override name = "PaymentsConfigError";
}

/**
 * What the environment says about Stripe:
 * - settings, when STRIPE_SECRET_KEY is set (STRIPE_WEBHOOK_SECRET is then required);
 * - "fake" in development and test without a key: npm start runs the local fake;
 * - null in production without a key: online deposits are off and the client's page says whom to pay.
 * Production refuses the fake (its key or STRIPE_API_BASE), so no real client is sent to a test page.
 */
export function paymentsFromEnv(env: Env): PaymentsSettings | "fake" | null {
  const production = env.NODE_ENV === "production";
  if (!env.STRIPE_SECRET_KEY) {
    if (env.STRIPE_API_BASE) throw new PaymentsConfigError("STRIPE_API_BASE is set without STRIPE_SECRET_KEY; set both, or neither to use the local Stripe fake in development.");
    return production ? null : "fake";
  }
  if (production && env.STRIPE_SECRET_KEY.startsWith(FAKE_SECRET_KEY_PREFIX)) {
    throw new PaymentsConfigError("STRIPE_SECRET_KEY is the local Stripe fake's key; production needs a real Stripe secret key.");
  }
  if (production && env.STRIPE_API_BASE) {
    throw new PaymentsConfigError("STRIPE_API_BASE points the payments at a Stripe fake; production must talk to Stripe itself — unset it.");
  }
  if (!env.STRIPE_WEBHOOK_SECRET) {
    throw new PaymentsConfigError("STRIPE_WEBHOOK_SECRET is not set; copy the signing secret (whsec_…) of the webhook endpoint for /api/webhooks/stripe.");
  }
  return { secretKey: env.STRIPE_SECRET_KEY, webhookSecret: env.STRIPE_WEBHOOK_SECRET, apiBase: env.STRIPE_API_BASE ?? null };
}
