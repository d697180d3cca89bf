// Estimates and quotes through the API: building the estimate from the layout (quantities worked
// out by hand from shared/engine/examples/cabin-24v.json), saving it with optimistic locking,
// regenerating, quote numbers and revisions, sending (once; a failure leaves a draft), the client's
// link (revoked, expired, superseded, forged), accepting and declining, the PDFs, and the dashboard.
import { randomUUID } from "node:crypto";
import { describe, expect, it } from "vitest";
import { addMember, signUpCompany, TEST_PASSWORD, uniqueEmail, type SignedInOwner } from "../../support/accounts.js";
import { ApiClient } from "../../support/api.js";
import { startTestApp, useTestApp } from "../../support/app.js";
import { createJobWork, exampleSystem } from "../../support/jobs.js";
import { linkIn, mailsTo, waitForMail, type CaughtMail } from "../../support/mail.js";
import { CABIN_PRICES } from "../../support/quotes.js";

const YEAR = new Date().toISOString().slice(0, 4);
const COMPANY_CONTACT = { contactEmail: "office@sparks.test", phone: "+1 555 0100" };

/** A company with its contact details, a labour rate and the cabin's prices. */
async function pricedCompany(app: Parameters<typeof signUpCompany>[0], settings: Record<string, unknown> = {}): Promise<SignedInOwner> {
  const owner = await signUpCompany(app);
  const patched = await owner.api.patch("/api/company", { ...COMPANY_CONTACT, labourRateMinor: 9500, ...settings });
  expect(patched.status, JSON.stringify(patched.body)).toBe(200);
  for (const item of CABIN_PRICES) {
    const created = await owner.api.post("/api/price-list", item);
    expect(created.status, JSON.stringify(created.body)).toBe(201);
  }
  return owner;
}

/** A client, a job and the cabin system. */
async function cabinJob(api: ApiClient, clientName = "Tamsin Fairweather", clientEmail: string = uniqueEmail("client")): Promise<{ jobId: string; systemId: string; clientEmail: string }> {
  const client = await api.post("/api/clients", { name: clientName, email: clientEmail });
  expect(client.status, JSON.stringify(client.body)).toBe(201);
  const job = await api.post("/api/jobs", { clientId: client.body.id, title: "Cabin off-grid", siteAddress: "Lot 7" });
  expect(job.status, JSON.stringify(job.body)).toBe(201);
  const system = await api.post(`/api/jobs/${job.body.id}/systems`, { name: "Cabin system", document: exampleSystem("cabin-24v") });
  expect(system.status, JSON.stringify(system.body)).toBe(201);
  return { jobId: job.body.id, systemId: system.body.id, clientEmail };
}

/** Builds the estimate and makes a draft quote. */
async function draftQuote(api: ApiClient, jobId: string): Promise<{ id: string; label: string }> {
  const estimate = await api.post(`/api/jobs/${jobId}/estimate/generate`);
  expect(estimate.status, JSON.stringify(estimate.body)).toBe(200);
  const quote = await api.post(`/api/jobs/${jobId}/quotes`, {});
  expect(quote.status, JSON.stringify(quote.body)).toBe(201);
  return { id: quote.body.id, label: quote.body.label };
}

/** Sends a quote and reads the client's link from the e-mail. */
async function send(api: ApiClient, quoteId: string, to: string, baseUrl: string): Promise<{ token: string; mail: CaughtMail }> {
  const before = (await mailsTo(to)).length;
  const sent = await api.post(`/api/quotes/${quoteId}/send`, { to });
  expect(sent.status, JSON.stringify(sent.body)).toBe(200);
  expect(sent.body.status).toBe("sent");
  const mail = await waitForMail(to, before + 1);
  const link = linkIn(mail, `${baseUrl}/q/`);
  return { token: link.slice(link.lastIndexOf("/") + 1), mail };
}

type Line = { key: string; quantity: number; costMinor: number; sellMinor: number; overridden: boolean };
const lineOf = (lines: Line[], key: string) => {
  const line = lines.find((l) => l.key === key);
  expect(line, `no line ${key} among ${lines.map((l) => l.key).join(", ")}`).toBeDefined();
  return line as Line;
};
const generatedOf = (estimate: { generated: Array<{ key: string; quantity: number }> }, key: string) => estimate.generated.find((l) => l.key === key)?.quantity;

