import { randomInt } from "node:crypto";

// In-memory state of the stand-in. Every secret key is its own account; nothing is shared between accounts
// except the index that lets the (unauthenticated) payment page find a session by its id.

export type Metadata = Record<string, string>;

export interface CheckoutSession {
  id: string;
  object: "checkout.session";
  amount_subtotal: number;
  amount_total: number;
  currency: string;
  mode: "payment";
  status: "open" | "complete" | "expired";
  payment_status: "unpaid" | "paid";
  payment_intent: string | null;
  client_reference_id: string | null;
  metadata: Metadata;
  customer_email: string | null;
  customer_details: { email: string | null; name: string | null } | null;
  success_url: string;
  cancel_url: string;
  url: string | null;
  /** Unix seconds. */
  created: number;
  /** Unix seconds. */
  expires_at: number;
  livemode: false;
}

export interface LineItem {
  name: string;
  /** Minor units. */
  unitAmount: number;
  quantity: number;
  currency: string;
}

export interface SessionRecord {
  session: CheckoutSession;
  /** Not part of the session object (the real API only shows them when expanded); the payment page lists them. */
  lineItems: LineItem[];
  paymentIntentMetadata: Metadata;
}

export interface PaymentIntent {
  id: string;
  object: "payment_intent";
  amount: number;
  amount_received: number;
  currency: string;
  status: "succeeded";
  latest_charge: string;
  metadata: Metadata;
  created: number;
  livemode: false;
}

export interface Charge {
  id: string;
  object: "charge";
  amount: number;
  amount_refunded: number;
  refunded: boolean;
  currency: string;
  payment_intent: string;
  paid: true;
  status: "succeeded";
  created: number;
}

export type RefundReason = "duplicate" | "fraudulent" | "requested_by_customer";

export interface Refund {
  id: string;
  object: "refund";
  amount: number;
  currency: string;
  payment_intent: string;
  charge: string;
  status: "succeeded";
  reason: RefundReason | null;
  metadata: Metadata;
  created: number;
}

export interface StripeEvent {
  id: string;
  object: "event";
  api_version: string;
  created: number;
  data: { object: unknown };
  livemode: false;
  pending_webhooks: number;
  request: { id: null; idempotency_key: null };
  type: string;
}

export interface DeliveryAttempt {
  /** ISO 8601 time the attempt started. */
  at: string;
  url: string;
  status?: number;
  error?: string;
}

export interface EventRecord {
  event: StripeEvent;
  attempts: DeliveryAttempt[];
}

export interface WebhookEndpoint {
  id: string;
  url: string;
  secret: string;
}

export type DeliveryMode = "immediate" | "hold";

export interface AccountSettings {
  delivery: DeliveryMode;
  /** null: the delays the stand-in was started with. */
  retryDelaysMs: number[] | null;
}

/** A stored answer to a POST that carried an Idempotency-Key. */
export interface StoredResponse {
  fingerprint: string;
  status: number;
  body: string;
}

export interface Account {
  key: string;
  sessions: Map<string, SessionRecord>;
  paymentIntents: Map<string, PaymentIntent>;
  charges: Map<string, Charge>;
  /** Refund ids per charge id, oldest first. */
  chargeRefunds: Map<string, string[]>;
  refunds: Map<string, Refund>;
  events: EventRecord[];
  endpoints: Map<string, WebhookEndpoint>;
  settings: AccountSettings;
  idempotency: Map<string, StoredResponse>;
}

export class Store {
  private readonly accounts = new Map<string, Account>();
  private readonly sessionOwners = new Map<string, Account>();

  /** The account of a secret key, created on first use. */
  account(key: string): Account {
    let account = this.accounts.get(key);
    if (!account) {
      account = {
        key,
        sessions: new Map(),
        paymentIntents: new Map(),
        charges: new Map(),
        chargeRefunds: new Map(),
        refunds: new Map(),
        events: [],
        endpoints: new Map(),
        settings: { delivery: "immediate", retryDelaysMs: null },
        idempotency: new Map(),
      };
      this.accounts.set(key, account);
    }
    return account;
  }

  addSession(account: Account, record: SessionRecord): void {
    account.sessions.set(record.session.id, record);
    this.sessionOwners.set(record.session.id, account);
  }

  /** For the payment page, which has no key: session ids are random, so the id alone finds its account. */
  findSessionOwner(sessionId: string): Account | undefined {
    return this.sessionOwners.get(sessionId);
  }
}

const ALPHANUMERIC = "ABCDEFGHIJKLMNOPQRSTUVWXYZabcdefghijklmnopqrstuvwxyz0123456789";

/** prefix + `length` random letters and digits, e.g. randomId("cs_test_") → "cs_test_a1B2…". */
export function randomId(prefix: string, length = 24): string {
  let id = prefix;
  for (let i = 0; i < length; i++) id += ALPHANUMERIC[randomInt(ALPHANUMERIC.length)];
  return id;
}

/** Unix seconds. */
export function nowSeconds(): number {
  return Math.floor(Date.now() / 1000);
}

/** JSON with object keys sorted at every level, so equal parameters give equal text whatever their order. */
export function stableStringify(value: unknown): string {
  if (Array.isArray(value)) return `[${value.map(stableStringify).join(",")}]`;
  if (value !== null && typeof value === "object") {
    const entries = Object.keys(value)
      .sort()
      .map((key) => `${JSON.stringify(key)}:${stableStringify((value as Record<string, unknown>)[key])}`);
    return `{${entries.join(",")}}`;
  }
  return JSON.stringify(value) ?? "null";
}
