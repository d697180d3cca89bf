import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { SESSION_TABLE } from "../../../server/auth/session.js";
import { User } from "../../../server/db/entities/index.js";
import { ApiClient, sessionIdSetBy } from "../../support/api.js";
import { signUpCompany, TEST_PASSWORD, uniqueEmail } from "../../support/accounts.js";
import { useTestApp } from "../../support/app.js";

describe("sign up, sign in, who am I, sign out", () => {
  const t = useTestApp();

  const sessionRow = async (sid: string) => (await t.db.query(`SELECT "sess" FROM "${SESSION_TABLE}" WHERE "sid" = $1`, [sid])) as unknown[];

  it("answers signed out without a session, and 401 on a guarded route", async () => {
    const api = new ApiClient(t.app.app);
    const session = await api.get("/api/auth/session");
    expect(session.status).toBe(200);
    expect(session.body).toEqual({ signedIn: false });
    const company = await api.get("/api/company");
    expect(company.status).toBe(401);
    expect(company.body.error.code).toBe("unauthenticated");
  });

  it("signs up a company and its Owner, signed in at once, with a hardened cookie", async () => {
    const api = new ApiClient(t.app.app);
    const email = uniqueEmail("Founder").toUpperCase();
    const response = await api.post("/api/auth/sign-up", { companyName: "  Driftwood Solar Co  ", name: "Fern Founder", email, password: TEST_PASSWORD });
    expect(response.status).toBe(201);
    expect(response.body).toMatchObject({ signedIn: true, role: "owner", company: { name: "Driftwood Solar Co" }, user: { name: "Fern Founder", email: email.toLowerCase() } });
    const cookie = ([] as string[]).concat(response.headers["set-cookie"] ?? []).find((c) => c.startsWith("runwright.sid="));
    expect(cookie).toBeDefined();
    expect(cookie).toMatch(/HttpOnly/i);
    expect(cookie).toMatch(/SameSite=Lax/i);
    // Served over plain HTTP here, so "auto" leaves Secure off.
    expect(cookie).not.toMatch(/Secure/i);

    const who = await api.get("/api/auth/session");
    expect(who.body).toMatchObject({ signedIn: true, role: "owner", memberships: [{ role: "owner" }] });
    const stored = await t.db.getRepository(User).findOneByOrFail({ email: email.toLowerCase() });
    expect(stored.passwordHash.startsWith("$argon2id$")).toBe(true);
    expect(stored.passwordHash).not.toContain(TEST_PASSWORD);
  });

  it("sets Secure on the cookie when the request came over HTTPS through a loopback proxy", async () => {
    const api = new ApiClient(t.app.app, { "X-Forwarded-Proto": "https" });
    const response = await api.post("/api/auth/sign-up", { companyName: "Secure Co", name: "Sam", email: uniqueEmail("secure"), password: TEST_PASSWORD });
    expect(response.status).toBe(201);
    const cookie = ([] as string[]).concat(response.headers["set-cookie"] ?? []).find((c) => c.startsWith("runwright.sid="));
    expect(cookie).toMatch(/Secure/);
  });

  it("refuses a second account for the same e-mail in any letter case, saving nothing", async () => {
    const { email } = await signUpCompany(t.app);
    const before = await t.db.query(`SELECT count(*)::int AS n FROM company`);
    const again = await new ApiClient(t.app.app).post("/api/auth/sign-up", { companyName: "Copy", name: "Copy", email: email.toUpperCase(), password: TEST_PASSWORD });
    expect(again.status).toBe(409);
    expect(again.body.error).toMatchObject({ code: "conflict", details: { field: "email" } });
    expect(await t.db.query(`SELECT count(*)::int AS n FROM company`)).toEqual(before);
  });

  it("names the field for bad sign-up input and saves nothing", async () => {
    const api = new ApiClient(t.app.app);
    const email = uniqueEmail("bad");
    const cases: Array<[Record<string, unknown>, string]> = [
      [{ companyName: "X", name: "Y", email, password: "short" }, "password"],
      [{ companyName: "X", name: "Y", email: "not-an-address", password: TEST_PASSWORD }, "email"],
      [{ companyName: "", name: "Y", email, password: TEST_PASSWORD }, "companyName"],
      [{ companyName: "X", name: "Y", email, password: email.toUpperCase() }, "password"],
      [{ companyName: "X", name: "Y", email, password: TEST_PASSWORD, role: "owner" }, "(body)"],
    ];
    for (const [body, field] of cases) {
      const response = await api.post("/api/auth/sign-up", body);
      expect(response.status, JSON.stringify(body)).toBe(400);
      expect(response.body.error.code).toBe("invalid_input");
      expect(Object.keys(response.body.error.details.fields)).toContain(field);
    }
    expect(await t.db.getRepository(User).countBy({ email })).toBe(0);
  });

  it("signs in with the e-mail in any case; a wrong password and an unknown e-mail get the same answer", async () => {
    const { email } = await signUpCompany(t.app);
    const api = new ApiClient(t.app.app);
    const wrong = await api.post("/api/auth/sign-in", { email, password: "not-the-password" });
    const unknown = await api.post("/api/auth/sign-in", { email: uniqueEmail("nobody"), password: "not-the-password" });
    expect(wrong.status).toBe(401);
    expect(unknown.status).toBe(401);
    expect(wrong.body).toEqual(unknown.body);
    expect(wrong.body.error.message).toBe("E-mail or password is wrong");

    const ok = await api.post("/api/auth/sign-in", { email: email.toUpperCase(), password: TEST_PASSWORD });
    expect(ok.status).toBe(200);
    expect(ok.body).toMatchObject({ signedIn: true, role: "owner" });
    const user = await t.db.getRepository(User).findOneByOrFail({ email });
    expect(user.lastSignInAt).toBeInstanceOf(Date);
  });

  it("gives a new session id at sign-in (no fixation) and destroys the old session row", async () => {
    const first = await signUpCompany(t.app);
    const second = await signUpCompany(t.app);
    const api = new ApiClient(t.app.app);
    const a = sessionIdSetBy(await api.post("/api/auth/sign-in", { email: first.email, password: TEST_PASSWORD }));
    expect(a).toBeDefined();
    expect(await sessionRow(a!)).toHaveLength(1);
    // The same browser (cookie a) signs in as someone else.
    const b = sessionIdSetBy(await api.post("/api/auth/sign-in", { email: second.email, password: TEST_PASSWORD }));
    expect(b).toBeDefined();
    expect(b).not.toBe(a);
    expect(await sessionRow(a!)).toHaveLength(0);
    expect((await api.get("/api/auth/session")).body.user.email).toBe(second.email);
  });

  it("signs out: the session row is destroyed and the cookie no longer works", async () => {
    const { api } = await signUpCompany(t.app);
    const sid = sessionIdSetBy(await api.post("/api/auth/sign-in", { email: (await api.get("/api/auth/session")).body.user.email, password: TEST_PASSWORD }));
    const out = await api.post("/api/auth/sign-out");
    expect(out.status).toBe(204);
    expect(await sessionRow(sid!)).toHaveLength(0);
    expect((await api.get("/api/auth/session")).body).toEqual({ signedIn: false });
    expect((await api.get("/api/members")).status).toBe(401);
  });
});
