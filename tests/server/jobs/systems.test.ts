import { describe, expect, it } from "vitest";
import { System } from "../../../server/db/entities/index.js";
import { signUpCompany } from "../../support/accounts.js";
import { useTestApp } from "../../support/app.js";
import { exampleSystem } from "../../support/jobs.js";
import type { ApiClient } from "../../support/api.js";

async function jobFor(api: ApiClient) {
  const client = await api.post("/api/clients", { name: "Odile Marchbank (test client)" });
  const job = await api.post("/api/jobs", { clientId: client.body.id, title: "Systems test job" });
  expect(job.status).toBe(201);
  return job.body.id as string;
}

describe("systems: create, read, save with the version, solve, auto-size", () => {
  const t = useTestApp();

  it("a new system without a document starts with a bus bar and a battery at the nominal voltage, checked by the General profile", async () => {
    const owner = await signUpCompany(t.app);
    const jobId = await jobFor(owner.api);
    const created = await owner.api.post(`/api/jobs/${jobId}/systems`, { name: "House bank", nominalVoltage: 48, units: "imperial" });
    expect(created.status).toBe(201);
    expect(created.body).toMatchObject({ jobId, name: "House bank", nominalVoltage: 48, units: "imperial", version: 1 });
    expect(created.body.document).toMatchObject({ format: "runwright-system/1", units: "imperial", nominalVoltage: 48, points: [{ id: "bus" }], sources: [{ id: "bank", voltage: 48 }] });
    const profiles = await owner.api.get("/api/limit-profiles");
    const general = profiles.body.items.find((p: { name: string }) => p.name.startsWith("General"));
    expect(created.body.limitProfileId).toBe(general.id);
    const detail = await owner.api.get(`/api/jobs/${jobId}`);
    expect(detail.body.systems).toEqual([expect.objectContaining({ id: created.body.id, loadCount: 0, runCount: 0, version: 1 })]);
  });

  it("refuses a document that breaks the network file format, naming the field, and stores nothing", async () => {
    const owner = await signUpCompany(t.app);
    const jobId = await jobFor(owner.api);
    const doc = exampleSystem("cabin-24v");
    doc.runs[1] = { ...doc.runs[1], parallel: 0 };
    const refused = await owner.api.post(`/api/jobs/${jobId}/systems`, { name: "Broken", document: doc });
    expect(refused.status).toBe(400);
    expect(refused.body.error.code).toBe("invalid_input");
    expect(refused.body.error.details.fields).toHaveProperty(["document.runs[1].parallel"]);
    expect(refused.body.error.message).toMatch(/^document\.runs\[1\]\.parallel: /);
    const unknown = await owner.api.post(`/api/jobs/${jobId}/systems`, { name: "Extra", document: { ...exampleSystem("cabin-24v"), colour: "red" } });
    expect(unknown.status).toBe(400);
    expect(unknown.body.error.message).toMatch(/colour/);
    expect(await t.db.getRepository(System).countBy({ jobId })).toBe(0);
  });

  it("PUT saves with the version it was read at; a stale version answers 409 with the current one and changes nothing", async () => {
    const owner = await signUpCompany(t.app);
    const jobId = await jobFor(owner.api);
    const created = await owner.api.post(`/api/jobs/${jobId}/systems`, { name: "Cabin", document: exampleSystem("cabin-24v") });
    const id = created.body.id;
    const first = structuredClone(created.body.document);
    first.runs[1].size = "50 mm2";
    const saved = await owner.api.put(`/api/systems/${id}`, { version: 1, document: first });
    expect(saved.status).toBe(200);
    expect(saved.body.version).toBe(2);
    expect(saved.body.document.runs[1].size).toBe("50 mm2");
    expect(saved.body.updatedBy.name).toBeTruthy();

    // Someone who opened version 1 saves later: refused, told the current version and who saved it.
    const second = structuredClone(created.body.document);
    second.runs[1].size = "2.5 mm2";
    const stale = await owner.api.put(`/api/systems/${id}`, { version: 1, document: second });
    expect(stale.status).toBe(409);
    expect(stale.body.error.code).toBe("conflict");
    expect(stale.body.error.details).toMatchObject({ currentVersion: 2, updatedBy: saved.body.updatedBy.name });
    const now = await owner.api.get(`/api/systems/${id}`);
    expect(now.body.version).toBe(2);
    expect(now.body.document.runs[1].size).toBe("50 mm2");

    // Overwriting on purpose: PUT again with the current version.
    const overwrite = await owner.api.put(`/api/systems/${id}`, { version: stale.body.error.details.currentVersion, document: second });
    expect(overwrite.status).toBe(200);
    expect(overwrite.body.version).toBe(3);
    expect(overwrite.body.document.runs[1].size).toBe("2.5 mm2");
  });

  it("two saves racing from the same version: exactly one wins", async () => {
    const owner = await signUpCompany(t.app);
    const jobId = await jobFor(owner.api);
    const created = await owner.api.post(`/api/jobs/${jobId}/systems`, { name: "Race", document: exampleSystem("telecom-48v") });
    const bodies = ["one", "two"].map((name) => ({ version: 1, name, document: created.body.document }));
    const answers = await Promise.all(bodies.map((b) => owner.api.put(`/api/systems/${created.body.id}`, b)));
    expect(answers.map((a) => a.status).sort()).toEqual([200, 409]);
    expect((await owner.api.get(`/api/systems/${created.body.id}`)).body.version).toBe(2);
  });

  it("PUT without a version, or with a bad document, is a 400 naming the field", async () => {
    const owner = await signUpCompany(t.app);
    const jobId = await jobFor(owner.api);
    const created = await owner.api.post(`/api/jobs/${jobId}/systems`, { name: "V", document: exampleSystem("telecom-48v") });
    const noVersion = await owner.api.put(`/api/systems/${created.body.id}`, { document: created.body.document });
    expect(noVersion.status).toBe(400);
    expect(noVersion.body.error.details.fields).toHaveProperty("version");
    const badLoad = structuredClone(created.body.document);
    badLoad.loads[0].model = "magic";
    const refused = await owner.api.put(`/api/systems/${created.body.id}`, { version: 1, document: badLoad });
    expect(refused.status).toBe(400);
    expect(Object.keys(refused.body.error.details.fields)[0]).toMatch(/^document\.loads\[0\]/);
    expect((await owner.api.get(`/api/systems/${created.body.id}`)).body.version).toBe(1);
  });

  it("converts lengths typed with a unit to the system's units when saving", async () => {
    const owner = await signUpCompany(t.app);
    const jobId = await jobFor(owner.api);
    const doc = exampleSystem("cabin-24v");
    doc.runs[1].length = "72.18 ft";
    const created = await owner.api.post(`/api/jobs/${jobId}/systems`, { name: "Feet", document: doc });
    expect(created.status).toBe(201);
    // 72.18 ft × 0.3048 m/ft = 22.0005 m (the foot is exactly 0.3048 m).
    expect(created.body.document.runs[1].length).toBeCloseTo(22.0005, 4);
  });

  it("solve answers the engine's result for the posted (unsaved) document, with the system's limit profile", async () => {
    const owner = await signUpCompany(t.app);
    const jobId = await jobFor(owner.api);
    const created = await owner.api.post(`/api/jobs/${jobId}/systems`, { name: "Cabin", document: exampleSystem("cabin-24v") });
    const saved = await owner.api.post(`/api/systems/${created.body.id}/solve`, {});
    expect(saved.status).toBe(200);
    expect(saved.body.ok).toBe(true);
    expect(saved.body.limitProfile.name).toMatch(/^General/);
    expect(saved.body.cases.map((c: { name: string }) => c.name)).toEqual(["Full charge", "Low battery, hot day"]);
    const pump = saved.body.loads.find((l: { id: string }) => l.id === "well-pump");
    expect(pump.status).toBe("over");
    expect(saved.body.cautions.length).toBeGreaterThan(0);

    // A bigger pump feeder, not saved: the posted document is what gets solved.
    const bigger = structuredClone(created.body.document);
    bigger.runs.forEach((r: { id: string; size: string }) => (r.size = r.id === "cabin-studio" ? "4 mm2" : "50 mm2"));
    const posted = await owner.api.post(`/api/systems/${created.body.id}/solve`, { document: bigger });
    const pumpAfter = posted.body.loads.find((l: { id: string }) => l.id === "well-pump");
    expect(pumpAfter.dropPercent).toBeLessThan(pump.dropPercent);
    expect(pumpAfter.status).not.toBe("over");
    expect((await owner.api.get(`/api/systems/${created.body.id}`)).body.version).toBe(1);

    // The Marine profile (10 % for non-critical loads) changes the verdict on the studio lights.
    const marine = (await owner.api.get("/api/limit-profiles")).body.items.find((p: { name: string }) => p.name.startsWith("Marine"));
    await owner.api.put(`/api/systems/${created.body.id}`, { version: 1, limitProfileId: marine.id, document: created.body.document });
    const underMarine = await owner.api.post(`/api/systems/${created.body.id}/solve`, {});
    expect(underMarine.body.limitProfile).toMatchObject({ branchPercent: 10, totalPercent: 10, criticalPercent: 3 });
    expect(underMarine.body.loads.find((l: { id: string }) => l.id === "studio-lights").status).toBe("within");
  });

  it("an invalid or unsolvable document is a 200 with ok:false naming the field, never a 500", async () => {
    const owner = await signUpCompany(t.app);
    const jobId = await jobFor(owner.api);
    const created = await owner.api.post(`/api/jobs/${jobId}/systems`, { name: "S", document: exampleSystem("cabin-24v") });
    const bad = structuredClone(created.body.document);
    bad.runs[0].size = "17 mm2";
    const unknownSize = await owner.api.post(`/api/systems/${created.body.id}/solve`, { document: bad });
    expect(unknownSize.status).toBe(200);
    expect(unknownSize.body.ok).toBe(false);
    expect(unknownSize.body.errors[0]).toMatchObject({ code: "UNKNOWN_SIZE" });
    const dangling = structuredClone(created.body.document);
    dangling.runs[0].to = "nowhere";
    const answer = await owner.api.post(`/api/systems/${created.body.id}/solve`, { document: dangling });
    expect(answer.body.ok).toBe(false);
    expect(answer.body.errors.map((e: { code: string }) => e.code)).toContain("UNKNOWN_POINT");
    for (const document of [null, 42, "x", [], { format: "other" }]) {
      const r = await owner.api.post(`/api/systems/${created.body.id}/solve`, { document });
      expect(r.status).toBe(200);
      expect(r.body.ok).toBe(false);
    }
    const extra = await owner.api.post(`/api/systems/${created.body.id}/solve`, { document: bad, other: 1 });
    expect(extra.status).toBe(400);
  });

  it("auto-size proposes sizes that pass with the cost difference, and saves nothing", async () => {
    const owner = await signUpCompany(t.app);
    const jobId = await jobFor(owner.api);
    const created = await owner.api.post(`/api/jobs/${jobId}/systems`, { name: "Cabin", document: exampleSystem("cabin-24v") });
    const proposal = await owner.api.post(`/api/systems/${created.body.id}/autosize`, {});
    expect(proposal.status).toBe(200);
    expect(proposal.body).toMatchObject({ ok: true, passes: true, costSource: "default-prices" });
    expect(proposal.body.costNote).toMatch(/default prices/);
    expect(proposal.body.costDifference).toBeGreaterThan(0);
    const pumpRun = proposal.body.runs.find((r: { id: string }) => r.id === "shed-pump");
    expect(pumpRun.changed).toBe(true);
    expect(proposal.body.loads.find((l: { id: string }) => l.id === "well-pump").after.status).not.toBe("over");
    // Applying it is a normal save of the proposed document; the proposal alone changed nothing.
    expect((await owner.api.get(`/api/systems/${created.body.id}`)).body.version).toBe(1);
    const applied = await owner.api.put(`/api/systems/${created.body.id}`, { version: 1, document: proposal.body.system });
    expect(applied.status).toBe(200);
    const solved = await owner.api.post(`/api/systems/${created.body.id}/solve`, {});
    expect(solved.body.loads.every((l: { status: string }) => l.status !== "over")).toBe(true);
    const job = await owner.api.get(`/api/jobs/${jobId}`);
    expect(job.body.systems[0].lastSolve).toMatchObject({ over: 0 });
  });

  it("delete removes the system; then it is 404", async () => {
    const owner = await signUpCompany(t.app);
    const jobId = await jobFor(owner.api);
    const created = await owner.api.post(`/api/jobs/${jobId}/systems`, { name: "Gone" });
    expect((await owner.api.delete(`/api/systems/${created.body.id}`)).status).toBe(204);
    const after = await owner.api.get(`/api/systems/${created.body.id}`);
    expect(after.status).toBe(404);
    expect(after.body.error.code).toBe("not_found");
    expect((await owner.api.get(`/api/systems/not-a-uuid`)).status).toBe(404);
  });
});
