// What a review of the estimating code found, each proved here: the client never sees costs, a
// lapsed quote neither sends nor downloads, a load is supplied once, a quote never prices an old
// layout beside a new proof, and a send racing a new revision or the client's answer stays whole.
import { describe, expect, it } from "vitest";
import { signUpCompany, uniqueEmail } from "../../support/accounts.js";
import { ApiClient } from "../../support/api.js";
import { useTestApp } from "../../support/app.js";
import { createJobWork, exampleSystem } from "../../support/jobs.js";
import { createQuoteWork, CABIN_PRICES } from "../../support/quotes.js";

describe("estimating, after review", () => {
  const t = useTestApp();

  async function pricedJob() {
    const owner = await signUpCompany(t.app);
    const work = await createJobWork(owner.api);
    for (const item of CABIN_PRICES) expect((await owner.api.post("/api/price-list", item)).status).toBe(201);
    return { owner, work };
  }

  it("the client's page carries no cost, markup or margin", async () => {
    const owner = await signUpCompany(t.app);
    const work = await createJobWork(owner.api);
    const q = await createQuoteWork(owner.api, work.jobId, t.app.url);
    const view = await new ApiClient(t.app.app).get(`/api/quote-links/${q.token}`);
    expect(view.status).toBe(200);
    expect(view.body.snapshot.lines.length).toBeGreaterThan(0);
    for (const line of view.body.snapshot.lines) {
      expect(Object.keys(line).sort()).toEqual(["category", "description", "key", "quantity", "sellMinor", "source", "unit"]);
    }
    expect(view.body.snapshot.totals).not.toHaveProperty("costMinor");
    expect(view.body.snapshot.totals).not.toHaveProperty("marginMinor");
    expect(view.text).not.toMatch(/costMinor|unitCostMinor|markupPercent|marginMinor/);
    // The contractor's own view of the same quote has them.
    expect((await owner.api.get(`/api/quotes/${q.quoteId}`)).body.snapshot.totals).toHaveProperty("costMinor");
  });

  it("a draft past its valid-until date is not sent, and a lapsed quote's PDF link answers 410 expired", async () => {
    const { owner, work } = await pricedJob();
    expect((await owner.api.post(`/api/jobs/${work.jobId}/estimate/generate`)).status).toBe(200);
    const draft = await owner.api.post(`/api/jobs/${work.jobId}/quotes`, {});
    await t.db.query(`UPDATE quote SET valid_until = current_date - 1 WHERE id = $1`, [draft.body.id]);
    const refused = await owner.api.post(`/api/quotes/${draft.body.id}/send`, { to: uniqueEmail("late") });
    expect(refused.status).toBe(409);
    expect(refused.body.error.message).toMatch(/valid until/);
    expect((await owner.api.get(`/api/quotes/${draft.body.id}`)).body.status).toBe("draft");

    const other = await signUpCompany(t.app);
    const otherWork = await createJobWork(other.api);
    const q = await createQuoteWork(other.api, otherWork.jobId, t.app.url);
    await t.db.query(`UPDATE quote SET valid_until = current_date - 1 WHERE id = $1`, [q.quoteId]);
    const pdf = await new ApiClient(t.app.app).get(`/api/quote-links/${q.token}/pdf`);
    expect(pdf.status).toBe(410);
    expect(pdf.body.error.details.reason).toBe("expired");
  });

  it("a load can be supplied once: choosing it twice is refused and nothing is saved", async () => {
    const { owner, work } = await pricedJob();
    const fridge = await owner.api.post("/api/price-list", { sku: "DEV-F", description: "DC fridge", category: "device", unit: "each", unitCostMinor: 50000 });
    const built = await owner.api.post(`/api/jobs/${work.jobId}/estimate/generate`);
    const twice = [1, 2].map(() => ({ systemId: work.systemId, loadId: "fridge", priceItemId: fridge.body.id }));
    const answer = await owner.api.put(`/api/jobs/${work.jobId}/estimate`, { version: built.body.version, supplied: twice });
    expect(answer.status).toBe(400);
    expect(answer.body.error.message).toMatch(/supplied/);
    const after = await owner.api.get(`/api/jobs/${work.jobId}/estimate`);
    expect(after.body.supplied).toEqual([]);
    expect(after.body.version).toBe(built.body.version);
  });

  it("refuses to quote while the layout has changed since the estimate was built, and quotes after a rebuild", async () => {
    const { owner, work } = await pricedJob();
    expect((await owner.api.post(`/api/jobs/${work.jobId}/estimate/generate`)).status).toBe(200);
    const system = (await owner.api.get(`/api/systems/${work.systemId}`)).body as { version: number; document: ReturnType<typeof exampleSystem> };
    const document = { ...system.document, runs: system.document.runs.map((r, i) => (i === 0 ? { ...r, length: 30 } : r)) };
    expect((await owner.api.put(`/api/systems/${work.systemId}`, { version: system.version, document })).status).toBe(200);
    const refused = await owner.api.post(`/api/jobs/${work.jobId}/quotes`, {});
    expect(refused.status).toBe(422);
    expect(refused.body.error.message).toMatch(/rebuild/i);
    expect((await owner.api.get(`/api/jobs/${work.jobId}/quotes`)).body.items).toEqual([]);
    expect((await owner.api.post(`/api/jobs/${work.jobId}/estimate/generate`)).status).toBe(200);
    expect((await owner.api.post(`/api/jobs/${work.jobId}/quotes`, {})).status).toBe(201);
  });

  it("a send racing a new revision and the client's answer leaves one consistent outcome", async () => {
    const owner = await signUpCompany(t.app);
    const work = await createJobWork(owner.api);
    const q = await createQuoteWork(owner.api, work.jobId, t.app.url);
    const r2 = await owner.api.post(`/api/jobs/${work.jobId}/quotes`, {});
    expect(r2.status).toBe(201);
    const client = new ApiClient(t.app.app);
    // All three at once: R2 sent, R1 accepted by the client, another revision made.
    const [sent, accepted, made] = await Promise.all([
      owner.api.post(`/api/quotes/${r2.body.id}/send`, { to: uniqueEmail("race") }),
      client.post(`/api/quote-links/${q.token}/accept`, { name: "Racing Client", agree: true }),
      owner.api.post(`/api/jobs/${work.jobId}/quotes`, {}),
    ]);
    for (const r of [sent, accepted, made]) expect(r.status, JSON.stringify(r.body)).toBeLessThan(500);
    const rows: Array<{ revision: number; status: string; superseded_at: Date | null }> = await t.db.query(
      `SELECT revision, status, superseded_at FROM quote WHERE job_id = $1 ORDER BY revision`,
      [work.jobId],
    );
    const r1 = rows.find((r) => r.revision === 1)!;
    // Never both: R1 accepted and superseded, or R1 accepted while a later revision went out.
    if (r1.status === "accepted") {
      expect(r1.superseded_at).toBeNull();
      expect(rows.filter((r) => r.revision > 1 && r.status !== "draft")).toEqual([]);
    } else {
      expect(r1.superseded_at).not.toBeNull();
      expect(accepted.status).toBe(410);
    }
  });
});
