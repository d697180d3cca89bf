import { describe, expect, it } from "vitest";
import { Client, Job } from "../../../server/db/entities/index.js";
import { addMember, signUpCompany } from "../../support/accounts.js";
import { useTestApp } from "../../support/app.js";
import { exampleSystem } from "../../support/jobs.js";

describe("clients", () => {
  const t = useTestApp();

  it("creates, reads, updates and lists clients; empty text clears a field", async () => {
    const owner = await signUpCompany(t.app);
    const created = await owner.api.post("/api/clients", { name: "  Rowena Quist  ", email: "Rowena@Client.Test", phone: "+1 555 0101", billingAddress: "1 Ash Row\nKestrel Bay", notes: "" });
    expect(created.status).toBe(201);
    expect(created.body).toMatchObject({ name: "Rowena Quist", email: "rowena@client.test", billingAddress: "1 Ash Row\nKestrel Bay", notes: null, jobCount: 0 });
    const patched = await owner.api.patch(`/api/clients/${created.body.id}`, { phone: "", notes: "Prefers e-mail" });
    expect(patched.status).toBe(200);
    expect(patched.body).toMatchObject({ phone: null, notes: "Prefers e-mail", name: "Rowena Quist" });
    expect((await owner.api.get(`/api/clients/${created.body.id}`)).body.notes).toBe("Prefers e-mail");
  });

  it("refuses bad input naming the field, and saves nothing", async () => {
    const owner = await signUpCompany(t.app);
    const cases: Array<[unknown, string]> = [
      [{}, "name"],
      [{ name: "   " }, "name"],
      [{ name: "A", email: "not-an-address" }, "email"],
      [{ name: "A\u0000B" }, "name"],
      [{ name: "x".repeat(201) }, "name"],
      [{ name: "A", colour: "red" }, "(body)"],
      [{ name: "A", phone: "1".repeat(41) }, "phone"],
    ];
    for (const [body, field] of cases) {
      const r = await owner.api.post("/api/clients", body);
      expect(r.status, JSON.stringify(body)).toBe(400);
      expect(r.body.error.code).toBe("invalid_input");
      expect(Object.keys(r.body.error.details.fields), JSON.stringify(body)).toContain(field);
    }
    expect(await t.db.getRepository(Client).countBy({ companyId: owner.companyId })).toBe(0);
  });

  it("lists with search, sort and paging; page windows never overlap", async () => {
    const owner = await signUpCompany(t.app);
    for (const name of ["Delta Marine", "alpha Farms", "Charlie Lodge", "Bravo 100% Solar", "Echo_Hut"]) {
      expect((await owner.api.post("/api/clients", { name })).status).toBe(201);
    }
    const first = await owner.api.get("/api/clients?pageSize=2&sort=name");
    expect(first.body).toMatchObject({ total: 5, page: 1, pageSize: 2 });
    const second = await owner.api.get("/api/clients?pageSize=2&page=2&sort=name");
    const third = await owner.api.get("/api/clients?pageSize=2&page=3&sort=name");
    const names = [...first.body.items, ...second.body.items, ...third.body.items].map((c: { name: string }) => c.name);
    expect(new Set(names).size).toBe(5);
    const descending = await owner.api.get("/api/clients?sort=-name");
    expect(descending.body.items[0].name).toBe("Echo_Hut");
    // % and _ are matched literally, not as wildcards.
    expect((await owner.api.get("/api/clients?search=100%25")).body.items.map((c: { name: string }) => c.name)).toEqual(["Bravo 100% Solar"]);
    expect((await owner.api.get("/api/clients?search=o_H")).body.items.map((c: { name: string }) => c.name)).toEqual(["Echo_Hut"]);
    expect((await owner.api.get("/api/clients?search=ALPHA")).body.total).toBe(1);
    for (const query of ["page=0", "pageSize=101", "sort=password", "page=abc", "colour=red", "page=1&page=2"]) {
      const r = await owner.api.get(`/api/clients?${query}`);
      expect(r.status, query).toBe(400);
      expect(r.body.error.code).toBe("invalid_input");
    }
  });

  it("a client with jobs cannot be deleted (409); without jobs it can", async () => {
    const owner = await signUpCompany(t.app);
    const client = await owner.api.post("/api/clients", { name: "Has jobs" });
    await owner.api.post("/api/jobs", { clientId: client.body.id, title: "J" });
    const refused = await owner.api.delete(`/api/clients/${client.body.id}`);
    expect(refused.status).toBe(409);
    expect(refused.body.error.message).toMatch(/1 job/);
    const lonely = await owner.api.post("/api/clients", { name: "No jobs" });
    expect((await owner.api.delete(`/api/clients/${lonely.body.id}`)).status).toBe(204);
    expect(await t.db.getRepository(Client).countBy({ companyId: owner.companyId })).toBe(1);
  });
});

