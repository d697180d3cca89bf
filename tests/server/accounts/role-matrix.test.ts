import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { listRoutes } from "../../../server/routes/route-table.js";
import type { ApiClient } from "../../support/api.js";
import { TEST_PASSWORD, uniqueEmail } from "../../support/accounts.js";
import { useTestApp } from "../../support/app.js";
import { companyFixture, companySnapshot, type CompanyFixture } from "../../support/fixtures.js";
import { TINY_PNG } from "../../support/jobs.js";

type Who = "anonymous" | "installer" | "estimator" | "owner";
const WHO: Who[] = ["anonymous", "installer", "estimator", "owner"];
// A well-formed link token that names nothing.
const NO_SUCH_TOKEN = `00000000-0000-4000-8000-000000000000.${"A".repeat(43)}`;

type Upload = { file: { content: Buffer | string; name: string; type?: string }; fields?: Record<string, string> };
interface Row {
  /** Called once per caller, just before its request (so a row can make a fresh thing to delete). */
  request: (f: CompanyFixture) => { path?: string; body?: unknown; upload?: Upload } | Promise<{ path?: string; body?: unknown; upload?: Upload }>;
  expect: Record<Who, number>;
}

const all = (status: number): Record<Who, number> => ({ anonymous: status, installer: status, estimator: status, owner: status });
const signedIn = (status: number): Record<Who, number> => ({ anonymous: 401, installer: status, estimator: status, owner: status });
const ownerOnly = (status: number): Record<Who, number> => ({ anonymous: 401, installer: 403, estimator: 403, owner: status });
/** Owners and Estimators change jobs; Installers only read. */
const writers = (status: number): Record<Who, number> => ({ anonymous: 401, installer: 403, estimator: status, owner: status });

// Fresh things to delete or save, one per caller, made by the company's Owner.
async function freshClient(f: CompanyFixture) {
  return (await f.owner.api.post("/api/clients", { name: "Matrix spare client" })).body.id as string;
}
async function freshJob(f: CompanyFixture) {
  return (await f.owner.api.post("/api/jobs", { clientId: f.work.clientId, title: "Matrix job" })).body.id as string;
}
async function freshSystem(f: CompanyFixture) {
  return (await f.owner.api.post(`/api/jobs/${f.work.jobId}/systems`, { name: "Matrix system" })).body.id as string;
}
async function currentSystem(f: CompanyFixture) {
  return (await f.owner.api.get(`/api/systems/${f.work.systemId}`)).body as { version: number; document: unknown };
}

