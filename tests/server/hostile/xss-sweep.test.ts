// One sweep: markup planted in every text field a person can type (company, owner, client, job,
// system and its points, loads and runs, limit profile, price items, the estimate's manual line,
// quote terms, the send message, the client's accept name and decline reason, the name on the
// payment page), then every place the server shows it: the e-mails' HTML (quote, answers, receipt,
// deposit notice, invitation, password reset) escaped, the Stripe fake's HTML page escaped, and the
// PDFs (quote, client's quote, cut list, receipts) printing it literally. Fields that take only
// e-mail addresses, SKUs or a fixed reason refuse markup instead (400 naming the field).
import { execFileSync } from "node:child_process";
import { mkdtempSync, readdirSync, readFileSync, rmSync, statSync, writeFileSync } from "node:fs";
import os from "node:os";
import { fileURLToPath } from "node:url";
import path from "node:path";
import { beforeAll, describe, expect, inject, it } from "vitest";
import { signUpCompany, uniqueEmail, TEST_PASSWORD } from "../../support/accounts.js";
import { ApiClient } from "../../support/api.js";
import { useTestApp } from "../../support/app.js";
import { exampleSystem } from "../../support/jobs.js";
import { linkIn, mailsTo, waitForMail, type CaughtMail } from "../../support/mail.js";
import { CABIN_PRICES } from "../../support/quotes.js";
import { CARDS, eventually } from "../../support/stripe.js";

const SCRIPT = "<script>alert(1)</script>";
const ATTRIBUTE = '"><img src=x onerror=alert(1)>';
/** Both payloads, behind a tag that says which field it was typed into. */
const hostile = (tag: string) => `${tag} ${SCRIPT} ${ATTRIBUTE}`;
/** For fields of at most 40 characters (phone numbers). */
const short = (tag: string) => `${tag}${ATTRIBUTE}`;

