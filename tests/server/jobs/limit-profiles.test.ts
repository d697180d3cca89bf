import { describe, expect, it } from "vitest";
import { LimitProfile } from "../../../server/db/entities/index.js";
import { addMember, signUpCompany } from "../../support/accounts.js";
import { useTestApp } from "../../support/app.js";

describe("limit profiles", () => {
  const t = useTestApp();

  it("a new company has the General and Marine profiles, each citing its source, and an editable custom one", async () => {
    const owner = await signUpCompany(t.app);
    const list = await owner.api.get("/api/limit-profiles");
    expect(list.status).toBe(200);
    const byName = Object.fromEntries(list.body.items.map((p: { name: string }) => [p.name, p]));
    // NFPA 70 210.19(A) / 215.2 informational notes: 3 % branch, 5 % feeder + branch (REFERENCES.md §5).
    expect(byName["General — 3 % branch, 5 % total"]).toMatchObject({ branchPercent: 3, totalPercent: 5, criticalPercent: 3, nearFraction: 0.8, builtIn: true });
    expect(byName["General — 3 % branch, 5 % total"].notes).toMatch(/NFPA 70.*210\.19\(A\).*215\.2.*not a requirement/s);
    // ABYC E-11: 3 % critical circuits, 10 % others (REFERENCES.md §5).
    expect(byName["Marine DC — 3 % critical, 10 % other"]).toMatchObject({ branchPercent: 10, totalPercent: 10, criticalPercent: 3, builtIn: true });
    expect(byName["Marine DC — 3 % critical, 10 % other"].notes).toMatch(/ABYC E-11/);
    expect(byName["Company custom"]).toMatchObject({ builtIn: false });
  });

  it("the custom profile can be edited; built-in ones cannot be changed or deleted (409)", async () => {
    const owner = await signUpCompany(t.app);
    const list = (await owner.api.get("/api/limit-profiles")).body.items;
    const custom = list.find((p: { builtIn: boolean }) => !p.builtIn);
    const general = list.find((p: { name: string }) => p.name.startsWith("General"));
    const edited = await owner.api.patch(`/api/limit-profiles/${custom.id}`, { branchPercent: 2.5, notes: "Client spec 14-B" });
    expect(edited.status).toBe(200);
    expect(edited.body).toMatchObject({ branchPercent: 2.5, notes: "Client spec 14-B" });
    const refused = await owner.api.patch(`/api/limit-profiles/${general.id}`, { branchPercent: 10 });
    expect(refused.status).toBe(409);
    expect(refused.body.error.message).toMatch(/duplicate/);
    expect((await owner.api.delete(`/api/limit-profiles/${general.id}`)).status).toBe(409);
    expect((await t.db.getRepository(LimitProfile).findOneByOrFail({ id: general.id })).branchPercent).toBe(3);
  });

  it("validates limits and names, refuses a duplicate name, and refuses deleting a profile in use", async () => {
    const owner = await signUpCompany(t.app);
    for (const [body, field] of [
      [{ name: "Zero", branchPercent: 0, totalPercent: 5, criticalPercent: 3 }, "branchPercent"],
      [{ name: "Big", branchPercent: 3, totalPercent: 101, criticalPercent: 3 }, "totalPercent"],
      [{ name: "Near", branchPercent: 3, totalPercent: 5, criticalPercent: 3, nearFraction: 1 }, "nearFraction"],
      [{ branchPercent: 3, totalPercent: 5, criticalPercent: 3 }, "name"],
    ] as const) {
      const r = await owner.api.post("/api/limit-profiles", body);
      expect(r.status, JSON.stringify(body)).toBe(400);
      expect(Object.keys(r.body.error.details.fields)).toContain(field);
    }
    const dup = await owner.api.post("/api/limit-profiles", { name: "company CUSTOM", branchPercent: 3, totalPercent: 5, criticalPercent: 3 });
    expect(dup.status).toBe(409);
    const spec = await owner.api.post("/api/limit-profiles", { name: "Spec", branchPercent: 2, totalPercent: 4, criticalPercent: 2 });
    expect(spec.status).toBe(201);
    const client = await owner.api.post("/api/clients", { name: "C" });
    const job = await owner.api.post("/api/jobs", { clientId: client.body.id, title: "T" });
    await owner.api.post(`/api/jobs/${job.body.id}/systems`, { name: "S", limitProfileId: spec.body.id });
    const inUse = await owner.api.delete(`/api/limit-profiles/${spec.body.id}`);
    expect(inUse.status).toBe(409);
    expect(inUse.body.error.message).toMatch(/used by 1 system/);
    expect((await owner.api.get(`/api/limit-profiles/${spec.body.id}`)).body.systemCount).toBe(1);
  });

  it("only the Owner changes profiles; an Estimator reads them", async () => {
    const owner = await signUpCompany(t.app);
    const estimator = await addMember(t.db, t.app, owner.companyId, "estimator");
    expect((await estimator.api.get("/api/limit-profiles")).status).toBe(200);
    expect((await estimator.api.post("/api/limit-profiles", { name: "E", branchPercent: 3, totalPercent: 5, criticalPercent: 3 })).status).toBe(403);
  });
});
