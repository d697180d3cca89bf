import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { PasswordReset, User } from "../../../server/db/entities/index.js";
import { RESET_REQUESTED } from "../../../server/routes/auth.routes.js";
import { ApiClient, sessionIdSetBy } from "../../support/api.js";
import { signUpCompany, TEST_PASSWORD, uniqueEmail } from "../../support/accounts.js";
import { useTestApp } from "../../support/app.js";
import { linkIn, mailsTo, tokenOf, waitForMail } from "../../support/mail.js";

const NEW_PASSWORD = "a-brand-new-passphrase";

describe("forgot password → e-mailed one-hour link → new password", () => {
  const t = useTestApp();

  async function requestLink(email: string, nth = 1): Promise<string> {
    const response = await new ApiClient(t.app.app).post("/api/auth/forgot-password", { email: email.toUpperCase() });
    expect(response.status).toBe(202);
    const mail = await waitForMail(email, nth);
    return tokenOf(linkIn(mail, `${t.app.url}/reset-password#token=`));
  }

  it("e-mails a link with the company's name in HTML and text; following it sets the password and ends the other sessions", async () => {
    const owner = await signUpCompany(t.app, "Tidewater Lighting");
    const laptop = new ApiClient(t.app.app);
    expect((await laptop.post("/api/auth/sign-in", { email: owner.email, password: TEST_PASSWORD })).status).toBe(200);

    const token = await requestLink(owner.email);
    const [mail] = await mailsTo(owner.email);
    expect(mail.subject).toContain("Tidewater Lighting");
    expect(mail.text).toContain("Tidewater Lighting");
    expect(mail.html).toContain("Tidewater Lighting");
    expect(mail.html).toContain(`${t.app.url}/reset-password#token=`);

    const phone = new ApiClient(t.app.app);
    const reset = await phone.post("/api/auth/reset-password", { token, password: NEW_PASSWORD });
    expect(reset.status).toBe(200);
    expect(reset.body).toMatchObject({ signedIn: true, user: { email: owner.email } });

    // Every other session ended; the one that reset is signed in.
    expect((await owner.api.get("/api/auth/session")).body).toEqual({ signedIn: false });
    expect((await laptop.get("/api/auth/session")).body).toEqual({ signedIn: false });
    expect((await phone.get("/api/auth/session")).body.signedIn).toBe(true);

    const fresh = new ApiClient(t.app.app);
    expect((await fresh.post("/api/auth/sign-in", { email: owner.email, password: TEST_PASSWORD })).status).toBe(401);
    expect((await fresh.post("/api/auth/sign-in", { email: owner.email, password: NEW_PASSWORD })).status).toBe(200);
  });

  it("works once: a reused link gets 410 and changes nothing", async () => {
    const owner = await signUpCompany(t.app);
    const token = await requestLink(owner.email);
    expect((await new ApiClient(t.app.app).post("/api/auth/reset-password", { token, password: NEW_PASSWORD })).status).toBe(200);
    const hashAfterFirst = (await t.db.getRepository(User).findOneByOrFail({ email: owner.email })).passwordHash;
    const again = await new ApiClient(t.app.app).post("/api/auth/reset-password", { token, password: "yet-another-passphrase" });
    expect(again.status).toBe(410);
    expect(again.body.error).toMatchObject({ code: "gone", details: { field: "token" } });
    expect((await t.db.getRepository(User).findOneByOrFail({ email: owner.email })).passwordHash).toBe(hashAfterFirst);
  });

  it("two uses of one link at the same moment: one wins, the other gets 410", async () => {
    const owner = await signUpCompany(t.app);
    const token = await requestLink(owner.email);
    const [one, two] = await Promise.all([
      new ApiClient(t.app.app).post("/api/auth/reset-password", { token, password: "first-new-passphrase" }),
      new ApiClient(t.app.app).post("/api/auth/reset-password", { token, password: "second-new-passphrase" }),
    ]);
    expect([one.status, two.status].sort()).toEqual([200, 410]);
    const winner = one.status === 200 ? "first-new-passphrase" : "second-new-passphrase";
    expect((await new ApiClient(t.app.app).post("/api/auth/sign-in", { email: owner.email, password: winner })).status).toBe(200);
  });

  it("the reset signs in with a new session id", async () => {
    const owner = await signUpCompany(t.app);
    const token = await requestLink(owner.email);
    const browser = new ApiClient(t.app.app);
    const before = sessionIdSetBy(await browser.post("/api/auth/sign-in", { email: owner.email, password: TEST_PASSWORD }));
    const after = sessionIdSetBy(await browser.post("/api/auth/reset-password", { token, password: NEW_PASSWORD }));
    expect(before).toBeDefined();
    expect(after).toBeDefined();
    expect(after).not.toBe(before);
    expect((await browser.get("/api/auth/session")).body.signedIn).toBe(true);
  });

  it("refuses an expired link (older than one hour) with 410", async () => {
    const owner = await signUpCompany(t.app);
    const token = await requestLink(owner.email);
    const before = (await t.db.getRepository(User).findOneByOrFail({ email: owner.email })).passwordHash;
    await t.db.getRepository(PasswordReset).update({ id: token.split(".")[0] }, { expiresAt: new Date(Date.now() - 1000) });
    const response = await new ApiClient(t.app.app).post("/api/auth/reset-password", { token, password: NEW_PASSWORD });
    expect(response.status).toBe(410);
    expect(response.body.error.message).toMatch(/expired/);
    expect((await t.db.getRepository(User).findOneByOrFail({ email: owner.email })).passwordHash).toBe(before);
  });

  it("stores the link's secret only as a hash, valid one hour, and refuses a forged secret (404)", async () => {
    const owner = await signUpCompany(t.app);
    const token = await requestLink(owner.email);
    const [id, secret] = token.split(".");
    const row = await t.db.getRepository(PasswordReset).findOneByOrFail({ id });
    expect(row.tokenHash).not.toContain(secret);
    expect(row.tokenHash).toMatch(/^[0-9a-f]{64}$/);
    const minutes = (row.expiresAt.getTime() - row.createdAt.getTime()) / 60000;
    expect(minutes).toBeGreaterThan(59);
    expect(minutes).toBeLessThanOrEqual(60.1);
    const forged = `${id}.${secret.slice(0, -1)}${secret.endsWith("A") ? "B" : "A"}`;
    const response = await new ApiClient(t.app.app).post("/api/auth/reset-password", { token: forged, password: NEW_PASSWORD });
    expect(response.status).toBe(404);
  });

  it("answers an unknown e-mail exactly as a known one, and sends nothing", async () => {
    const owner = await signUpCompany(t.app);
    const nobody = uniqueEmail("nobody");
    const known = await new ApiClient(t.app.app).post("/api/auth/forgot-password", { email: owner.email });
    const unknown = await new ApiClient(t.app.app).post("/api/auth/forgot-password", { email: nobody });
    expect(unknown.status).toBe(known.status);
    expect(unknown.body).toEqual(known.body);
    expect(known.body.message).toBe(RESET_REQUESTED);
    await waitForMail(owner.email);
    expect(await mailsTo(nobody)).toHaveLength(0);
  });

  it("applies the password rules to the new password, naming the field", async () => {
    const owner = await signUpCompany(t.app);
    const token = await requestLink(owner.email);
    const short = await new ApiClient(t.app.app).post("/api/auth/reset-password", { token, password: "short" });
    expect(short.status).toBe(400);
    expect(short.body.error.details.fields.password).toMatch(/at least 10/);
    const same = await new ApiClient(t.app.app).post("/api/auth/reset-password", { token, password: owner.email });
    expect(same.status).toBe(400);
    expect(same.body.error.details.fields.password).toMatch(/e-mail/);
    const damaged = await new ApiClient(t.app.app).post("/api/auth/reset-password", { token: "abc", password: NEW_PASSWORD });
    expect(damaged.status).toBe(400);
    expect(Object.keys(damaged.body.error.details.fields)).toEqual(["token"]);
    // The link still works after the refused attempts.
    expect((await new ApiClient(t.app.app).post("/api/auth/reset-password", { token, password: NEW_PASSWORD })).status).toBe(200);
  });
});
