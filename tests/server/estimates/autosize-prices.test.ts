import { describe, expect, it } from "vitest";
import { useTestApp } from "../../support/app.js";
import { signUpCompany } from "../../support/accounts.js";
import { createJobWork } from "../../support/jobs.js";

describe("auto-size prices cable from the company's price list", () => {
  const t = useTestApp();

  it("proposes only sizes the price list has, and costs them from it", async () => {
    const owner = await signUpCompany(t.app);
    const work = await createJobWork(owner.api);
    // Only three copper sizes are priced (a per-metre single and a per-foot item; a twin cable).
    const items = [
      { sku: "A-2.5", description: "2.5 mm²", category: "cable", unit: "m", unitCostMinor: 100, cableSize: "2.5 mm2", cableMaterial: "copper", conductors: 1 },
      { sku: "A-35", description: "35 mm²", category: "cable", unit: "ft", unitCostMinor: 300, cableSize: "35 mm2", cableMaterial: "copper", conductors: 1 },
      { sku: "A-70", description: "70 mm² twin", category: "cable", unit: "m", unitCostMinor: 4000, cableSize: "70 mm2", cableMaterial: "copper", conductors: 2 },
    ];
    for (const item of items) expect((await owner.api.post("/api/price-list", item)).status).toBe(201);
    const proposal = await owner.api.post(`/api/systems/${work.systemId}/autosize`, {});
    expect(proposal.status, JSON.stringify(proposal.body)).toBe(200);
    expect(proposal.body).toMatchObject({ ok: true, costSource: "price-list", currency: "USD" });
    expect(proposal.body.costNote).toMatch(/price list/);
    const proposed = new Set(proposal.body.runs.filter((r: { locked?: boolean }) => !r.locked).map((r: { after: string }) => r.after));
    for (const size of proposed) expect(["2.5 mm2", "35 mm2", "70 mm2"]).toContain(size);
    // Cost of a run at 35 mm²: $3.00 per ft of one conductor = 3 / 0.3048 $/m (exact foot), × 2 conductors × length.
    const doc = proposal.body.system as { runs: Array<{ id: string; length: number; size: string; parallel?: number }> };
    for (const run of proposal.body.runs as Array<{ id: string; after: string; costAfter: number }>) {
      const r = doc.runs.find((x) => x.id === run.id)!;
      const perMetre = run.after === "2.5 mm2" ? 1 : run.after === "35 mm2" ? 3 / 0.3048 : 40 / 2;
      expect(run.costAfter).toBeCloseTo(perMetre * 2 * r.length * (r.parallel ?? 1), 6);
    }
  });
});

describe("auto-size keeps to the layout's family of sizes", () => {
  const t = useTestApp();

  it("a metric layout is proposed mm² sizes even when AWG sizes are priced cheaper", async () => {
    const owner = await signUpCompany(t.app);
    const work = await createJobWork(owner.api);
    const items = [
      { sku: "M-50", description: "50 mm²", category: "cable", unit: "m", unitCostMinor: 1390, cableSize: "50 mm2", cableMaterial: "copper", conductors: 1 },
      { sku: "M-2.5", description: "2.5 mm²", category: "cable", unit: "m", unitCostMinor: 85, cableSize: "2.5 mm2", cableMaterial: "copper", conductors: 1 },
      // Far cheaper, but AWG: not for a metric layout while mm² sizes are priced.
      { sku: "I-4/0", description: "4/0 AWG", category: "cable", unit: "ft", unitCostMinor: 1, cableSize: "4/0 AWG", cableMaterial: "copper", conductors: 1 },
    ];
    for (const item of items) expect((await owner.api.post("/api/price-list", item)).status).toBe(201);
    const proposal = await owner.api.post(`/api/systems/${work.systemId}/autosize`, {});
    expect(proposal.status, JSON.stringify(proposal.body)).toBe(200);
    for (const run of proposal.body.runs as Array<{ after: string }>) expect(run.after).toMatch(/mm2$/);
  });
});
