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