describe("estimates and quotes", () => {
  const t = useTestApp();

  describe("the estimate", () => {
    it("is 204 (nothing built yet) before it is built, then lists the cabin's lines with the quantities worked out by hand", async () => {
      const owner = await pricedCompany(t.app, { defaultMarkupPercent: 20, taxRatePercent: 8.875 });
      const { jobId } = await cabinJob(owner.api);
      const none = await owner.api.get(`/api/jobs/${jobId}/estimate`);
      expect(none.status).toBe(204);
      expect(none.text).toBe("");
      // a quote needs an estimate
      const early = await owner.api.post(`/api/jobs/${jobId}/quotes`, {});
      expect(early.status).toBe(422);

      const built = await owner.api.post(`/api/jobs/${jobId}/estimate/generate`);
      expect(built.status, JSON.stringify(built.body)).toBe(200);
      const e = built.body;
      expect(e.findings.filter((f: { severity: string }) => f.severity === "error")).toEqual([]);
      expect(e.settings).toMatchObject({ markupPercent: 20, taxRatePercent: 8.875, wastePercent: 10, depositMode: "percent", depositPercent: 30 });
      const q = Object.fromEntries(e.lines.map((l: Line) => [l.key, l.quantity]));
      expect(q).toEqual({
        // feed-shed 8 m + shed-pump 22 m + feed-cabin 6 m = 36 m one-way; 2 conductors × 36 × 1.10 = 79.2 → 80 m
        "cable:copper:16 mm2": 80,
        // cabin-studio 18 m; 2 × 18 × 1.10 = 39.6 → 40 m
        "cable:copper:2.5 mm2": 40,
        "termination:16 mm2": 12, // 3 runs × 4 ends
        "termination:2.5 mm2": 4,
        "fuse:60": 1,
        "fuse:80": 1,
        "fuse-holder": 2,
        // 4 runs × 20 min + 54 m × 1 min + 16 terminations × 4 min = 198 min = 3.3 h → 3.5 h
        labour: 3.5,
      });
      // 16 mm²: 80 m × $4.60 = $368.00 cost, × 1.20 = $441.60
      expect(lineOf(e.lines, "cable:copper:16 mm2")).toMatchObject({ costMinor: 36800, sellMinor: 44160 });
      // labour 3.5 h × $95.00 = $332.50, at cost
      expect(lineOf(e.lines, "labour")).toMatchObject({ costMinor: 33250, sellMinor: 33250 });
      // sell: 44,160 + 4,080 + 1,728 + 576 + 2,220 + 2,220 + 3,540 + 33,250 = 91,774; cost 82,020
      // tax 8.875 % × 91,774 = 8,144.94 → 8,145; total 99,919; deposit 30 % = 29,975.7 → 29,976
      expect(e.totals).toEqual({ costMinor: 82020, subtotalMinor: 91774, discountMinor: 0, taxableMinor: 91774, taxRatePercent: 8.875, taxMinor: 8145, totalMinor: 99919, depositMinor: 29976, marginMinor: 9754 });
      expect((await owner.api.get(`/api/jobs/${jobId}/estimate`)).body.totals.totalMinor).toBe(99919);
    });

    it("reports missing prices with what to add, and will not quote until they are priced", async () => {
      const owner = await signUpCompany(t.app);
      expect((await owner.api.post("/api/price-list", CABIN_PRICES[0])).status).toBe(201); // 16 mm² cable only
      const { jobId } = await cabinJob(owner.api);
      const built = await owner.api.post(`/api/jobs/${jobId}/estimate/generate`);
      expect(built.status).toBe(200);
      const missing = built.body.findings.filter((f: { code: string }) => f.code === "MISSING_PRICE");
      expect(missing.map((f: { need: unknown }) => f.need)).toEqual(
        expect.arrayContaining([
          expect.objectContaining({ category: "cable", cableSize: "2.5 mm2", cableMaterial: "copper" }),
          expect.objectContaining({ category: "termination", cableSize: "16 mm2" }),
          expect.objectContaining({ category: "fuse", ratingA: 60 }),
          expect.objectContaining({ category: "fuse", ratingA: 80 }),
          expect.objectContaining({ category: "fuse", ratingA: null }),
        ]),
      );
      expect(missing.every((f: { severity: string }) => f.severity === "error")).toBe(true);
      // no zero lines for what is missing
      expect(built.body.lines.map((l: Line) => l.key).sort()).toEqual(["cable:copper:16 mm2", "labour"]);
      // the labour rate is 0: a warning, not a silent free line
      expect(built.body.findings.map((f: { code: string }) => f.code)).toContain("NO_LABOUR_RATE");

      const quote = await owner.api.post(`/api/jobs/${jobId}/quotes`, {});
      expect(quote.status).toBe(422);
      expect(quote.body.error.code).toBe("unprocessable");
      expect((await owner.api.get(`/api/jobs/${jobId}/quotes`)).body.items).toEqual([]);
    });

    it("saves manual lines, overrides and settings (stale version → 409), and a rebuild keeps them and lists what changed", async () => {
      const owner = await pricedCompany(t.app);
      const { jobId, systemId } = await cabinJob(owner.api);
      const built = await owner.api.post(`/api/jobs/${jobId}/estimate/generate`);
      expect(built.status).toBe(200);
      const version = built.body.version;

      const saved = await owner.api.put(`/api/jobs/${jobId}/estimate`, {
        version,
        markupPercent: 10,
        discountMinor: 1000,
        taxRatePercent: 10,
        depositMode: "fixed",
        depositFixedMinor: 50000,
        manual: [{ category: "other", description: "Trenching", quantity: 2, unit: "hour", unitCostMinor: 6000 }],
        overrides: { "cable:copper:16 mm2": { quantity: 100 } },
      });
      expect(saved.status, JSON.stringify(saved.body)).toBe(200);
      expect(saved.body.version).toBeGreaterThan(version);
      const e = saved.body;
      // 16 mm²: 100 m (override) × 460 = 46,000 × 1.1 = 50,600
      expect(lineOf(e.lines, "cable:copper:16 mm2")).toMatchObject({ quantity: 100, costMinor: 46000, sellMinor: 50600, overridden: true });
      // Trenching: 2 h × 6,000 = 12,000 × 1.1 = 13,200
      const trench = e.lines.find((l: Line & { source: string }) => l.source === "manual");
      expect(trench).toMatchObject({ description: "Trenching", costMinor: 12000, sellMinor: 13200 });
      // 50,600 + 3,740 + 1,584 + 528 + 2,035 + 2,035 + 3,245 + 33,250 (labour at cost) + 13,200 = 110,217
      // − 1,000 discount = 109,217; tax 10 % = 10,921.7 → 10,922; total 120,139; deposit fixed 50,000
      expect(e.totals).toMatchObject({ subtotalMinor: 110217, discountMinor: 1000, taxableMinor: 109217, taxMinor: 10922, totalMinor: 120139, depositMinor: 50000 });

      const stale = await owner.api.put(`/api/jobs/${jobId}/estimate`, { version, markupPercent: 50 });
      expect(stale.status).toBe(409);
      expect(stale.body.error.code).toBe("conflict");
      expect((await owner.api.get(`/api/jobs/${jobId}/estimate`)).body.settings.markupPercent).toBe(10);

      // the shed-pump run grows from 22 m to 32 m
      const system = await owner.api.get(`/api/systems/${systemId}`);
      expect(system.status).toBe(200);
      const document = structuredClone(system.body.document);
      const run = document.runs.find((r: { id: string }) => r.id === "shed-pump");
      expect(run.length).toBe(22);
      run.length = 32;
      const put = await owner.api.put(`/api/systems/${systemId}`, { version: system.body.version, document });
      expect(put.status, JSON.stringify(put.body)).toBe(200);
      const outdated = await owner.api.get(`/api/jobs/${jobId}/estimate`);
      // the estimate says it is behind the layout
      expect(outdated.body.findings.map((f: { message: string }) => f.message).join(" ")).toMatch(/changed after this estimate was built/);

      const rebuilt = await owner.api.post(`/api/jobs/${jobId}/estimate/generate`);
      expect(rebuilt.status, JSON.stringify(rebuilt.body)).toBe(200);
      const r = rebuilt.body;
      // 16 mm²: 8 + 32 + 6 = 46 m one-way; 2 × 46 × 1.1 = 101.2 → 102 m
      expect(generatedOf(r, "cable:copper:16 mm2")).toBe(102);
      // labour: 80 + 64 m + 64 = 208 min = 3.47 h → 3.5 h: unchanged
      expect(generatedOf(r, "labour")).toBe(3.5);
      expect(r.lastChanges).toEqual([{ key: "cable:copper:16 mm2", description: "Copper cable 16 mm²", change: "changed", before: { quantity: 80, unitCostMinor: 460 }, after: { quantity: 102, unitCostMinor: 460 } }]);
      // the estimator's override, manual line and settings stay
      expect(r.overrides).toEqual({ "cable:copper:16 mm2": { quantity: 100 } });
      expect(lineOf(r.lines, "cable:copper:16 mm2")).toMatchObject({ quantity: 100, overridden: true });
      expect(r.manual).toEqual([expect.objectContaining({ description: "Trenching", quantity: 2, unitCostMinor: 6000 })]);
      expect(r.settings).toMatchObject({ markupPercent: 10, discountMinor: 1000, taxRatePercent: 10, depositMode: "fixed", depositFixedMinor: 50000 });
      expect(r.totals.totalMinor).toBe(120139);
      expect(r.findings.map((f: { message: string }) => f.message).join(" ")).not.toMatch(/changed after this estimate was built/);
      // the version moved on: the one read before the rebuild is stale
      expect((await owner.api.put(`/api/jobs/${jobId}/estimate`, { version: saved.body.version, markupPercent: 50 })).status).toBe(409);
    });

    it("prices the loads the contractor supplies as device lines, and drops them when no longer supplied", async () => {
      const owner = await pricedCompany(t.app);
      const { jobId, systemId } = await cabinJob(owner.api);
      const fridge = await owner.api.post("/api/price-list", { sku: "DEV-FRIDGE", description: "DC fridge 90 W", category: "device", unit: "each", unitCostMinor: 89000 });
      expect(fridge.status).toBe(201);
      const built = await owner.api.post(`/api/jobs/${jobId}/estimate/generate`);
      expect(built.body.loads.map((l: { loadId: string }) => l.loadId)).toEqual(["well-pump", "fridge", "cabin-lights", "studio-lights"]);

      const supplied = await owner.api.put(`/api/jobs/${jobId}/estimate`, { version: built.body.version, supplied: [{ systemId, loadId: "fridge", priceItemId: fridge.body.id }] });
      expect(supplied.status, JSON.stringify(supplied.body)).toBe(200);
      // one fridge at $890.00 (the company's markup is 0 %)
      expect(lineOf(supplied.body.lines, `device:${fridge.body.id}`)).toMatchObject({ quantity: 1, costMinor: 89000, sellMinor: 89000 });
      expect(supplied.body.totals.subtotalMinor).toBe(built.body.totals.subtotalMinor + 89000);

      // a system of another job is not this estimate's
      const other = await cabinJob(owner.api);
      const stray = await owner.api.put(`/api/jobs/${jobId}/estimate`, { version: supplied.body.version, supplied: [{ systemId: other.systemId, loadId: "fridge", priceItemId: fridge.body.id }] });
      expect(stray.status).toBe(404);

      const none = await owner.api.put(`/api/jobs/${jobId}/estimate`, { version: supplied.body.version, supplied: [] });
      expect(none.status).toBe(200);
      expect(none.body.lines.some((l: Line) => l.key.startsWith("device:"))).toBe(false);
      expect(none.body.totals.subtotalMinor).toBe(built.body.totals.subtotalMinor);
    });

    it("lets an Installer read the estimate but not build or change it", async () => {
      const owner = await pricedCompany(t.app);
      const { jobId } = await cabinJob(owner.api);
      const built = await owner.api.post(`/api/jobs/${jobId}/estimate/generate`);
      const installer = await addMember(t.db, t.app, owner.companyId, "installer");
      expect((await installer.api.get(`/api/jobs/${jobId}/estimate`)).status).toBe(200);
      expect((await installer.api.post(`/api/jobs/${jobId}/estimate/generate`)).status).toBe(403);
      expect((await installer.api.put(`/api/jobs/${jobId}/estimate`, { version: built.body.version, markupPercent: 50 })).status).toBe(403);
      expect((await installer.api.post(`/api/jobs/${jobId}/quotes`, {})).status).toBe(403);
    });
  });

  describe("quotes", () => {
    it("numbers quotes per company (Q-YYYY-0001, then 0002) and refreshes an unsent draft in place", async () => {
      const owner = await pricedCompany(t.app);
      const first = await cabinJob(owner.api);
      const second = await cabinJob(owner.api);
      const q1 = await draftQuote(owner.api, first.jobId);
      expect(q1.label).toBe(`Q-${YEAR}-0001 R1`);
      const again = await owner.api.post(`/api/jobs/${first.jobId}/quotes`, {});
      expect(again.status).toBe(201);
      expect(again.body.id).toBe(q1.id);
      expect(again.body.label).toBe(`Q-${YEAR}-0001 R1`);
      const past = await owner.api.post(`/api/jobs/${first.jobId}/quotes`, { validUntil: "2000-01-01" });
      expect(past.status).toBe(400);
      expect(past.body.error.details.fields).toHaveProperty("validUntil");
      const q2 = await draftQuote(owner.api, second.jobId);
      expect(q2.label).toBe(`Q-${YEAR}-0002 R1`);
      // another company starts at 0001
      const other = await pricedCompany(t.app);
      const job = await cabinJob(other.api);
      expect((await draftQuote(other.api, job.jobId)).label).toBe(`Q-${YEAR}-0001 R1`);
      // the draft froze the estimate's totals
      const detail = await owner.api.get(`/api/quotes/${q1.id}`);
      const estimate = await owner.api.get(`/api/jobs/${first.jobId}/estimate`);
      expect(detail.body.totalMinor).toBe(estimate.body.totals.totalMinor);
      expect(detail.body.snapshot.totals).toEqual(estimate.body.totals);
      expect(detail.body.status).toBe("draft");
      expect(detail.body.linkActive).toBe(false);
    });

    it("sends once: a second send is answered with the sent quote and no second e-mail", async () => {
      const owner = await pricedCompany(t.app);
      const job = await cabinJob(owner.api);
      const q = await draftQuote(owner.api, job.jobId);
      const { mail } = await send(owner.api, q.id, job.clientEmail, t.app.url);
      expect(mail.subject).toContain(`Q-${YEAR}-0001 R1`);
      const twice = await owner.api.post(`/api/quotes/${q.id}/send`, { to: job.clientEmail });
      expect(twice.status).toBe(200);
      expect(twice.body.status).toBe("sent");
      await new Promise((resolve) => setTimeout(resolve, 300));
      expect(await mailsTo(job.clientEmail)).toHaveLength(1);
      const detail = await owner.api.get(`/api/quotes/${q.id}`);
      expect(detail.body.events.filter((e: { type: string }) => e.type === "sent")).toHaveLength(1);
      expect(detail.body).toMatchObject({ sentTo: job.clientEmail, sentBy: "Olive Owner", linkActive: true });
      expect((await owner.api.get(`/api/jobs/${job.jobId}`)).body.status).toBe("quoted");
    });

    it("a new revision sent after R1 supersedes it: R1's link answers 410 superseded", async () => {
      const owner = await pricedCompany(t.app);
      const job = await cabinJob(owner.api);
      const r1 = await draftQuote(owner.api, job.jobId);
      const { token: token1 } = await send(owner.api, r1.id, job.clientEmail, t.app.url);
      const client = new ApiClient(t.app.app);
      expect((await client.get(`/api/quote-links/${token1}`)).status).toBe(200);

      const r2 = await owner.api.post(`/api/jobs/${job.jobId}/quotes`, {});
      expect(r2.status, JSON.stringify(r2.body)).toBe(201);
      expect(r2.body.id).not.toBe(r1.id);
      expect(r2.body.label).toBe(`Q-${YEAR}-0001 R2`);
      const { token: token2 } = await send(owner.api, r2.body.id, job.clientEmail, t.app.url);

      const old = await client.get(`/api/quote-links/${token1}`);
      expect(old.status).toBe(410);
      expect(old.body.error.code).toBe("gone");
      expect(old.body.error.details).toMatchObject({ reason: "superseded", contactEmail: COMPANY_CONTACT.contactEmail, phone: COMPANY_CONTACT.phone });
      expect((await client.post(`/api/quote-links/${token1}/accept`, { name: "Tamsin", agree: true })).status).toBe(410);
      const current = await client.get(`/api/quote-links/${token2}`);
      expect(current.status).toBe(200);
      expect(current.body.label).toBe(`Q-${YEAR}-0001 R2`);

      const list = await owner.api.get(`/api/jobs/${job.jobId}/quotes`);
      expect(list.body.items.map((i: { label: string; superseded: boolean }) => [i.label, i.superseded])).toEqual([
        [`Q-${YEAR}-0001 R2`, false],
        [`Q-${YEAR}-0001 R1`, true],
      ]);
      // R1 cannot be sent again or given a new link
      expect((await owner.api.post(`/api/quotes/${r1.id}/link`)).status).toBe(409);
    });

    it("a draft revision cannot replace a quote the client accepted meanwhile", async () => {
      const owner = await pricedCompany(t.app);
      const job = await cabinJob(owner.api);
      const r1 = await draftQuote(owner.api, job.jobId);
      const { token } = await send(owner.api, r1.id, job.clientEmail, t.app.url);
      // the estimator starts R2 …
      const r2 = await owner.api.post(`/api/jobs/${job.jobId}/quotes`, {});
      expect(r2.status).toBe(201);
      // … while the client accepts R1
      const client = new ApiClient(t.app.app);
      expect((await client.post(`/api/quote-links/${token}/accept`, { name: "Tamsin Fairweather", agree: true })).status).toBe(200);
      const sendR2 = await owner.api.post(`/api/quotes/${r2.body.id}/send`, { to: job.clientEmail });
      expect(sendR2.status).toBe(409);
      const accepted = await owner.api.get(`/api/quotes/${r1.id}`);
      expect(accepted.body).toMatchObject({ status: "accepted", superseded: false });
      expect((await client.get(`/api/quote-links/${token}`)).status).toBe(200);
      expect((await owner.api.get(`/api/jobs/${job.jobId}`)).body.status).toBe("won");
    });

    const refusingMailer = {
      send: async () => {
        throw new Error("connection refused");
      },
      close() {},
    } as never;

    it("a send the mail server refuses answers 202 'send pending': a draft with the error and a queued retry; Send again sends it", async () => {
      const failing = await startTestApp(t.db, { mailer: refusingMailer });
      try {
        const owner = await pricedCompany(failing);
        const job = await cabinJob(owner.api);
        const q = await draftQuote(owner.api, job.jobId);
        const pending = await owner.api.post(`/api/quotes/${q.id}/send`, { to: job.clientEmail });
        expect(pending.status).toBe(202);
        expect(pending.body).toMatchObject({ status: "draft", sentAt: null, linkActive: false });
        expect(pending.body.sendPendingSince).not.toBeNull();
        expect(pending.body.sendError).toContain("connection refused");
        expect(pending.body.events.map((e: { type: string }) => e.type)).toEqual(["created", "send_pending"]);
        expect((await owner.api.get(`/api/jobs/${job.jobId}`)).body.status).toBe("lead");
        // Pressing Send again while pending tries again at once and queues nothing more.
        const again = await owner.api.post(`/api/quotes/${q.id}/send`, { to: job.clientEmail });
        expect(again.status).toBe(202);
        expect(again.body.events.map((e: { type: string }) => e.type)).toEqual(["created", "send_pending"]);

        // the same person through the app with a working mailer
        const retry = new ApiClient(t.app.app);
        expect((await retry.post("/api/auth/sign-in", { email: owner.email, password: TEST_PASSWORD })).status).toBe(200);
        await send(retry, q.id, job.clientEmail, t.app.url);
        const after = await retry.get(`/api/quotes/${q.id}`);
        expect(after.body).toMatchObject({ status: "sent", sendError: null, sendPendingSince: null });
      } finally {
        await failing.close();
      }
    });

    it("without a job queue, a refused send answers 502 mail_failed and leaves a draft with the error", async () => {
      const failing = await startTestApp(t.db, { mailer: refusingMailer, jobs: null });
      try {
        const owner = await pricedCompany(failing);
        const job = await cabinJob(owner.api);
        const q = await draftQuote(owner.api, job.jobId);
        const failed = await owner.api.post(`/api/quotes/${q.id}/send`, { to: job.clientEmail });
        expect(failed.status).toBe(502);
        expect(failed.body.error.code).toBe("mail_failed");
        expect(failed.body.error.message).toContain("connection refused");
        const detail = await owner.api.get(`/api/quotes/${q.id}`);
        expect(detail.body).toMatchObject({ status: "draft", sentAt: null, linkActive: false, sendPendingSince: null });
        expect(detail.body.sendError).toContain("connection refused");
        expect(detail.body.events.map((e: { type: string }) => e.type)).toEqual(["created", "send_failed"]);
      } finally {
        await failing.close();
      }
    });
  });

  describe("the client's link", () => {
    it("a revoked link answers 410 revoked with the company's contact; a new link works", async () => {
      const owner = await pricedCompany(t.app);
      const job = await cabinJob(owner.api);
      const q = await draftQuote(owner.api, job.jobId);
      expect((await owner.api.post(`/api/quotes/${q.id}/link`)).status).toBe(409); // a draft has no link
      const { token } = await send(owner.api, q.id, job.clientEmail, t.app.url);
      const client = new ApiClient(t.app.app);
      expect((await owner.api.delete(`/api/quotes/${q.id}/link`)).status).toBe(204);
      const gone = await client.get(`/api/quote-links/${token}`);
      expect(gone.status).toBe(410);
      const company = await owner.api.get("/api/company");
      expect(gone.body.error.details).toEqual({ reason: "revoked", companyName: company.body.name, contactEmail: COMPANY_CONTACT.contactEmail, phone: COMPANY_CONTACT.phone });
      expect((await client.get(`/api/quote-links/${token}/pdf`)).status).toBe(410);
      expect((await client.post(`/api/quote-links/${token}/accept`, { name: "Tamsin", agree: true })).status).toBe(410);
      expect((await owner.api.get(`/api/quotes/${q.id}`)).body.linkActive).toBe(false);

      const fresh = await owner.api.post(`/api/quotes/${q.id}/link`);
      expect(fresh.status).toBe(200);
      const freshToken = fresh.body.url.slice(fresh.body.url.lastIndexOf("/") + 1);
      expect(fresh.body.url).toBe(`${t.app.url}/q/${freshToken}`);
      expect((await client.get(`/api/quote-links/${freshToken}`)).status).toBe(200);
      const events = (await owner.api.get(`/api/quotes/${q.id}`)).body.events.map((e: { type: string }) => e.type);
      expect(events).toEqual(expect.arrayContaining(["link_revoked", "link_issued", "viewed"]));
    });

    it("a lapsed quote answers 410 expired and becomes expired", async () => {
      const owner = await pricedCompany(t.app);
      const job = await cabinJob(owner.api);
      const q = await draftQuote(owner.api, job.jobId);
      const { token } = await send(owner.api, q.id, job.clientEmail, t.app.url);
      await t.db.query(`UPDATE quote SET valid_until = current_date - 1 WHERE id = $1`, [q.id]);
      const client = new ApiClient(t.app.app);

      // answering is refused with the same explanation as opening
      const accept = await client.post(`/api/quote-links/${token}/accept`, { name: "Tamsin", agree: true });
      expect(accept.status).toBe(410);
      expect(accept.body.error.details).toMatchObject({ reason: "expired", contactEmail: COMPANY_CONTACT.contactEmail, phone: COMPANY_CONTACT.phone });

      const open = await client.get(`/api/quote-links/${token}`);
      expect(open.status).toBe(410);
      expect(open.body.error.details).toMatchObject({ reason: "expired", contactEmail: COMPANY_CONTACT.contactEmail });
      const detail = await owner.api.get(`/api/quotes/${q.id}`);
      expect(detail.body.status).toBe("expired");
      expect(detail.body.linkActive).toBe(false);
      expect(detail.body.events.map((e: { type: string }) => e.type)).toContain("expired");
      // opening again is still 410, and the quote expired once
      expect((await client.get(`/api/quote-links/${token}`)).status).toBe(410);
      expect((await owner.api.get(`/api/quotes/${q.id}`)).body.events.filter((e: { type: string }) => e.type === "expired")).toHaveLength(1);
    });

    it("a forged or unknown token is 404, not 410", async () => {
      const owner = await pricedCompany(t.app);
      const job = await cabinJob(owner.api);
      const q = await draftQuote(owner.api, job.jobId);
      const { token } = await send(owner.api, q.id, job.clientEmail, t.app.url);
      const [id, secret] = token.split(".");
      const forged = `${id}.${secret.slice(0, -4)}${secret.endsWith("AAAA") ? "BBBB" : "AAAA"}`;
      const client = new ApiClient(t.app.app);
      for (const bad of [forged, `${randomUUID()}.${secret}`, "not-a-token", `${id}`]) {
        const res = await client.get(`/api/quote-links/${encodeURIComponent(bad)}`);
        expect(res.status, bad).toBe(404);
        expect(res.body.error.details?.reason ?? "unknown").toBe("unknown");
        expect(res.body.error.details?.companyName ?? null).toBeNull();
      }
      expect((await client.post(`/api/quote-links/${forged}/accept`, { name: "Mallory", agree: true })).status).toBe(404);
      expect((await client.post(`/api/quote-links/${forged}/decline`, {})).status).toBe(404);
      // the forged attempts changed nothing
      expect((await owner.api.get(`/api/quotes/${q.id}`)).body.status).toBe("sent");
    });

    it("accepting needs the box ticked, records the name, IP and browser, and opens the cut list", async () => {
      const owner = await pricedCompany(t.app);
      const job = await cabinJob(owner.api);
      const q = await draftQuote(owner.api, job.jobId);
      const { token } = await send(owner.api, q.id, job.clientEmail, t.app.url);
      expect((await owner.api.get(`/api/jobs/${job.jobId}/cut-list.pdf`)).status).toBe(409);

      const client = new ApiClient(t.app.app, { "User-Agent": "QuoteTestBrowser/1.0 (hand-set)" });
      const noAgree = await client.post(`/api/quote-links/${token}/accept`, { name: "Tamsin Fairweather" });
      expect(noAgree.status).toBe(400);
      expect(noAgree.body.error.code).toBe("invalid_input");
      expect(noAgree.body.error.details.fields).toHaveProperty("agree");
      const falseAgree = await client.post(`/api/quote-links/${token}/accept`, { name: "Tamsin Fairweather", agree: false });
      expect(falseAgree.status).toBe(400);
      expect(falseAgree.body.error.details.fields).toHaveProperty("agree");
      expect((await owner.api.get(`/api/quotes/${q.id}`)).body.status).toBe("sent");

      const accepted = await client.post(`/api/quote-links/${token}/accept`, { name: "Tamsin Fairweather", agree: true });
      expect(accepted.status, JSON.stringify(accepted.body)).toBe(200);
      expect(accepted.body).toMatchObject({ state: "accepted", status: "accepted", acceptedName: "Tamsin Fairweather" });
      const detail = await owner.api.get(`/api/quotes/${q.id}`);
      expect(detail.body).toMatchObject({ status: "accepted", acceptedName: "Tamsin Fairweather", acceptedUserAgent: "QuoteTestBrowser/1.0 (hand-set)" });
      expect(detail.body.acceptedIp).toMatch(/127\.0\.0\.1|::1/);
      expect(detail.body.acceptedAt).not.toBeNull();
      expect((await owner.api.get(`/api/jobs/${job.jobId}`)).body.status).toBe("won");
      // the sender hears of it
      const note = await waitForMail(owner.email);
      expect(note.text).toContain("accepted");
      // declining afterwards is refused
      expect((await client.post(`/api/quote-links/${token}/decline`, { reason: "changed my mind" })).status).toBe(409);
      // no new revision replaces an accepted quote
      expect((await owner.api.post(`/api/jobs/${job.jobId}/quotes`, {})).status).toBe(409);

      const cut = await owner.api.get(`/api/jobs/${job.jobId}/cut-list.pdf`);
      expect(cut.status).toBe(200);
      expect(cut.headers["content-type"]).toBe("application/pdf");
    });

    it("declining with a reason loses the job and e-mails the estimator who sent it", async () => {
      const owner = await pricedCompany(t.app);
      const estimator = await addMember(t.db, t.app, owner.companyId, "estimator", "Esme Estimator");
      const job = await cabinJob(owner.api);
      const q = await draftQuote(estimator.api, job.jobId);
      const { token } = await send(estimator.api, q.id, job.clientEmail, t.app.url);
      const client = new ApiClient(t.app.app);
      const declined = await client.post(`/api/quote-links/${token}/decline`, { reason: "Found a cheaper installer" });
      expect(declined.status, JSON.stringify(declined.body)).toBe(200);
      expect(declined.body).toMatchObject({ state: "declined", status: "declined" });
      const detail = await owner.api.get(`/api/quotes/${q.id}`);
      expect(detail.body).toMatchObject({ status: "declined", declineReason: "Found a cheaper installer", sentBy: "Esme Estimator" });
      expect((await owner.api.get(`/api/jobs/${job.jobId}`)).body.status).toBe("lost");
      const mail = await waitForMail(estimator.email);
      expect(mail.text).toContain("declined");
      expect(mail.text).toContain("Found a cheaper installer");
      expect(await mailsTo(owner.email)).toHaveLength(0);
      expect((await client.post(`/api/quote-links/${token}/accept`, { name: "Tamsin", agree: true })).status).toBe(409);
    });

    it("serves the quote PDF to the company and to the client", async () => {
      const owner = await pricedCompany(t.app);
      const job = await cabinJob(owner.api);
      const q = await draftQuote(owner.api, job.jobId);
      const inline = await owner.api.get(`/api/quotes/${q.id}/pdf`);
      expect(inline.status).toBe(200);
      expect(inline.headers["content-type"]).toBe("application/pdf");
      expect(inline.headers["content-disposition"]).toMatch(/^inline/);
      expect(Buffer.from(inline.body).subarray(0, 5).toString("latin1")).toBe("%PDF-");
      const download = await owner.api.get(`/api/quotes/${q.id}/pdf?download=1`);
      expect(download.headers["content-disposition"]).toMatch(/^attachment; filename="Q-\d{4}-\d{4}-R1\.pdf"/);

      const { token } = await send(owner.api, q.id, job.clientEmail, t.app.url);
      const client = new ApiClient(t.app.app);
      const pdf = await client.get(`/api/quote-links/${token}/pdf`);
      expect(pdf.status).toBe(200);
      expect(pdf.headers["content-type"]).toBe("application/pdf");
      expect(Buffer.from(pdf.body).subarray(0, 5).toString("latin1")).toBe("%PDF-");
    });

    it("escapes hostile text in the e-mails' HTML", async () => {
      const owner = await pricedCompany(t.app);
      const hostile = "<script>alert(1)</script>";
      const job = await cabinJob(owner.api, hostile);
      const q = await draftQuote(owner.api, job.jobId);
      const { mail, token } = await send(owner.api, q.id, job.clientEmail, t.app.url);
      const html = mail.html || (await fetchHtml(mail.id));
      expect(html.length).toBeGreaterThan(0);
      expect(html).toContain("&lt;script&gt;alert(1)&lt;/script&gt;");
      expect(html).not.toContain("<script>");

      const client = new ApiClient(t.app.app);
      const reason = '<img src=x onerror="alert(2)">';
      expect((await client.post(`/api/quote-links/${token}/decline`, { reason })).status).toBe(200);
      const note = await waitForMail(owner.email);
      const noteHtml = note.html || (await fetchHtml(note.id));
      expect(noteHtml).toContain("&lt;img src=x onerror=&quot;alert(2)&quot;&gt;");
      expect(noteHtml).not.toContain("<img");
      expect(noteHtml).not.toContain("<script>");
    });
  });

  describe("the dashboard", () => {
    it("counts this month's quotes by status and lists those awaiting an answer for over a week", async () => {
      const owner = await pricedCompany(t.app);
      const a = await cabinJob(owner.api);
      const b = await cabinJob(owner.api);
      const c = await cabinJob(owner.api);
      const qa = await draftQuote(owner.api, a.jobId);
      const qb = await draftQuote(owner.api, b.jobId);
      await draftQuote(owner.api, c.jobId); // stays a draft
      await send(owner.api, qa.id, a.clientEmail, t.app.url);
      await send(owner.api, qb.id, b.clientEmail, t.app.url);
      await t.db.query(`UPDATE quote SET sent_at = now() - interval '8 days' WHERE id = $1`, [qa.id]);

      const dash = await owner.api.get("/api/dashboard");
      expect(dash.status).toBe(200);
      const count = (status: string) => dash.body.byStatus.find((s: { status: string }) => s.status === status);
      expect(count("sent")).toMatchObject({ count: 2 });
      expect(count("draft")).toMatchObject({ count: 1 });
      expect(count("accepted")).toMatchObject({ count: 0, totalMinor: 0 });
      const quoteTotal = (await owner.api.get(`/api/quotes/${qa.id}`)).body.totalMinor;
      expect(quoteTotal).toBeGreaterThan(0);
      expect(count("sent").totalMinor).toBe(2 * quoteTotal); // the same cabin, the same prices
      expect(dash.body.awaiting.map((q: { id: string }) => q.id)).toEqual([qa.id]);
      expect(dash.body.month).toBe(new Date().toISOString().slice(0, 7));
      expect(dash.body.activity.filter((e: { type: string }) => e.type === "sent")).toHaveLength(2);

      // another company sees none of it
      const other = await signUpCompany(t.app);
      const theirs = await other.api.get("/api/dashboard");
      expect(theirs.body.awaiting).toEqual([]);
      expect(theirs.body.byStatus.every((s: { count: number }) => s.count === 0)).toBe(true);
    });
  });
});

async function fetchHtml(id: string): Promise<string> {
  const { inject } = await import("vitest");
  const message = await fetch(`http://127.0.0.1:${inject("mailCatcher").webPort}/api/email/${id}`).then((r) => r.json());
  return (message as { html?: string }).html ?? "";
}

