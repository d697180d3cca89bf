import express, { type Express, type NextFunction, type Request, type RequestHandler, type Response } from "express";
import { checkCardForm, MESSAGES, readCardForm } from "./cards.js";
import { invalidApiKey, invalidParam, resourceMissing, StripeFakeError } from "./errors.js";
import { API_VERSION, type EventHub } from "./events.js";
import {
  createCheckoutSession,
  createRefund,
  expireCheckoutSession,
  expireIfDue,
  getPaymentIntent,
  getRefund,
  getSessionRecord,
  paySession,
  presentCharge,
  type FakeContext,
} from "./operations.js";
import { asParams, currencyCode, httpUrl, optionalPositiveInteger, optionalString, requiredString, type Params } from "./params.js";
import {
  renderCompletePage,
  renderExpiredPage,
  renderNotFoundPage,
  renderPaymentPage,
  successUrlOf,
} from "./payment-page.js";
import { randomId, stableStringify, type Account, type DeliveryMode, type Store } from "./store.js";

/** The longest Idempotency-Key accepted (characters). */
const MAX_IDEMPOTENCY_KEY = 255;
/** Bounds of PUT /_fake/settings retryDelaysMs. */
const MAX_RETRY_STEPS = 20;
const MAX_RETRY_DELAY_MS = 24 * 60 * 60 * 1000;

interface Answer {
  status?: number;
  body: unknown;
}

/** The Express app of the stand-in: /v1 (form bodies, the SDK), /pay (the test page), /_fake (JSON control). */
export function createStripeFakeApp(store: Store, hub: EventHub, baseUrl: () => string): Express {
  const ctx: FakeContext = { store, hub, baseUrl };
  const app = express();
  app.disable("x-powered-by");
  app.disable("etag");

  app.get("/_fake/health", (_req, res) => {
    res.json({ ok: true });
  });

  app.use("/v1", express.urlencoded({ extended: true, limit: "1mb" }), authenticate(store), (_req, res, next) => {
    res.set("Request-Id", randomId("req_", 14));
    res.set("Stripe-Version", API_VERSION);
    next();
  });
  app.use("/v1", apiRoutes(ctx));
  app.use("/v1", (req, _res, next) => {
    next(new StripeFakeError(404, "invalid_request_error", `Unrecognized request URL (${req.method}: ${req.originalUrl.split("?")[0]}).`));
  });

  app.use("/pay", express.urlencoded({ extended: false, limit: "64kb" }), pageRoutes(ctx));

  app.use("/_fake", express.json({ limit: "1mb" }), authenticate(store), controlRoutes(ctx));
  app.use("/_fake", (req, _res, next) => {
    next(new StripeFakeError(404, "invalid_request_error", `Unrecognized control URL (${req.method}: ${req.originalUrl.split("?")[0]}).`));
  });

  app.use(errorHandler);
  return app;
}

/** Bearer sk_test_… → res.locals.account; anything else is 401. */
function authenticate(store: Store): RequestHandler {
  return (req, res, next) => {
    const match = /^Bearer\s+(\S+)\s*$/i.exec(req.get("Authorization") ?? "");
    const key = match?.[1];
    if (!key || !key.startsWith("sk_test_") || key.length <= "sk_test_".length) {
      next(invalidApiKey());
      return;
    }
    res.locals.account = store.account(key);
    next();
  };
}

function accountOf(res: Response): Account {
  return res.locals.account as Account;
}

function apiRoutes(ctx: FakeContext) {
  const router = express.Router();

  router.post(
    "/checkout/sessions",
    idempotent((req, account) => ({ body: createCheckoutSession(ctx, account, asParams(req.body)) })),
  );
  router.get("/checkout/sessions/:id", (req, res) => {
    res.json(getSessionRecord(ctx, accountOf(res), req.params.id as string).session);
  });
  router.post(
    "/checkout/sessions/:id/expire",
    idempotent((req, account) => ({ body: expireCheckoutSession(ctx, account, req.params.id as string, asParams(req.body)) })),
  );
  router.get("/payment_intents/:id", (req, res) => {
    res.json(getPaymentIntent(accountOf(res), req.params.id as string));
  });
  router.get("/charges/:id", (req, res) => {
    res.json(presentCharge(accountOf(res), req.params.id as string));
  });
  router.post(
    "/refunds",
    idempotent((req, account) => ({ body: createRefund(ctx, account, asParams(req.body)) })),
  );
  router.get("/refunds/:id", (req, res) => {
    res.json(getRefund(accountOf(res), req.params.id as string));
  });
  return router;
}

