import { randomBytes } from "node:crypto";
import { FAKE_SECRET_KEY_PREFIX, type PaymentsSettings } from "../config/payments.js";

/**
 * Settings for an app that talks to the local Stripe fake: a key of its own (the fake keeps each
 * key's objects apart) and a webhook endpoint registered with a fresh signing secret.
 */
export async function connectToStripeFake(fakeUrl: string, webhookUrl: string): Promise<PaymentsSettings> {
  const secretKey = `${FAKE_SECRET_KEY_PREFIX}_${randomBytes(12).toString("hex")}`;
  const webhookSecret = `whsec_${randomBytes(24).toString("hex")}`;
  const response = await fetch(`${fakeUrl}/_fake/webhook-endpoints`, {
    method: "POST",
    headers: { Authorization: `Bearer ${secretKey}`, "Content-Type": "application/json" },
    body: JSON.stringify({ url: webhookUrl, secret: webhookSecret }),
  });
  if (!response.ok) throw new Error(`The local Stripe fake at ${fakeUrl} refused the webhook endpoint (${response.status})`);
  return { secretKey, webhookSecret, apiBase: fakeUrl };
}
