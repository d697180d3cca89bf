// The session's sliding expiry is moved on in the database at most every 10 minutes per session,
// not on every request (a write and a commit per request otherwise; see server/auth/session.ts).
import { describe, expect, it } from "vitest";
import { signUpCompany, TEST_PASSWORD } from "../../support/accounts.js";
import { sessionIdSetBy } from "../../support/api.js";
import { useTestApp } from "../../support/app.js";

describe("session expiry touches", () => {
  const t = useTestApp();

  it("moves the expiry on at the first request and leaves it for the next ones", async () => {
    const owner = await signUpCompany(t.app);
    const again = await owner.api.post("/api/auth/sign-in", { email: owner.email, password: TEST_PASSWORD });
    expect(again.status).toBe(200);
    const sid = sessionIdSetBy(again)!;
    expect(sid).toBeTruthy();
    const expiry = async () => ((await t.db.query(`SELECT expire FROM user_session WHERE sid = $1`, [sid])) as Array<{ expire: Date }>)[0].expire.getTime();
    const signedIn = await expiry();
    await new Promise((resolve) => setTimeout(resolve, 1100));
    expect((await owner.api.get("/api/jobs")).status).toBe(200);
    const touched = await expiry();
    // The first request after signing in moved the two-week expiry on (by about the second waited).
    expect(touched).toBeGreaterThan(signedIn);
    await new Promise((resolve) => setTimeout(resolve, 1100));
    for (let i = 0; i < 3; i++) expect((await owner.api.get("/api/jobs")).status).toBe(200);
    expect(await expiry()).toBe(touched);
  });
});