const sku = () => `M-${Math.random().toString(36).slice(2, 10)}`;
const matrixItem = () => ({ sku: sku(), description: "Matrix lug", category: "termination", unit: "each", unitCostMinor: 150 });
async function freshPriceItem(f: CompanyFixture) {
  return (await f.owner.api.post("/api/price-list", matrixItem())).body.id as string;
}
async function withLogo(f: CompanyFixture) {
  expect((await f.owner.api.upload("/api/company/logo", { content: TINY_PNG, name: "logo.png", type: "image/png" })).status).toBe(200);
  return {};
}
/** Client-link answers: the first caller's answer counts, later ones find it answered. */
const firstAnswerCounts = { anonymous: 200, installer: 409, estimator: 409, owner: 409 };

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
  "GET /api/clients": { request: () => ({}), expect: signedIn(200) },
  "POST /api/clients": { request: () => ({ body: { name: "Matrix client" } }), expect: writers(201) },
  "GET /api/clients/:clientId": { request: (f) => ({ path: `/api/clients/${f.work.clientId}` }), expect: signedIn(200) },
  "PATCH /api/clients/:clientId": { request: (f) => ({ path: `/api/clients/${f.work.clientId}`, body: { phone: "+1 555 0199" } }), expect: writers(200) },
  "DELETE /api/clients/:clientId": { request: async (f) => ({ path: `/api/clients/${await freshClient(f)}` }), expect: writers(204) },
  "GET /api/jobs": { request: () => ({}), expect: signedIn(200) },
  "POST /api/jobs": { request: (f) => ({ body: { clientId: f.work.clientId, title: "Matrix job" } }), expect: writers(201) },
  "GET /api/jobs/:jobId": { request: (f) => ({ path: `/api/jobs/${f.work.jobId}` }), expect: signedIn(200) },
  "PATCH /api/jobs/:jobId": { request: (f) => ({ path: `/api/jobs/${f.work.jobId}`, body: { status: "quoted" } }), expect: writers(200) },
  "DELETE /api/jobs/:jobId": { request: async (f) => ({ path: `/api/jobs/${await freshJob(f)}` }), expect: writers(204) },
  "POST /api/jobs/:jobId/systems": { request: (f) => ({ path: `/api/jobs/${f.work.jobId}/systems`, body: { name: "Matrix system" } }), expect: writers(201) },
  "GET /api/jobs/:jobId/attachments": { request: (f) => ({ path: `/api/jobs/${f.work.jobId}/attachments` }), expect: signedIn(200) },
  "POST /api/jobs/:jobId/attachments": {
    request: (f) => ({ path: `/api/jobs/${f.work.jobId}/attachments`, upload: { file: { content: TINY_PNG, name: "matrix.png", type: "image/png" } } }),
    expect: writers(201),
  },
  "GET /api/systems/:systemId": { request: (f) => ({ path: `/api/systems/${f.work.systemId}` }), expect: signedIn(200) },
  "PUT /api/systems/:systemId": {
    request: async (f) => {
      const { version, document } = await currentSystem(f);
      return { path: `/api/systems/${f.work.systemId}`, body: { version, document } };
    },
    expect: writers(200),
  },
  "DELETE /api/systems/:systemId": { request: async (f) => ({ path: `/api/systems/${await freshSystem(f)}` }), expect: writers(204) },
  "POST /api/systems/:systemId/solve": { request: (f) => ({ path: `/api/systems/${f.work.systemId}/solve`, body: {} }), expect: signedIn(200) },
  "POST /api/systems/:systemId/autosize": { request: (f) => ({ path: `/api/systems/${f.work.systemId}/autosize`, body: {} }), expect: writers(200) },
  "GET /api/systems/:systemId/runs.csv": { request: (f) => ({ path: `/api/systems/${f.work.systemId}/runs.csv` }), expect: signedIn(200) },
  "POST /api/systems/:systemId/runs.csv": {
    request: async (f) => {
      const { version } = await currentSystem(f);
      const csv = (await f.owner.api.get(`/api/systems/${f.work.systemId}/runs.csv`)).text;
      return { path: `/api/systems/${f.work.systemId}/runs.csv`, upload: { file: { content: csv, name: "runs.csv", type: "text/csv" }, fields: { version: String(version) } } };
    },
    expect: writers(200),
  },
  "GET /api/limit-profiles": { request: () => ({}), expect: signedIn(200) },
  "POST /api/limit-profiles": { request: () => ({ body: { name: `Matrix ${Math.random().toString(36).slice(2, 8)}`, branchPercent: 3, totalPercent: 5, criticalPercent: 3 } }), expect: ownerOnly(201) },
  "GET /api/limit-profiles/:profileId": { request: (f) => ({ path: `/api/limit-profiles/${f.work.profileId}` }), expect: signedIn(200) },
  "PATCH /api/limit-profiles/:profileId": { request: (f) => ({ path: `/api/limit-profiles/${f.work.profileId}`, body: { notes: "Matrix" } }), expect: ownerOnly(200) },
  "DELETE /api/limit-profiles/:profileId": { request: (f) => ({ path: `/api/limit-profiles/${f.work.profileId}` }), expect: ownerOnly(204) },
  "GET /api/attachments/:attachmentId/file": { request: (f) => ({ path: `/api/attachments/${f.work.attachmentId}/file` }), expect: signedIn(200) },
  "GET /api/price-list": { request: () => ({}), expect: signedIn(200) },
  "POST /api/price-list": { request: () => ({ body: matrixItem() }), expect: writers(201) },
  "GET /api/price-list/export.csv": { request: () => ({}), expect: signedIn(200) },
  "POST /api/price-list/import.csv": {
    request: () => ({ upload: { file: { content: `sku,description,category,unit,unit_cost\r\n${sku()},Matrix fuse holder,fuse,each,9.50\r\n`, name: "prices.csv", type: "text/csv" } } }),
    expect: writers(200),
  },
  "PATCH /api/price-list/:itemId": { request: async (f) => ({ path: `/api/price-list/${await freshPriceItem(f)}`, body: { description: "Renamed" } }), expect: writers(200) },
  "DELETE /api/price-list/:itemId": { request: async (f) => ({ path: `/api/price-list/${await freshPriceItem(f)}` }), expect: writers(204) },
  "GET /api/company/estimating": { request: () => ({}), expect: signedIn(200) },
  "PATCH /api/company/estimating": { request: () => ({ body: { wastePercent: 12 } }), expect: ownerOnly(200) },
  "GET /api/company/logo": { request: withLogo, expect: signedIn(200) },
  "POST /api/company/logo": { request: () => ({ upload: { file: { content: TINY_PNG, name: "logo.png", type: "image/png" } } }), expect: ownerOnly(200) },
  "DELETE /api/company/logo": { request: () => ({}), expect: ownerOnly(204) },
  "GET /api/jobs/:jobId/estimate": { request: async (f) => (await f.quotes(), { path: `/api/jobs/${f.work.jobId}/estimate` }), expect: signedIn(200) },
  "POST /api/jobs/:jobId/estimate/generate": { request: (f) => ({ path: `/api/jobs/${f.work.jobId}/estimate/generate` }), expect: writers(200) },
  "PUT /api/jobs/:jobId/estimate": {
    request: async (f) => {
      await f.quotes();
      const { version } = (await f.owner.api.get(`/api/jobs/${f.work.jobId}/estimate`)).body as { version: number };
      return { path: `/api/jobs/${f.work.jobId}/estimate`, body: { version, markupPercent: 15 } };
    },
    expect: writers(200),
  },
  "GET /api/jobs/:jobId/quotes": { request: (f) => ({ path: `/api/jobs/${f.work.jobId}/quotes` }), expect: signedIn(200) },
  "POST /api/jobs/:jobId/quotes": { request: async (f) => (await f.quotes(), { path: `/api/jobs/${f.work.jobId}/quotes`, body: {} }), expect: writers(201) },
  "GET /api/jobs/:jobId/cut-list.pdf": { request: async (f) => (await f.accepted(), { path: `/api/jobs/${f.work.jobId}/cut-list.pdf` }), expect: signedIn(200) },
  "GET /api/quotes/:quoteId": { request: async (f) => ({ path: `/api/quotes/${(await f.quotes()).quoteId}` }), expect: signedIn(200) },
  "GET /api/quotes/:quoteId/pdf": { request: async (f) => ({ path: `/api/quotes/${(await f.quotes()).quoteId}/pdf` }), expect: signedIn(200) },
  "POST /api/quotes/:quoteId/send": { request: async (f) => ({ path: `/api/quotes/${(await f.quotes()).quoteId}/send`, body: {} }), expect: writers(200) },
  "POST /api/quotes/:quoteId/link": { request: async (f) => ({ path: `/api/quotes/${(await f.quotes()).quoteId}/link` }), expect: writers(200) },
  "DELETE /api/quotes/:quoteId/link": { request: async (f) => ({ path: `/api/quotes/${(await f.quotes()).quoteId}/link` }), expect: writers(204) },
  "GET /api/quote-links/:token": { request: async (f) => ({ path: `/api/quote-links/${(await f.quotes()).token}` }), expect: all(200) },
  "GET /api/quote-links/:token/pdf": { request: async (f) => ({ path: `/api/quote-links/${(await f.quotes()).token}/pdf` }), expect: all(200) },
  "POST /api/quote-links/:token/accept": { request: async (f) => ({ path: `/api/quote-links/${(await f.quotes()).token}/accept`, body: { name: "Matrix Client", agree: true } }), expect: firstAnswerCounts },
  "POST /api/quote-links/:token/decline": { request: async (f) => ({ path: `/api/quote-links/${(await f.quotes()).token}/decline`, body: {} }), expect: firstAnswerCounts },
  "GET /api/dashboard": { request: () => ({}), expect: signedIn(200) },
  // Deposits: "Pay deposit" is the client's (the link is the authority); a second press reuses the session.
  "POST /api/quote-links/:token/deposit": { request: async (f) => ({ path: `/api/quote-links/${(await f.accepted()).token}/deposit` }), expect: all(200) },
  "GET /api/quote-links/:token/receipt.pdf": { request: async (f) => ({ path: `/api/quote-links/${(await f.paid()).token}/receipt.pdf` }), expect: all(200) },
  "GET /api/jobs/:jobId/payments": { request: (f) => ({ path: `/api/jobs/${f.work.jobId}/payments` }), expect: signedIn(200) },
  "GET /api/payments/:paymentId/receipt.pdf": { request: async (f) => ({ path: `/api/payments/${(await f.paid()).paymentId}/receipt.pdf` }), expect: signedIn(200) },
  "POST /api/payments/:paymentId/refunds": { request: async (f) => ({ path: `/api/payments/${(await f.paid()).paymentId}/refunds`, body: { amountMinor: 100 } }), expect: ownerOnly(201) },
  // Stripe's webhook: no session, no CSRF; the signature is the authority (an unsigned body is 400 for everyone).
  "POST /api/webhooks/stripe": { request: () => ({ body: { id: "evt_unsigned", type: "checkout.session.completed" } }), expect: all(400) },
  "DELETE /api/attachments/:attachmentId": {
    request: async (f) => {
      const photo = await f.owner.api.upload(`/api/jobs/${f.work.jobId}/attachments`, { content: TINY_PNG, name: "doomed.png", type: "image/png" });
      return { path: `/api/attachments/${photo.body.id}` };
    },
    expect: writers(204),
  },
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
        const { path = template, body, upload } = await row.request(f);
        const before = await companySnapshot(t.db, f.companyId);
        got[who] = (upload ? await clients[who].upload(path, upload.file, upload.fields) : await clients[who].call(method, path, body)).status;
        // A refused caller changed nothing of the company's.
        if (got[who] === 401 || got[who] === 403) expect(await companySnapshot(t.db, f.companyId), `${who} ${key}`).toEqual(before);
      }
      expect(got).toEqual(row.expect);
    });
  }
});
