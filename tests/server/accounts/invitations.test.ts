import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { Invitation, Membership, User } from "../../../server/db/entities/index.js";
import { createApp } from "../../../server/app.js";
import { ApiClient, sessionIdSetBy } from "../../support/api.js";
import { addMember, signUpCompany, TEST_PASSWORD, uniqueEmail } from "../../support/accounts.js";
import { useTestApp } from "../../support/app.js";
import { linkIn, mailsTo, tokenOf, waitForMail } from "../../support/mail.js";

describe("invitations: e-mailed, single use, seven days", () => {
  const t = useTestApp();

  async function invite(owner: ApiClient, email: string, role = "estimator", nth = 1): Promise<string> {
    const response = await owner.post("/api/invitations", { email, role });
    expect(response.status).toBe(201);
    expect(response.body).toMatchObject({ email: email.toLowerCase(), role });
    const mail = await waitForMail(email, nth);
    return tokenOf(linkIn(mail, `${t.app.url}/join#token=`));
  }

  it("an Owner invites by e-mail; the new person accepts from the link, is signed in with the role, and the link is spent", async () => {
    const owner = await signUpCompany(t.app, "Lanternfield Electric");
    const email = uniqueEmail("estimator");
    const token = await invite(owner.api, email);
    const [mail] = await mailsTo(email);
    expect(mail.subject).toContain("Lanternfield Electric");
    expect(mail.html).toContain("Lanternfield Electric");
    expect(mail.text).toContain("Estimator");

    const listed = await owner.api.get("/api/invitations");
    expect(listed.body.invitations.map((i: { email: string }) => i.email)).toContain(email);

    const person = new ApiClient(t.app.app);
    const preview = await person.post("/api/invitations/lookup", { token });
    expect(preview.status).toBe(200);
    expect(preview.body).toMatchObject({ companyName: "Lanternfield Electric", email, role: "estimator", hasAccount: false });

    const accepted = await person.post("/api/invitations/accept", { token, name: "Ezra Estimator", password: TEST_PASSWORD });
    expect(accepted.status).toBe(201);
    expect(accepted.body).toMatchObject({ signedIn: true, role: "estimator", company: { name: "Lanternfield Electric" }, user: { email, name: "Ezra Estimator" } });
    expect((await person.get("/api/auth/session")).body.role).toBe("estimator");

    const again = await new ApiClient(t.app.app).post("/api/invitations/accept", { token, name: "Someone Else", password: TEST_PASSWORD });
    expect(again.status).toBe(410);
    expect(await t.db.getRepository(User).countBy({ email })).toBe(1);
    expect((await owner.api.get("/api/invitations")).body.invitations.map((i: { email: string }) => i.email)).not.toContain(email);

    // The invited person signs in later with the password they chose.
    expect((await new ApiClient(t.app.app).post("/api/auth/sign-in", { email, password: TEST_PASSWORD })).status).toBe(200);
  });

  it("two accepts of one link at the same moment: one account, one membership", async () => {
    const owner = await signUpCompany(t.app);
    const email = uniqueEmail("race");
    const token = await invite(owner.api, email);
    const [one, two] = await Promise.all([
      new ApiClient(t.app.app).post("/api/invitations/accept", { token, name: "First", password: TEST_PASSWORD }),
      new ApiClient(t.app.app).post("/api/invitations/accept", { token, name: "Second", password: TEST_PASSWORD }),
    ]);
    const statuses = [one.status, two.status].sort();
    expect(statuses[0]).toBe(201);
    expect([409, 410]).toContain(statuses[1]);
    expect(await t.db.getRepository(User).countBy({ email })).toBe(1);
    expect(await t.db.getRepository(Membership).countBy({ companyId: owner.companyId })).toBe(2);
  });

  it("two invitations to one address at the same moment leave one live link", async () => {
    const owner = await signUpCompany(t.app);
    const email = uniqueEmail("double");
    const responses = await Promise.all([
      owner.api.post("/api/invitations", { email, role: "installer" }),
      owner.api.post("/api/invitations", { email, role: "estimator" }),
    ]);
    expect(responses.map((r) => r.status)).toEqual([201, 201]);
    const live = await t.db.query(`SELECT id FROM invitation WHERE company_id = $1 AND email = $2 AND accepted_at IS NULL AND revoked_at IS NULL`, [owner.companyId, email]);
    expect(live).toHaveLength(1);
  });

  it("accepting gives a new session id, not the one the browser had", async () => {
    const owner = await signUpCompany(t.app);
    const email = uniqueEmail("fixation");
    const token = await invite(owner.api, email);
    const before = sessionIdSetBy(await owner.api.post("/api/auth/sign-in", { email: owner.email, password: TEST_PASSWORD }));
    const after = sessionIdSetBy(await owner.api.post("/api/invitations/accept", { token, name: "Fi", password: TEST_PASSWORD }));
    expect(before).toBeDefined();
    expect(after).toBeDefined();
    expect(after).not.toBe(before);
    expect((await owner.api.get("/api/auth/session")).body.user.email).toBe(email);
  });

  it("adds a membership to an existing account, which must give its own password", async () => {
    const first = await signUpCompany(t.app, "First Co");
    const second = await signUpCompany(t.app, "Second Co");
    const token = await invite(second.api, first.email, "installer");
    const person = new ApiClient(t.app.app);
    expect((await person.post("/api/invitations/lookup", { token })).body.hasAccount).toBe(true);

    const wrong = await person.post("/api/invitations/accept", { token, password: "not-my-password" });
    expect(wrong.status).toBe(401);
    expect(await t.db.getRepository(Membership).countBy({ userId: first.userId })).toBe(1);

    const ok = await person.post("/api/invitations/accept", { token, password: TEST_PASSWORD });
    expect(ok.status).toBe(201);
    expect(ok.body).toMatchObject({ role: "installer", company: { name: "Second Co" } });
    expect(ok.body.memberships).toHaveLength(2);

    // The user can switch back to their own company; another company's id is not found.
    const back = await person.post("/api/auth/switch-company", { companyId: first.companyId });
    expect(back.body).toMatchObject({ role: "owner", company: { name: "First Co" } });
    const stranger = await signUpCompany(t.app);
    expect((await person.post("/api/auth/switch-company", { companyId: stranger.companyId })).status).toBe(404);
  });

  it("refuses an expired link (over seven days) with 410 and creates nobody", async () => {
    const owner = await signUpCompany(t.app);
    const email = uniqueEmail("late");
    const token = await invite(owner.api, email);
    const row = await t.db.getRepository(Invitation).findOneByOrFail({ id: token.split(".")[0] });
    const days = (row.expiresAt.getTime() - row.createdAt.getTime()) / 86_400_000;
    expect(days).toBeGreaterThan(6.99);
    expect(days).toBeLessThanOrEqual(7.001);
    await t.db.getRepository(Invitation).update({ id: row.id }, { expiresAt: new Date(Date.now() - 1000) });
    const person = new ApiClient(t.app.app);
    expect((await person.post("/api/invitations/lookup", { token })).status).toBe(410);
    const accept = await person.post("/api/invitations/accept", { token, name: "Late Larry", password: TEST_PASSWORD });
    expect(accept.status).toBe(410);
    expect(accept.body.error.message).toMatch(/expired/);
    expect(await t.db.getRepository(User).countBy({ email })).toBe(0);
  });

  it("a withdrawn invitation and a replaced one stop working; only the newest link does", async () => {
    const owner = await signUpCompany(t.app);
    const email = uniqueEmail("twice");
    const firstToken = await invite(owner.api, email);
    const secondToken = await invite(owner.api, email, "installer", 2);
    expect((await new ApiClient(t.app.app).post("/api/invitations/lookup", { token: firstToken })).status).toBe(410);
    expect((await new ApiClient(t.app.app).post("/api/invitations/lookup", { token: secondToken })).body.role).toBe("installer");

    const withdrawn = await owner.api.delete(`/api/invitations/${secondToken.split(".")[0]}`);
    expect(withdrawn.status).toBe(204);
    expect((await new ApiClient(t.app.app).post("/api/invitations/lookup", { token: secondToken })).status).toBe(410);
  });

  it("refuses to invite an existing member (409) and checks the input, naming the field", async () => {
    const owner = await signUpCompany(t.app);
    const estimator = await addMember(t.db, t.app, owner.companyId, "estimator");
    const dup = await owner.api.post("/api/invitations", { email: estimator.email.toUpperCase(), role: "installer" });
    expect(dup.status).toBe(409);
    expect(dup.body.error.details.field).toBe("email");
    const badRole = await owner.api.post("/api/invitations", { email: uniqueEmail("x"), role: "client" });
    expect(badRole.status).toBe(400);
    expect(badRole.body.error.details.fields).toHaveProperty("role");
    const badEmail = await owner.api.post("/api/invitations", { email: "nope", role: "installer" });
    expect(badEmail.status).toBe(400);
    expect(badEmail.body.error.details.fields).toHaveProperty("email");
    expect(await t.db.getRepository(Invitation).countBy({ companyId: owner.companyId })).toBe(0);
  });

  it("a new person's password follows the rules; a damaged link is named as the token field", async () => {
    const owner = await signUpCompany(t.app);
    const email = uniqueEmail("rules");
    const token = await invite(owner.api, email);
    const person = new ApiClient(t.app.app);
    const short = await person.post("/api/invitations/accept", { token, name: "Rae", password: "short" });
    expect(short.status).toBe(400);
    expect(short.body.error.details.fields).toHaveProperty("password");
    const same = await person.post("/api/invitations/accept", { token, name: "Rae", password: email });
    expect(same.status).toBe(400);
    const noName = await person.post("/api/invitations/accept", { token, password: TEST_PASSWORD });
    expect(noName.status).toBe(400);
    expect(noName.body.error.details.fields).toHaveProperty("name");
    const damaged = await person.post("/api/invitations/accept", { token: "x.y", name: "Rae", password: TEST_PASSWORD });
    expect(damaged.status).toBe(400);
    expect(damaged.body.error.details.fields).toHaveProperty("token");
    expect(await t.db.getRepository(User).countBy({ email })).toBe(0);
    // Still usable after the refusals.
    expect((await person.post("/api/invitations/accept", { token, name: "Rae", password: TEST_PASSWORD })).status).toBe(201);
  });

  it("when the mail cannot be sent, answers 503 and saves no invitation", async () => {
    const noMail = createApp({ db: t.db, authRateLimit: { limit: 1000, windowMs: 60_000 } });
    const owner = await signUpCompany({ app: noMail, url: "http://127.0.0.1:1", stripe: null, jobs: null, close: async () => {} });
    const response = await owner.api.post("/api/invitations", { email: uniqueEmail("lost"), role: "estimator" });
    expect(response.status).toBe(503);
    expect(response.body.error.code).toBe("service_unavailable");
    expect(await t.db.getRepository(Invitation).countBy({ companyId: owner.companyId })).toBe(0);
  });
});
