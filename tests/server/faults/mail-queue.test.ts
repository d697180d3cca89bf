// The mail server goes down while a quote is sent: the quote says "send pending", the queued job
// retries with back-off against a real SMTP port that refuses, and the e-mail goes out once when the
// server is back; with the attempts used up, the quote says why it was not sent.
import { afterAll, beforeAll, describe, expect, inject, it, vi } from "vitest";
import type { DataSource } from "typeorm";
import { Quote } from "../../../server/db/entities/index.js";
import { createMailer } from "../../../server/mail/mailer.js";
import { findFreePort } from "../../../server/scripts/port-check.js";
import { signUpCompany, uniqueEmail } from "../../support/accounts.js";
import { startTestApp, type TestApp } from "../../support/app.js";
import { createJobWork } from "../../support/jobs.js";
import { mailsTo, waitForMail } from "../../support/mail.js";
import { CABIN_PRICES, createQuoteWork } from "../../support/quotes.js";
import { ApiClient } from "../../support/api.js";
import { CARDS, payOnPage } from "../../support/stripe.js";
import { tcpRelay, type Relay } from "../../support/relay.js";
import { openTestDb } from "../../support/test-db.js";

/** What an SMTP server that is up but not taking mail says before hanging up (RFC 5321 §4.2.3). */
const SERVICE_NOT_AVAILABLE = "421 mail.test Service not available, closing transmission channel\r\n";

async function draftQuote(api: ApiClient): Promise<string> {
  const work = await createJobWork(api);
  for (const item of CABIN_PRICES) expect((await api.post("/api/price-list", item)).status).toBe(201);
  expect((await api.post(`/api/jobs/${work.jobId}/estimate/generate`)).status).toBe(200);
  const quote = await api.post(`/api/jobs/${work.jobId}/quotes`, {});
  expect(quote.status, JSON.stringify(quote.body)).toBe(201);
  return quote.body.id;
}