/**
 * Idempotency-Key handling for a POST. Check, run and store happen in one synchronous stretch (the handler
 * must not await), so concurrent requests with one key create one object. Only successful answers are stored:
 * a request that failed validation may be sent again with the same key, as with the real API.
 */
function idempotent(handler: (req: Request, account: Account) => Answer): RequestHandler {
  return (req, res) => {
    const account = accountOf(res);
    const key = req.get("Idempotency-Key");
    if (key === undefined || key === "") {
      sendAnswer(res, handler(req, account));
      return;
    }
    if (key.length > MAX_IDEMPOTENCY_KEY) {
      throw invalidParam("Idempotency-Key", `Idempotency-Key must be at most ${MAX_IDEMPOTENCY_KEY} characters.`);
    }
    const fingerprint = `${req.method} ${req.baseUrl}${req.path} ${stableStringify(req.body ?? {})}`;
    const stored = account.idempotency.get(key);
    res.set("Idempotency-Key", key);
    if (stored) {
      if (stored.fingerprint !== fingerprint) {
        throw new StripeFakeError(
          400,
          "idempotency_error",
          `The Idempotency-Key '${key}' was first used with other parameters or another endpoint; use a new key for a different request.`,
        );
      }
      res.status(stored.status).set("Idempotent-Replayed", "true").type("application/json").send(stored.body);
      return;
    }
    const answer = handler(req, account);
    const status = answer.status ?? 200;
    const body = JSON.stringify(answer.body);
    account.idempotency.set(key, { fingerprint, status, body });
    res.status(status).type("application/json").send(body);
  };
}

function sendAnswer(res: Response, answer: Answer): void {
  res.status(answer.status ?? 200).json(answer.body);
}

function pageRoutes(ctx: FakeContext) {
  const router = express.Router();

  /** The session for the page, or the page to show instead (404, complete, expired) when it cannot be paid. */
  const openSession = (res: Response, id: string) => {
    const account = ctx.store.findSessionOwner(id);
    const record = account?.sessions.get(id);
    res.set("Cache-Control", "no-store");
    res.set("Content-Security-Policy", "default-src 'none'; style-src 'unsafe-inline'; base-uri 'none'; frame-ancestors 'none'");
    res.set("Referrer-Policy", "no-referrer");
    if (!account || !record) {
      res.status(404).type("html").send(renderNotFoundPage());
      return undefined;
    }
    expireIfDue(ctx, account, record);
    if (record.session.status === "complete") {
      res.status(200).type("html").send(renderCompletePage(record));
      return undefined;
    }
    if (record.session.status === "expired") {
      res.status(410).type("html").send(renderExpiredPage(record));
      return undefined;
    }
    return { account, record };
  };

  router.get("/:sessionId", (req, res) => {
    const found = openSession(res, req.params.sessionId as string);
    if (found) res.status(200).type("html").send(renderPaymentPage(found.record));
  });

  router.post("/:sessionId", (req, res) => {
    const found = openSession(res, req.params.sessionId as string);
    if (!found) return;
    const { account, record } = found;
    const form = readCardForm(req.body);
    const { cardNumber: _typedNumber, ...kept } = form;
    const fieldErrors = checkCardForm(form);
    if (Object.keys(fieldErrors).length > 0) {
      res.status(400).type("html").send(renderPaymentPage(record, { values: kept, fieldErrors }));
      return;
    }
    const { outcome } = paySession(ctx, account, record, { card: form.cardNumber, email: form.email.trim(), name: form.name.trim() });
    if (outcome === "succeeded") {
      res.redirect(303, successUrlOf(record));
      return;
    }
    res.status(402).type("html").send(renderPaymentPage(record, { values: kept, message: MESSAGES[outcome] }));
  });
  return router;
}

