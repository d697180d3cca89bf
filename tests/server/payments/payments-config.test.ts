import { describe, expect, it } from "vitest";
import { readEnv } from "../../../server/config/env.js";
import { FAKE_SECRET_KEY_PREFIX, paymentsFromEnv } from "../../../server/config/payments.js";

const env = (vars: Record<string, string>) => readEnv(vars);
const FAKE_KEY = `${FAKE_SECRET_KEY_PREFIX}_0123456789abcdef`;

describe("Stripe settings from the environment", () => {
  it("runs the local fake in development when no key is set, and turns deposits off in production", () => {
    expect(paymentsFromEnv(env({}))).toBe("fake");
    expect(paymentsFromEnv(env({ NODE_ENV: "test" }))).toBe("fake");
    expect(paymentsFromEnv(env({ NODE_ENV: "production" }))).toBeNull();
  });

  it("uses a configured key with its webhook secret, and a fake's address only outside production", () => {
    expect(paymentsFromEnv(env({ STRIPE_SECRET_KEY: "sk_test_abc123", STRIPE_WEBHOOK_SECRET: "whsec_abc" }))).toEqual({ secretKey: "sk_test_abc123", webhookSecret: "whsec_abc", apiBase: null });
    expect(paymentsFromEnv(env({ STRIPE_SECRET_KEY: FAKE_KEY, STRIPE_WEBHOOK_SECRET: "whsec_abc", STRIPE_API_BASE: "http://127.0.0.1:12111" }))).toEqual({
      secretKey: FAKE_KEY,
      webhookSecret: "whsec_abc",
      apiBase: "http://127.0.0.1:12111",
    });
    expect(paymentsFromEnv(env({ NODE_ENV: "production", STRIPE_SECRET_KEY: "sk_live_abc123", STRIPE_WEBHOOK_SECRET: "whsec_abc" }))).toMatchObject({ apiBase: null });
  });

  it("refuses to start production on the fake's key or a fake's address", () => {
    expect(() => paymentsFromEnv(env({ NODE_ENV: "production", STRIPE_SECRET_KEY: FAKE_KEY, STRIPE_WEBHOOK_SECRET: "whsec_abc" }))).toThrow(/STRIPE_SECRET_KEY is the local Stripe fake's key/);
    expect(() => paymentsFromEnv(env({ NODE_ENV: "production", STRIPE_SECRET_KEY: "sk_live_abc123", STRIPE_WEBHOOK_SECRET: "whsec_abc", STRIPE_API_BASE: "http://127.0.0.1:12111" }))).toThrow(/STRIPE_API_BASE/);
  });

  it("names the missing or malformed variable", () => {
    expect(() => paymentsFromEnv(env({ STRIPE_SECRET_KEY: "sk_test_abc123" }))).toThrow(/STRIPE_WEBHOOK_SECRET is not set/);
    expect(() => paymentsFromEnv(env({ STRIPE_API_BASE: "http://127.0.0.1:12111" }))).toThrow(/STRIPE_API_BASE is set without STRIPE_SECRET_KEY/);
    expect(() => env({ STRIPE_SECRET_KEY: "pk_test_publishable" })).toThrow(/STRIPE_SECRET_KEY: must look like sk_live_… or sk_test_…/);
    expect(() => env({ STRIPE_WEBHOOK_SECRET: "secret" })).toThrow(/STRIPE_WEBHOOK_SECRET: must look like whsec_…/);
  });
});