describe("jobs", () => {
  const t = useTestApp();

  it("creates a job for the company's own client only; another company's client is not found", async () => {
    const a = await signUpCompany(t.app);
    const b = await signUpCompany(t.app);
    const aClient = await a.api.post("/api/clients", { name: "A's client" });
    const refused = await b.api.post("/api/jobs", { clientId: aClient.body.id, title: "Poaching" });
    expect(refused.status).toBe(404);
    expect(refused.body.error.message).toMatch(/Client/);
    expect(await t.db.getRepository(Job).countBy({ companyId: b.companyId })).toBe(0);
    const created = await a.api.post("/api/jobs", { clientId: aClient.body.id, title: "Cabin", siteAddress: "Lot 9" });
    expect(created.status).toBe(201);
    expect(created.body).toMatchObject({ title: "Cabin", status: "lead", client: { id: aClient.body.id, name: "A's client" }, systemCount: 0, worstStatus: null, systems: [], attachments: [] });
    expect(created.body.createdBy.id).toBe(a.userId);
  });

  it("refuses a bad status, a missing title and a malformed client id, naming the field", async () => {
    const owner = await signUpCompany(t.app);
    const client = await owner.api.post("/api/clients", { name: "C" });
    for (const [body, field] of [
      [{ clientId: client.body.id, title: "T", status: "paid" }, "status"],
      [{ clientId: client.body.id }, "title"],
      [{ clientId: "nope", title: "T" }, "clientId"],
    ] as const) {
      const r = await owner.api.post("/api/jobs", body);
      expect(r.status).toBe(400);
      expect(Object.keys(r.body.error.details.fields)).toContain(field);
    }
    const job = await owner.api.post("/api/jobs", { clientId: client.body.id, title: "T" });
    const bad = await owner.api.patch(`/api/jobs/${job.body.id}`, { status: "paid" });
    expect(bad.status).toBe(400);
    expect((await owner.api.get(`/api/jobs/${job.body.id}`)).body.status).toBe("lead");
  });

  it("lists with status filter, search over title, site and client, sort by client, and the worst load status", async () => {
    const owner = await signUpCompany(t.app);
    const zed = await owner.api.post("/api/clients", { name: "Zed Holdings" });
    const amy = await owner.api.post("/api/clients", { name: "Amy Orchard" });
    const cabin = await owner.api.post("/api/jobs", { clientId: zed.body.id, title: "Cabin bank", status: "won" });
    const garden = await owner.api.post("/api/jobs", { clientId: amy.body.id, title: "Garden lights", siteAddress: "Mill Lane" });
    await owner.api.post(`/api/jobs/${cabin.body.id}/systems`, { name: "S", document: exampleSystem("cabin-24v") });
    await owner.api.post(`/api/jobs/${garden.body.id}/systems`, { name: "S", document: exampleSystem("telecom-48v") });

    const won = await owner.api.get("/api/jobs?status=won");
    expect(won.body.items.map((j: { title: string }) => j.title)).toEqual(["Cabin bank"]);
    expect(won.body.items[0]).toMatchObject({ systemCount: 1, worstStatus: "over", client: { name: "Zed Holdings" } });
    expect((await owner.api.get("/api/jobs?search=mill")).body.items.map((j: { title: string }) => j.title)).toEqual(["Garden lights"]);
    expect((await owner.api.get("/api/jobs?search=zed")).body.items.map((j: { title: string }) => j.title)).toEqual(["Cabin bank"]);
    const byClient = await owner.api.get("/api/jobs?sort=client");
    expect(byClient.body.items.map((j: { client: { name: string } }) => j.client.name)).toEqual(["Amy Orchard", "Zed Holdings"]);
    expect(byClient.body.items[0].worstStatus).toBe("within");
    expect((await owner.api.get(`/api/jobs?clientId=${amy.body.id}`)).body.total).toBe(1);
    expect((await owner.api.get("/api/jobs?status=paid")).status).toBe(400);
    // SQL in a search is just text.
    const injected = await owner.api.get(`/api/jobs?search=${encodeURIComponent("' OR 1=1 --")}`);
    expect(injected.status).toBe(200);
    expect(injected.body.total).toBe(0);
  });

  it("an installer reads jobs but cannot create or change them", async () => {
    const owner = await signUpCompany(t.app);
    const installer = await addMember(t.db, t.app, owner.companyId, "installer");
    const client = await owner.api.post("/api/clients", { name: "C" });
    const job = await owner.api.post("/api/jobs", { clientId: client.body.id, title: "T" });
    expect((await installer.api.get(`/api/jobs/${job.body.id}`)).status).toBe(200);
    expect((await installer.api.post("/api/jobs", { clientId: client.body.id, title: "X" })).status).toBe(403);
    expect((await installer.api.patch(`/api/jobs/${job.body.id}`, { title: "X" })).status).toBe(403);
    expect((await owner.api.get(`/api/jobs/${job.body.id}`)).body.title).toBe("T");
  });

  it("deleting a job removes its systems and attachments", async () => {
    const owner = await signUpCompany(t.app);
    const client = await owner.api.post("/api/clients", { name: "C" });
    const job = await owner.api.post("/api/jobs", { clientId: client.body.id, title: "T" });
    const system = await owner.api.post(`/api/jobs/${job.body.id}/systems`, { name: "S" });
    expect((await owner.api.delete(`/api/jobs/${job.body.id}`)).status).toBe(204);
    expect((await owner.api.get(`/api/jobs/${job.body.id}`)).status).toBe(404);
    expect((await owner.api.get(`/api/systems/${system.body.id}`)).status).toBe(404);
  });
});