/** What our templates and the Stripe fake's page print for a text (& < > " ' as entities). */
const escaped = (text: string) => text.replace(/[&<>"']/g, (c) => ({ "&": "&amp;", "<": "&lt;", ">": "&gt;", '"': "&quot;", "'": "&#39;" })[c] as string);
const squash = (text: string) => text.replace(/\s+/g, "");

/** A PDF's text in content order (pdftotext -raw), so a wrapped cell's lines stay together. */
function pdfRawText(pdf: Buffer): string {
  const dir = mkdtempSync(path.join(os.tmpdir(), "runwright-xss-"));
  try {
    writeFileSync(path.join(dir, "doc.pdf"), pdf);
    return execFileSync("/usr/bin/pdftotext", ["-raw", "-enc", "UTF-8", path.join(dir, "doc.pdf"), "-"], { encoding: "utf8" });
  } finally {
    rmSync(dir, { recursive: true, force: true });
  }
}

async function htmlOf(mail: CaughtMail): Promise<string> {
  if (mail.html) return mail.html;
  const message = await fetch(`http://127.0.0.1:${inject("mailCatcher").webPort}/api/email/${mail.id}`).then((r) => r.json());
  return (message as { html?: string }).html ?? "";
}

/** No markup from a payload survives in the HTML, and every listed field is there, escaped. */
function expectEscaped(html: string, values: string[], where: string) {
  expect(html.length, where).toBeGreaterThan(200);
  expect(html, `${where}: a <script> element`).not.toMatch(/<script/i);
  expect(html, `${where}: an <img> element`).not.toMatch(/<img/i);
  expect(html, `${where}: an onerror attribute outside text`).not.toMatch(/\sonerror=(?!alert\(1\)&gt;)/);
  expect(html, `${where}: a payload as it was typed`).not.toContain(SCRIPT);
  expect(html, `${where}: a payload as it was typed`).not.toContain(ATTRIBUTE);
  for (const value of values) expect(html, `${where}: ${value.slice(0, 12)}`).toContain(escaped(value));
}

function expectPrinted(text: string, values: string[], where: string) {
  const flat = squash(text);
  for (const value of values) expect(flat, `${where}: ${value.slice(0, 12)}`).toContain(squash(value));
}

describe("hostile text in every field: escaped in every HTML the server makes, literal in every PDF", () => {
  const t = useTestApp();

  // Every planted value, by the field it went into.
  const V = {
    companyName: hostile("CoN"),
    ownerName: hostile("OwN"),
    licence: hostile("Lic"),
    companyPhone: short("CoP"),
    companyAddress: hostile("CoA"),
    terms: hostile("Tms"),
    quoteTerms: hostile("QTm"),
    clientName: hostile("ClN"),
    clientPhone: short("ClP"),
    billingAddress: hostile("ClA"),
    clientNotes: hostile("ClX"),
    jobTitle: hostile("JbT"),
    siteAddress: hostile("JbS"),
    jobNotes: hostile("JbX"),
    declinedJobTitle: hostile("J2T"),
    systemName: hostile("SyN"),
    profileName: hostile("LpN"),
    profileNotes: hostile("LpX"),
    manualLine: hostile("Man"),
    message: hostile("Msg"),
    acceptName: hostile("Acc"),
    declineReason: hostile("Dec"),
    payerName: hostile("Pay"),
  };
  const priceDescription = (i: number) => hostile(`Pr${i}`);
  const pointName = (i: number) => hostile(`Pt${i}`);
  const loadName = (i: number) => hostile(`Ld${i}`);
  const runName = (i: number) => hostile(`Rn${i}`);

  let owner: { api: ApiClient; email: string };
  let clientEmail: string;
  let document: ReturnType<typeof exampleSystem>;
  let quoteId: string;
  let token: string;
  let declinedToken: string;
  let declinedQuoteId: string;
  const inviteeEmail = uniqueEmail("xss-invitee");
  let jobId: string;
  let paymentId: string;
  let payUrl: string;
  const pages: Record<string, string> = {};

  beforeAll(async () => {
    const api = new ApiClient(t.app.app);
    const email = uniqueEmail("xss-owner");
    const signedUp = await api.post("/api/auth/sign-up", { companyName: V.companyName, name: V.ownerName, email, password: TEST_PASSWORD });
    expect(signedUp.status, JSON.stringify(signedUp.body)).toBe(201);
    owner = { api, email };
    const ok = (response: { status: number; body: unknown }, status = 200) => expect(response.status, JSON.stringify(response.body).slice(0, 400)).toBe(status);

    ok(await api.patch("/api/company", { licenceNumber: V.licence, phone: V.companyPhone, address: V.companyAddress, contactEmail: "office@xss.test", labourRateMinor: 9000 }));
    ok(await api.patch("/api/company/estimating", { quoteTerms: V.terms }));
    for (const [i, item] of CABIN_PRICES.entries()) ok(await api.post("/api/price-list", { ...item, description: priceDescription(i) }), 201);
    const profile = await api.post("/api/limit-profiles", { name: V.profileName, notes: V.profileNotes, branchPercent: 3, totalPercent: 5, criticalPercent: 3 });
    ok(profile, 201);
    clientEmail = uniqueEmail("xss-client");
    const client = await api.post("/api/clients", { name: V.clientName, email: clientEmail, phone: V.clientPhone, billingAddress: V.billingAddress, notes: V.clientNotes });
    ok(client, 201);
    const job = await api.post("/api/jobs", { clientId: client.body.id, title: V.jobTitle, siteAddress: V.siteAddress, notes: V.jobNotes });
    ok(job, 201);
    jobId = job.body.id;
    document = exampleSystem("cabin-24v");
    document.points = document.points.map((p, i) => ({ ...p, name: pointName(i) }));
    document.loads = document.loads.map((l, i) => ({ ...l, name: loadName(i) }));
    document.runs = document.runs.map((r, i) => ({ ...r, name: runName(i) }));
    ok(await api.post(`/api/jobs/${jobId}/systems`, { name: V.systemName, limitProfileId: profile.body.id, document }), 201);

    const built = await api.post(`/api/jobs/${jobId}/estimate/generate`);
    ok(built);
    ok(await api.put(`/api/jobs/${jobId}/estimate`, { version: built.body.version, manual: [{ category: "other", description: V.manualLine, quantity: 1, unit: "each", unitCostMinor: 500, markupPercent: null }] }));
    const quote = await api.post(`/api/jobs/${jobId}/quotes`, { terms: V.quoteTerms });
    ok(quote, 201);
    quoteId = quote.body.id;
    ok(await api.post(`/api/quotes/${quoteId}/send`, { to: clientEmail, message: V.message }));
    token = linkIn(await waitForMail(clientEmail), `${t.app.url}/q/`).split("/q/")[1];

    // A second job of the same client, quoted and declined with a reason.
    const job2 = await api.post("/api/jobs", { clientId: client.body.id, title: V.declinedJobTitle });
    ok(job2, 201);
    ok(await api.post(`/api/jobs/${job2.body.id}/systems`, { name: "Plain", document: exampleSystem("cabin-24v") }), 201);
    ok(await api.post(`/api/jobs/${job2.body.id}/estimate/generate`));
    const quote2 = await api.post(`/api/jobs/${job2.body.id}/quotes`, {});
    ok(quote2, 201);
    declinedQuoteId = quote2.body.id;
    ok(await api.post(`/api/quotes/${quote2.body.id}/send`, { to: clientEmail }));
    declinedToken = linkIn(await waitForMail(clientEmail, 2), `${t.app.url}/q/`).split("/q/")[1];

    const visitor = new ApiClient(t.app.app);
    ok(await visitor.post(`/api/quote-links/${declinedToken}/decline`, { reason: V.declineReason }));
    ok(await visitor.post(`/api/quote-links/${token}/accept`, { name: V.acceptName, agree: true }));

    // The deposit on the fake's page: a declined card first (the page shows what was typed again), then a good one.
    const checkout = await visitor.post(`/api/quote-links/${token}/deposit`);
    ok(checkout);
    payUrl = checkout.body.url;
    const page = await fetch(payUrl);
    expect(page.status).toBe(200);
    pages.payment = await page.text();
    const form = (card: string) =>
      fetch(payUrl, {
        method: "POST",
        redirect: "manual",
        headers: { "Content-Type": "application/x-www-form-urlencoded" },
        body: new URLSearchParams({ email: `x${ATTRIBUTE.replace(/ /g, "/")}@xss.test`, cardNumber: card, expiry: "12 / 39", cvc: "123", name: V.payerName }).toString(),
      });
    const declined = await form(CARDS.declined);
    expect(declined.status).toBe(402);
    pages.declined = await declined.text();
    const unknownCard = await form("1234 5678");
    expect(unknownCard.status).toBe(400);
    pages.invalid = await unknownCard.text();
    expect((await form(CARDS.success)).status).toBe(303);
    const done = await fetch(payUrl);
    pages.complete = await done.text();
    paymentId = await eventually(async () => {
      const [payment] = (await api.get(`/api/jobs/${jobId}/payments`)).body.items as Array<{ id: string; receiptSentAt: string | null }>;
      return payment?.receiptSentAt ? payment.id : undefined;
    });

    ok(await api.post("/api/invitations", { email: inviteeEmail, role: "installer" }), 201);
    expect((await new ApiClient(t.app.app).post("/api/auth/forgot-password", { email })).status).toBe(202);
  }, 120_000);

  describe("e-mails' HTML", () => {
    it("the quote e-mail: company, client, job, message and sender escaped", async () => {
      const mails = await mailsTo(clientEmail);
      const quoteMail = mails.find((m) => m.text.includes("Msg "));
      expect(quoteMail).toBeDefined();
      expectEscaped(await htmlOf(quoteMail!), [V.companyName, V.clientName, V.jobTitle, V.message, V.ownerName], "quote e-mail");
      // The plain-text part says it as it was typed.
      expect(quoteMail!.text).toContain(V.message);
    });

    it("the answers to the estimator: accepted (client, name given) and declined (reason) escaped", async () => {
      const mails = await mailsTo(owner.email);
      const accepted = mails.find((m) => / accepted by /.test(m.subject));
      const declined = mails.find((m) => / declined by /.test(m.subject));
      expect(accepted && declined).toBeTruthy();
      expectEscaped(await htmlOf(accepted!), [V.companyName, V.clientName, V.jobTitle, V.acceptName], "accepted notice");
      expectEscaped(await htmlOf(declined!), [V.companyName, V.clientName, V.declinedJobTitle, V.declineReason], "declined notice");
    });

    it("the receipt to the client and the deposit notice to the estimator escaped", async () => {
      const receipt = await waitForMail(clientEmail, 3);
      expect(receipt.subject).toMatch(/^Receipt /);
      expectEscaped(await htmlOf(receipt), [V.companyName, V.clientName, V.jobTitle, V.companyPhone], "receipt e-mail");
      const notice = await eventually(async () => (await mailsTo(owner.email)).find((m) => /^Deposit paid/.test(m.subject)));
      expectEscaped(await htmlOf(notice), [V.companyName, V.clientName, V.jobTitle], "deposit notice");
    });

    it("the invitation and the password reset: company and person escaped", async () => {
      const invitation = await waitForMail(inviteeEmail);
      expect(invitation.subject).toMatch(/^You're invited/);
      expectEscaped(await htmlOf(invitation), [V.companyName, V.ownerName], "invitation");
      const reset = await eventually(async () => (await mailsTo(owner.email)).find((m) => m.subject.startsWith("Set a new Runwright password")));
      expectEscaped(await htmlOf(reset), [V.companyName, V.ownerName], "password reset");
    });
  });

  describe("the Stripe fake's pages (ours too)", () => {
    it("the payment page escapes the job's title in the order and the client's e-mail", () => {
      expectEscaped(pages.payment, [V.jobTitle, clientEmail], "payment page");
    });

    it("a declined or refused card shows what was typed again, escaped", () => {
      expectEscaped(pages.declined, [V.payerName, `x${ATTRIBUTE.replace(/ /g, "/")}@xss.test`], "declined page");
      expectEscaped(pages.invalid, [V.payerName], "invalid card page");
      expect(pages.complete).toMatch(/This payment is complete/);
      expectEscaped(pages.complete, [], "complete page");
    });
  });

  describe("PDFs print it literally", () => {
    const quoteValues = () => [
      V.companyName,
      V.licence,
      V.companyPhone,
      V.companyAddress,
      V.clientName,
      V.clientPhone,
      V.billingAddress,
      V.jobTitle,
      V.siteAddress,
      V.systemName,
      V.profileName,
      V.manualLine,
      V.quoteTerms,
      ...CABIN_PRICES.map((_, i) => priceDescription(i)),
      ...document.loads.map((_, i) => loadName(i)),
      ...document.runs.map((_, i) => runName(i)),
    ];

    it("the quote, from the company and from the client's link", async () => {
      for (const [where, response] of [
        ["staff quote PDF", await owner.api.get(`/api/quotes/${quoteId}/pdf`)],
        ["client's quote PDF", await new ApiClient(t.app.app).get(`/api/quote-links/${token}/pdf`)],
      ] as const) {
        expect(response.status, where).toBe(200);
        expectPrinted(pdfRawText(Buffer.from(response.body)), quoteValues(), where);
      }
    });

    it("the declined quote: the company's own terms and the second job's title", async () => {
      const response = await owner.api.get(`/api/quotes/${declinedQuoteId}/pdf`);
      expect(response.status).toBe(200);
      expectPrinted(pdfRawText(Buffer.from(response.body)), [V.terms, V.declinedJobTitle, V.companyName], "declined quote PDF");
    });

    it("the cut list: job, client, site, system and the points at both ends of every run", async () => {
      const response = await owner.api.get(`/api/jobs/${jobId}/cut-list.pdf`);
      expect(response.status).toBe(200);
      const pointsOnRuns = [...new Set(document.runs.flatMap((r) => [r.from, r.to]))].map((id) => pointName(document.points.findIndex((p) => p.id === id)));
      expectPrinted(pdfRawText(Buffer.from(response.body)), [V.jobTitle, V.clientName, V.siteAddress, V.systemName, ...pointsOnRuns], "cut list");
    });

    it("the receipt, for the company and for the client", async () => {
      for (const [where, response] of [
        ["staff receipt", await owner.api.get(`/api/payments/${paymentId}/receipt.pdf`)],
        ["client's receipt", await new ApiClient(t.app.app).get(`/api/quote-links/${token}/receipt.pdf`)],
      ] as const) {
        expect(response.status, where).toBe(200);
        expectPrinted(pdfRawText(Buffer.from(response.body)), [V.companyName, V.payerName, V.clientName, V.billingAddress, V.jobTitle, V.siteAddress], where);
      }
    });
  });

  describe("fields that hold only addresses, SKUs or a fixed choice refuse markup, naming the field", () => {
    const BAD_EMAIL = `x"><img src=x onerror=alert(1)>@xss.test`;
    it("e-mail addresses: company contact, client, invitation, quote recipient, sign-up and reset", async () => {
      const { api } = await signUpCompany(t.app);
      const client = await api.post("/api/clients", { name: "Plain" });
      const cases: Array<[Promise<{ status: number; body: { error: { details: { fields: Record<string, string> } } } }>, string]> = [
        [api.patch("/api/company", { contactEmail: BAD_EMAIL }), "contactEmail"],
        [api.post("/api/clients", { name: "C", email: BAD_EMAIL }), "email"],
        [api.patch(`/api/clients/${client.body.id}`, { email: `<script>@xss.test` }), "email"],
        [api.post("/api/invitations", { email: BAD_EMAIL, role: "installer" }), "email"],
        [api.post(`/api/quotes/${quoteId}/send`, { to: BAD_EMAIL }), "to"],
        [new ApiClient(t.app.app).post("/api/auth/sign-up", { companyName: "C", name: "N", email: BAD_EMAIL, password: TEST_PASSWORD }), "email"],
        [new ApiClient(t.app.app).post("/api/auth/forgot-password", { email: BAD_EMAIL }), "email"],
      ];
      for (const [request, field] of cases) {
        const response = await request;
        expect(response.status, field).toBe(400);
        expect(Object.keys(response.body.error.details.fields), field).toContain(field);
      }
    });

    it("a SKU, a refund reason and a price category", async () => {
      const { api } = await signUpCompany(t.app);
      const sku = await api.post("/api/price-list", { sku: SCRIPT, description: "x", category: "other", unit: "each", unitCostMinor: 1 });
      expect(sku.status).toBe(400);
      expect(sku.body.error.details.fields).toHaveProperty("sku");
      const category = await api.post("/api/price-list", { sku: "OK-1", description: "x", category: SCRIPT, unit: "each", unitCostMinor: 1 });
      expect(category.body.error.details.fields).toHaveProperty("category");
      const refund = await owner.api.post(`/api/payments/${paymentId}/refunds`, { amountMinor: 100, reason: ATTRIBUTE });
      expect(refund.status).toBe(400);
      expect(refund.body.error.details.fields).toHaveProperty("reason");
    });
  });

  describe("JSON answers carrying the text are never read as HTML", () => {
    it("answer as application/json with nosniff, and the client renders them without raw-HTML sinks", async () => {
      const detail = await owner.api.get(`/api/quotes/${quoteId}`);
      expect(detail.headers["content-type"]).toMatch(/^application\/json/);
      expect(detail.headers["x-content-type-options"]).toBe("nosniff");
      expect(detail.text).toContain(JSON.stringify(V.clientName).slice(1, -1));
      // The React client escapes what it renders; nothing in it writes HTML from a string.
      const root = fileURLToPath(new URL("../../../src", import.meta.url));
      const files: string[] = [];
      const walk = (dir: string) => {
        for (const name of readdirSync(dir)) {
          const full = path.join(dir, name);
          if (statSync(full).isDirectory()) walk(full);
          else if (/\.(tsx?|jsx?)$/.test(name)) files.push(full);
        }
      };
      walk(root);
      expect(files.length).toBeGreaterThan(20);
      const sinks = /dangerouslySetInnerHTML|\.innerHTML\b|\.outerHTML\b|insertAdjacentHTML|document\.write|\beval\(|new Function\(|srcDoc|srcdoc/;
      const found = files.filter((file) => sinks.test(readFileSync(file, "utf8"))).map((file) => path.relative(root, file));
      expect(found).toEqual([]);
    });
  });
});
