import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { Company, Membership, User } from "../../../server/db/entities/index.js";
import { addMember, signUpCompany } from "../../support/accounts.js";
import { useTestApp } from "../../support/app.js";

describe("team: roles, removal and the last Owner", () => {
  const t = useTestApp();

  it("lists the members with their roles and no secrets", async () => {
    const owner = await signUpCompany(t.app);
    const estimator = await addMember(t.db, t.app, owner.companyId, "estimator", "Ezra");
    const listed = await estimator.api.get("/api/members");
    expect(listed.status).toBe(200);
    expect(listed.body.members.map((m: { email: string; role: string }) => [m.email, m.role])).toEqual([
      [owner.email, "owner"],
      [estimator.email, "estimator"],
    ]);
    expect(Object.keys(listed.body.members[0]).sort()).toEqual(["email", "joinedAt", "lastSignInAt", "name", "role", "userId"]);
  });

  it("an Owner changes a role; it applies on the member's very next request", async () => {
    const owner = await signUpCompany(t.app);
    const installer = await addMember(t.db, t.app, owner.companyId, "installer");
    expect((await installer.api.post("/api/invitations", { email: "x@example.test", role: "installer" })).status).toBe(403);
    const promoted = await owner.api.patch(`/api/members/${installer.userId}`, { role: "owner" });
    expect(promoted.status).toBe(200);
    expect(promoted.body).toMatchObject({ userId: installer.userId, role: "owner" });
    expect((await installer.api.get("/api/auth/session")).body.role).toBe("owner");
    expect((await installer.api.get("/api/invitations")).status).toBe(200);
  });

  it("the last Owner can be neither demoted nor removed (409), and nothing changes", async () => {
    const owner = await signUpCompany(t.app);
    await addMember(t.db, t.app, owner.companyId, "estimator");
    const demote = await owner.api.patch(`/api/members/${owner.userId}`, { role: "estimator" });
    expect(demote.status).toBe(409);
    expect(demote.body.error.message).toMatch(/last Owner/);
    const remove = await owner.api.delete(`/api/members/${owner.userId}`);
    expect(remove.status).toBe(409);
    expect(await t.db.getRepository(Membership).findOneByOrFail({ companyId: owner.companyId, userId: owner.userId })).toMatchObject({ role: "owner" });

    // With a second Owner, the first may step down.
    const second = await addMember(t.db, t.app, owner.companyId, "owner");
    expect((await second.api.patch(`/api/members/${owner.userId}`, { role: "estimator" })).status).toBe(200);
    expect((await second.api.patch(`/api/members/${second.userId}`, { role: "installer" })).status).toBe(409);
  });

  it("two Owners demoting each other at once cannot leave the company without one", async () => {
    const a = await signUpCompany(t.app);
    const b = await addMember(t.db, t.app, a.companyId, "owner");
    const [one, two] = await Promise.all([
      a.api.patch(`/api/members/${b.userId}`, { role: "estimator" }),
      b.api.patch(`/api/members/${a.userId}`, { role: "estimator" }),
    ]);
    // One wins; the other is refused — 409 if it ran while its sender was still an Owner, 403 if just after.
    const statuses = [one.status, two.status].sort();
    expect(statuses[0]).toBe(200);
    expect([403, 409]).toContain(statuses[1]);
    expect(await t.db.getRepository(Membership).countBy({ companyId: a.companyId, role: "owner" })).toBe(1);
  });

  it("a person removed from the company they are working in is not silently moved into another", async () => {
    const a = await signUpCompany(t.app, "Company A");
    const b = await signUpCompany(t.app, "Company B");
    // B's owner is also an Owner in A and is working in A.
    await t.db.getRepository(Membership).insert({ companyId: a.companyId, userId: b.userId, role: "owner" });
    expect((await b.api.post("/api/auth/switch-company", { companyId: a.companyId })).body.company.name).toBe("Company A");
    expect((await a.api.delete(`/api/members/${b.userId}`)).status).toBe(204);
    // The settings form that was open for A must not land on B.
    const late = await b.api.patch("/api/company", { name: "Meant for A" });
    expect(late.status).toBe(401);
    expect((await t.db.getRepository(Company).findOneByOrFail({ id: b.companyId })).name).toBe("Company B");
    // From then on the session works in the company that remains.
    expect((await b.api.get("/api/auth/session")).body).toMatchObject({ signedIn: true, company: { name: "Company B" } });
  });

  it("removing a member ends their access at once; the account stays", async () => {
    const owner = await signUpCompany(t.app);
    const estimator = await addMember(t.db, t.app, owner.companyId, "estimator");
    expect((await owner.api.delete(`/api/members/${estimator.userId}`)).status).toBe(204);
    expect((await estimator.api.get("/api/auth/session")).body).toEqual({ signedIn: false });
    expect((await estimator.api.get("/api/members")).status).toBe(401);
    expect(await t.db.getRepository(User).existsBy({ id: estimator.userId })).toBe(true);
    expect((await owner.api.delete(`/api/members/${estimator.userId}`)).status).toBe(404);
  });

  it("checks the role and the id, naming the field", async () => {
    const owner = await signUpCompany(t.app);
    const estimator = await addMember(t.db, t.app, owner.companyId, "estimator");
    const bad = await owner.api.patch(`/api/members/${estimator.userId}`, { role: "boss" });
    expect(bad.status).toBe(400);
    expect(bad.body.error.details.fields).toHaveProperty("role");
    expect((await owner.api.patch("/api/members/not-a-uuid", { role: "installer" })).status).toBe(404);
  });
});