describe("a quote sent while the mail server is down", () => {
  let db: DataSource;
  let relay: Relay;
  let app: TestApp;

  beforeAll(async () => {
    db = await openTestDb();
    relay = tcpRelay(await findFreePort(), inject("mailCatcher").smtpPort);
    // The app's mail goes through the relay to the run's catcher; retries after about 1, 2, 4 s.
    app = await startTestApp(db, { mailer: createMailer({ host: "127.0.0.1", port: relay.port, from: "Runwright tests <no-reply@runwright.test>" }), jobRetry: { retryLimit: 3, retryDelay: 1 } });
  });
  afterAll(async () => {
    await app?.close();
    await relay?.cut();
    await db?.destroy();
  });

  it("says 'send pending', retries with growing gaps, and sends exactly once when the server is back", async () => {
    const owner = await signUpCompany(app);
    const quoteId = await draftQuote(owner.api);
    const to = uniqueEmail("pending-client");
    await relay.refuse(SERVICE_NOT_AVAILABLE);

    const pending = await owner.api.post(`/api/quotes/${quoteId}/send`, { to });
    expect(pending.status).toBe(202);
    expect(pending.body.status).toBe("draft");
    expect(pending.body.sendPendingSince).not.toBeNull();
    expect(pending.body.sendError).toMatch(/421|Service not available/);
    expect(relay.connections).toHaveLength(1);

    // Three queued attempts fail against the refusing server. The first is queued to start after the
    // retry delay (1 s; pg-boss's clock works to about half a second); then pg-boss's back-off waits
    // delay × 2^n / 2 plus up to as much again at random, so the gaps grow: the third is at least 2 s.
    await vi.waitFor(async () => expect(relay.connections.length).toBeGreaterThanOrEqual(4), { timeout: 30_000, interval: 100 });
    const gaps = relay.connections.slice(1, 4).map((t, i) => t - relay.connections[i]);
    expect(gaps[0], `gaps ${gaps.join(", ")} ms`).toBeGreaterThanOrEqual(500);
    expect(gaps[2], `gaps ${gaps.join(", ")} ms`).toBeGreaterThanOrEqual(2000);
    expect(gaps[2], `gaps ${gaps.join(", ")} ms`).toBeGreaterThan(gaps[0]);
    const during = await owner.api.get(`/api/quotes/${quoteId}`);
    expect(during.body.status).toBe("draft");
    expect(during.body.sendPendingSince).not.toBeNull();
    expect(during.body.sendError).toMatch(/attempt \d/);
    expect(await mailsTo(to)).toHaveLength(0);

    // The server comes back: the next attempt goes through, once.
    await relay.open();
    await vi.waitFor(async () => expect((await owner.api.get(`/api/quotes/${quoteId}`)).body.status).toBe("sent"), { timeout: 20_000, interval: 100 });
    const sent = await owner.api.get(`/api/quotes/${quoteId}`);
    expect(sent.body).toMatchObject({ status: "sent", sentTo: to, sendError: null, sendPendingSince: null, linkActive: true });
    expect(sent.body.events.map((e: { type: string }) => e.type)).toEqual(["created", "send_pending", "sent"]);
    const mail = await waitForMail(to);
    expect(mail.subject).toContain((await db.getRepository(Quote).findOneByOrFail({ id: quoteId })).number);
    // Nothing else is queued for it: a while later there is still one e-mail.
    await new Promise((resolve) => setTimeout(resolve, 1500));
    expect(await mailsTo(to)).toHaveLength(1);
  });

  it("gives up after the last attempt: no longer pending, the error and a send_failed event; Send again works", async () => {
    const quick = await startTestApp(db, { mailer: createMailer({ host: "127.0.0.1", port: relay.port, from: "Runwright tests <no-reply@runwright.test>" }), jobRetry: { retryLimit: 1, retryDelay: 1 } });
    try {
      const owner = await signUpCompany(quick);
      const quoteId = await draftQuote(owner.api);
      const to = uniqueEmail("given-up");
      await relay.cut(); // connection refused
      expect((await owner.api.post(`/api/quotes/${quoteId}/send`, { to })).status).toBe(202);
      await vi.waitFor(async () => expect((await owner.api.get(`/api/quotes/${quoteId}`)).body.sendPendingSince).toBeNull(), { timeout: 20_000, interval: 100 });
      const failed = await owner.api.get(`/api/quotes/${quoteId}`);
      expect(failed.body.status).toBe("draft");
      expect(failed.body.sendError).toMatch(/after 3 attempts/);
      expect(failed.body.events.map((e: { type: string }) => e.type)).toEqual(["created", "send_pending", "send_failed"]);
      expect(await mailsTo(to)).toHaveLength(0);

      await relay.open();
      const again = await owner.api.post(`/api/quotes/${quoteId}/send`, { to });
      expect(again.status).toBe(200);
      expect(again.body.status).toBe("sent");
      await waitForMail(to);
    } finally {
      await quick.close();
    }
  });

  it("a deposit receipt the mail server refused is sent later by its queued job, once", async () => {
    const owner = await signUpCompany(app);
    await relay.open();
    const work = await createJobWork(owner.api);
    const q = await createQuoteWork(owner.api, work.jobId, app.url);
    const client = new ApiClient(app.app);
    expect((await client.post(`/api/quote-links/${q.token}/accept`, { name: "Receipt Client", agree: true })).status).toBe(200);
    await relay.refuse(SERVICE_NOT_AVAILABLE);
    const checkout = await client.post(`/api/quote-links/${q.token}/deposit`);
    expect(checkout.status).toBe(200);
    expect((await payOnPage(checkout.body.url, CARDS.success)).status).toBe(303);
    // Recorded at once; the receipt failed and says why.
    const [failed] = await vi.waitFor(
      async () => {
        const items = (await owner.api.get(`/api/jobs/${work.jobId}/payments`)).body.items as Array<{ status: string; receiptSentAt: string | null; receiptError: string | null }>;
        expect(items[0]?.receiptError).toMatch(/421|Service not available/);
        return items;
      },
      { timeout: 10_000, interval: 100 },
    );
    expect(failed.status).toBe("paid");
    expect(failed.receiptSentAt).toBeNull();
    await relay.open();
    await vi.waitFor(async () => expect((await owner.api.get(`/api/jobs/${work.jobId}/payments`)).body.items[0].receiptSentAt).not.toBeNull(), { timeout: 20_000, interval: 200 });
    const receipts = async () => (await mailsTo(q.clientEmail)).filter((m) => /receipt/i.test(m.subject));
    await vi.waitFor(async () => expect(await receipts()).toHaveLength(1), { timeout: 5_000, interval: 100 });
    await new Promise((resolve) => setTimeout(resolve, 2000));
    expect(await receipts()).toHaveLength(1);
    expect((await owner.api.get(`/api/jobs/${work.jobId}/payments`)).body.items[0].receiptError).toBeNull();
  });
});