function controlRoutes(ctx: FakeContext) {
  const router = express.Router();

  router.post("/webhook-endpoints", (req, res) => {
    const account = accountOf(res);
    const params = asParams(req.body);
    const url = httpUrl(params.url, "url");
    const secret = requiredString(params.secret, "secret", 500);
    const existing = account.endpoints.get(url);
    const endpoint = { id: existing?.id ?? randomId("we_"), url, secret };
    account.endpoints.set(url, endpoint);
    res.status(201).json({ id: endpoint.id, url });
  });

  router.get("/webhook-endpoints", (_req, res) => {
    const endpoints = [...accountOf(res).endpoints.values()].map(({ id, url }) => ({ id, url }));
    res.json({ data: endpoints });
  });

  router.put("/settings", (req, res) => {
    const account = accountOf(res);
    const params = asParams(req.body);
    const delivery = params.delivery;
    if (delivery !== undefined && delivery !== "immediate" && delivery !== "hold") {
      throw invalidParam("delivery", 'delivery must be "immediate" or "hold".');
    }
    const delays = params.retryDelaysMs;
    if (delays !== undefined) {
      const valid =
        Array.isArray(delays) &&
        delays.length <= MAX_RETRY_STEPS &&
        delays.every((delay) => typeof delay === "number" && Number.isFinite(delay) && delay >= 0 && delay <= MAX_RETRY_DELAY_MS);
      if (!valid) {
        throw invalidParam("retryDelaysMs", `retryDelaysMs must be a list of at most ${MAX_RETRY_STEPS} delays in ms (0 to one day).`);
      }
      account.settings.retryDelaysMs = [...(delays as number[])];
    }
    if (delivery !== undefined) account.settings.delivery = delivery as DeliveryMode;
    res.json({ delivery: account.settings.delivery, retryDelaysMs: ctx.hub.retryDelaysFor(account) });
  });

  router.get("/events", (req, res) => {
    const type = typeof req.query.type === "string" ? req.query.type : undefined;
    const data = accountOf(res)
      .events.filter((record) => type === undefined || record.event.type === type)
      .map((record) => ({
        id: record.event.id,
        type: record.event.type,
        created: record.event.created,
        event: record.event,
        attempts: record.attempts,
      }));
    res.json({ data });
  });

  router.post("/events/:id/deliver", async (req, res) => {
    const account = accountOf(res);
    const id = req.params.id as string;
    const record = account.events.find((candidate) => candidate.event.id === id);
    if (!record) throw resourceMissing("event", id);
    const results = await ctx.hub.deliverNow(account, record);
    res.json({ results });
  });

  router.get("/checkout/sessions", (_req, res) => {
    const account = accountOf(res);
    const data = [...account.sessions.values()].map((record) => {
      expireIfDue(ctx, account, record);
      return record.session;
    });
    res.json({ data });
  });

  router.post("/checkout/sessions/:id/pay", (req, res) => {
    const account = accountOf(res);
    const params: Params = asParams(req.body);
    const record = getSessionRecord(ctx, account, req.params.id as string);
    const card = requiredString(params.card, "card", 64);
    const amountTotal = optionalPositiveInteger(params.amountTotal, "amountTotal");
    const currency = params.currency === undefined ? undefined : currencyCode(params.currency, "currency");
    const email = optionalString(params.email, "email", 800);
    const name = optionalString(params.name, "name", 200);
    const result = paySession(ctx, account, record, { card, amountTotal, currency, email, name });
    res.json(result);
  });

  return router;
}

/** Every failure in the `{ error: { type, message, param?, code? } }` shape. */
function errorHandler(error: unknown, _req: Request, res: Response, next: NextFunction): void {
  if (res.headersSent) {
    next(error);
    return;
  }
  if (error instanceof StripeFakeError) {
    res.status(error.status).json(error.toBody());
    return;
  }
  const status = (error as { status?: unknown }).status;
  if (typeof status === "number" && status >= 400 && status < 500) {
    // Body parser failures: bad JSON, an oversize body, an unsupported charset.
    const message = error instanceof Error ? error.message : "The request could not be read.";
    res.status(status).json({ error: { type: "invalid_request_error", message } });
    return;
  }
  console.error("stripe fake: unexpected error", error);
  res.status(500).json({ error: { type: "api_error", message: "The Stripe stand-in failed unexpectedly; see its log." } });
}