describe("company settings", () => {
  const t = useTestApp();

  it("every role reads them; the Owner updates them", async () => {
    const owner = await signUpCompany(t.app, "Saltmarsh Power");
    const installer = await addMember(t.db, t.app, owner.companyId, "installer");
    const read = await installer.api.get("/api/company");
    expect(read.status).toBe(200);
    expect(read.body).toMatchObject({ name: "Saltmarsh Power", currency: "USD", depositPercent: 30, labourRateMinor: 0 });

    const patch = {
      name: "Saltmarsh Power & Light",
      licenceNumber: "EC-99-1234",
      contactEmail: "Office@Saltmarsh.example",
      phone: "+61 400 000 000",
      address: "1 Example Way",
      currency: "aud",
      taxRatePercent: 10,
      defaultMarkupPercent: 22.5,
      labourRateMinor: 11000,
      depositPercent: 25,
    };
    const updated = await owner.api.patch("/api/company", patch);
    expect(updated.status).toBe(200);
    expect(updated.body).toMatchObject({ ...patch, contactEmail: "office@saltmarsh.example", currency: "AUD" });
    const stored = await t.db.getRepository(Company).findOneByOrFail({ id: owner.companyId });
    expect(stored).toMatchObject({ currency: "AUD", taxRatePercent: 10, defaultMarkupPercent: 22.5, depositPercent: 25 });
    // Clearing an optional field with an empty string stores null.
    expect((await owner.api.patch("/api/company", { licenceNumber: "" })).body.licenceNumber).toBeNull();

    expect((await installer.api.patch("/api/company", { name: "Hijack" })).status).toBe(403);
  });

  it("keeps the decimals people type, without float surprises or silent rounding", async () => {
    const owner = await signUpCompany(t.app);
    // 8.11 × 1000 is 8109.999999999999 in binary floating point; it is still three decimals.
    const ok = await owner.api.patch("/api/company", { taxRatePercent: 8.11, defaultMarkupPercent: 12.35, depositPercent: 33.33 });
    expect(ok.status).toBe(200);
    expect(ok.body).toMatchObject({ taxRatePercent: 8.11, defaultMarkupPercent: 12.35, depositPercent: 33.33 });
    expect((await owner.api.get("/api/company")).body).toMatchObject({ taxRatePercent: 8.11, defaultMarkupPercent: 12.35, depositPercent: 33.33 });
    expect((await owner.api.patch("/api/company", { taxRatePercent: 8.125 })).body.taxRatePercent).toBe(8.125);
    // More places than the column keeps is refused, not rounded.
    const markup = await owner.api.patch("/api/company", { defaultMarkupPercent: 12.345 });
    expect(markup.status).toBe(400);
    expect(markup.body.error.details.fields.defaultMarkupPercent).toMatch(/2 decimal places/);
    expect((await owner.api.patch("/api/company", { taxRatePercent: 8.1255 })).status).toBe(400);
    expect((await owner.api.get("/api/company")).body.defaultMarkupPercent).toBe(12.35);
  });

  it("refuses control characters in text (PostgreSQL cannot store NUL), naming the field", async () => {
    const owner = await signUpCompany(t.app);
    for (const [field, value] of [["name", "Bad\u0000Co"], ["phone", "555\u0007"], ["licenceNumber", "A\nB"]] as const) {
      const response = await owner.api.patch("/api/company", { [field]: value });
      expect(response.status, field).toBe(400);
      expect(response.body.error.details.fields[field]).toMatch(/control character/);
    }
    // An address may have lines.
    expect((await owner.api.patch("/api/company", { address: "1 Quay Road\nHarbourside" })).body.address).toBe("1 Quay Road\nHarbourside");
  });

  it("refuses bad settings naming the field, and saves nothing", async () => {
    const owner = await signUpCompany(t.app);
    const before = await t.db.getRepository(Company).findOneByOrFail({ id: owner.companyId });
    const cases: Array<[Record<string, unknown>, string]> = [
      [{ currency: "XYZ" }, "currency"],
      [{ depositPercent: 120 }, "depositPercent"],
      [{ taxRatePercent: -1 }, "taxRatePercent"],
      [{ labourRateMinor: 12.5 }, "labourRateMinor"],
      [{ defaultMarkupPercent: "twenty" }, "defaultMarkupPercent"],
      [{ contactEmail: "not-mail" }, "contactEmail"],
      [{ name: "" }, "name"],
      [{ name: "ok", id: "5e1d0000-0000-4000-8000-00000000d001" }, "(body)"],
    ];
    for (const [body, field] of cases) {
      const response = await owner.api.patch("/api/company", body);
      expect(response.status, JSON.stringify(body)).toBe(400);
      expect(Object.keys(response.body.error.details.fields)).toContain(field);
    }
    const after = await t.db.getRepository(Company).findOneByOrFail({ id: owner.companyId });
    expect(after.updatedAt.getTime()).toBe(before.updatedAt.getTime());
  });
});
