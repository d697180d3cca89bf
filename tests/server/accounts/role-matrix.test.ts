import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { listRoutes } from "../../../server/routes/route-table.js";
import type { ApiClient } from "../../support/api.js";
import { TEST_PASSWORD, uniqueEmail } from "../../support/accounts.js";
import { useTestApp } from "../../support/app.js";
import { companyFixture, companySnapshot, type CompanyFixture } from "../../support/fixtures.js";

type Who = "anonymous" | "installer" | "estimator" | "owner";
const WHO: Who[] = ["anonymous", "installer", "estimator", "owner"];
// A well-formed link token that names nothing.
const NO_SUCH_TOKEN = `00000000-0000-4000-8000-000000000000.${"A".repeat(43)}`;

interface Row {
  request: (f: CompanyFixture) => { path?: string; body?: unknown };
  expect: Record<Who, number>;
}

const all = (status: number): Record<Who, number> => ({ anonymous: status, installer: status, estimator: status, owner: status });
const signedIn = (status: number): Record<Who, number> => ({ anonymous: 401, installer: status, estimator: status, owner: status });
const ownerOnly = (status: number): Record<Who, number> => ({ anonymous: 401, installer: 403, estimator: 403, owner: status });

// Every /api route × who is asking → the status it must get, with a valid request.
// Installers read only; Estimators do not administer the team or the company.
// A route missing from this table fails the test.
const MATRIX: Record<string, Row> = {
  "GET /api/health": { request: () => ({}), expect: all(200) },
  "GET /api/auth/session": { request: () => ({}), expect: all(200) },
  "POST /api/auth/sign-up": {
    request: () => ({ body: { companyName: "Matrix Co", name: "M", email: uniqueEmail("matrix"), password: TEST_PASSWORD } }),
    expect: all(201),
  },
  "POST /api/auth/sign-in": { request: () => ({ body: { email: uniqueEmail("nobody"), password: TEST_PASSWORD } }), expect: all(401) },
  "POST /api/auth/sign-out": { request: () => ({}), expect: all(204) },
  "POST /api/auth/switch-company": { request: (f) => ({ body: { companyId: f.companyId } }), expect: signedIn(200) },
  "POST /api/auth/forgot-password": { request: () => ({ body: { email: uniqueEmail("nobody") } }), expect: all(202) },
  "POST /api/auth/reset-password": { request: () => ({ body: { token: NO_SUCH_TOKEN, password: TEST_PASSWORD } }), expect: all(404) },
  "GET /api/company": { request: () => ({}), expect: signedIn(200) },
  "PATCH /api/company": { request: () => ({ body: { phone: "+1 555 0100" } }), expect: ownerOnly(200) },
  "GET /api/members": { request: () => ({}), expect: signedIn(200) },
  "PATCH /api/members/:userId": { request: (f) => ({ path: `/api/members/${f.spare.userId}`, body: { role: "installer" } }), expect: ownerOnly(200) },
  "DELETE /api/members/:userId": { request: (f) => ({ path: `/api/members/${f.spare.userId}` }), expect: ownerOnly(204) },
  "GET /api/invitations": { request: () => ({}), expect: ownerOnly(200) },
  "POST /api/invitations": { request: () => ({ body: { email: uniqueEmail("matrix-invite"), role: "installer" } }), expect: ownerOnly(201) },
  "DELETE /api/invitations/:id": { request: (f) => ({ path: `/api/invitations/${f.invitationId}` }), expect: ownerOnly(204) },
  "POST /api/invitations/lookup": { request: () => ({ body: { token: NO_SUCH_TOKEN } }), expect: all(404) },
  "POST /api/invitations/accept": { request: () => ({ body: { token: NO_SUCH_TOKEN, name: "N", password: TEST_PASSWORD } }), expect: all(404) },
};

describe("role matrix: every route × role gets the expected status", () => {
  const t = useTestApp();

  it("has a row for every registered /api route, and no stale rows", () => {
    const registered = listRoutes(t.app.app)
      .filter((r) => r.path.startsWith("/api"))
      .map((r) => `${r.method} ${r.path}`);
    expect(registered.filter((key) => !(key in MATRIX)), "routes missing from MATRIX").toEqual([]);
    expect(Object.keys(MATRIX).filter((key) => !registered.includes(key)), "MATRIX rows for no route").toEqual([]);
  });

  it("marks every route with a guard (public, or a permission)", () => {
    const unguarded = listRoutes(t.app.app).filter((r) => r.path.startsWith("/api") && r.access === "unguarded");
    expect(unguarded.map((r) => `${r.method} ${r.path}`)).toEqual([]);
  });

  // One fresh company per route: denied callers go first and must change nothing; the Owner acts last.
  for (const [key, row] of Object.entries(MATRIX)) {
    it(key, async () => {
      const [method, template] = key.split(" ");
      const f = await companyFixture(t.db, t.app);
      const clients: Record<Who, ApiClient> = { anonymous: f.anonymous, installer: f.installer.api, estimator: f.estimator.api, owner: f.owner.api };
      const got: Record<string, number> = {};
      for (const who of WHO) {
        const { path = template, body } = row.request(f);
        const before = await companySnapshot(t.db, f.companyId);
        got[who] = (await clients[who].call(method, path, body)).status;
        // A refused caller changed nothing of the company's.
        if (got[who] === 401 || got[who] === 403) expect(await companySnapshot(t.db, f.companyId), `${who} ${key}`).toEqual(before);
      }
      expect(got).toEqual(row.expect);
    });
  }
});
