import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { listRoutes } from "../../../server/routes/route-table.js";
import { companyFixture, companySnapshot, type CompanyFixture } from "../../support/fixtures.js";
import { useTestApp } from "../../support/app.js";
import { TINY_PNG } from "../../support/jobs.js";
import type { QuoteWork } from "../../support/quotes.js";

// For each route parameter, which of company A's resources to aim at. A new
// route with a new parameter fails the sweep until it is added here.
const TARGETS: Record<string, (a: CompanyFixture) => string> = {
  userId: (a) => a.spare.userId,
  id: (a) => a.invitationId,
  clientId: (a) => a.work.clientId,
  jobId: (a) => a.work.jobId,
  systemId: (a) => a.work.systemId,
  profileId: (a) => a.work.profileId,
  attachmentId: (a) => a.work.attachmentId,
  itemId: () => quoteWorkOfA.priceItemId,
  quoteId: () => quoteWorkOfA.quoteId,
  paymentId: () => quoteWorkOfA.paymentId,
};
// A's price list and sent quote, made before the sweep.
let quoteWorkOfA: QuoteWork & { paymentId: string };

// A valid body for routes that read one, so the answer is about the id and not the input.
const BODIES: Record<string, unknown> = {
  "PATCH /api/members/:userId": { role: "installer" },
  "PATCH /api/clients/:clientId": { name: "Taken over" },
  "PATCH /api/jobs/:jobId": { title: "Taken over" },
  "PUT /api/systems/:systemId": { version: 1, document: { format: "runwright-system/1", units: "metric", nominalVoltage: 12, points: [], sources: [], runs: [], loads: [] } },
  "POST /api/systems/:systemId/solve": {},
  "POST /api/systems/:systemId/autosize": {},
  "POST /api/jobs/:jobId/systems": { name: "Planted" },
  "PATCH /api/limit-profiles/:profileId": { notes: "Taken over" },
  "PATCH /api/price-list/:itemId": { description: "Taken over" },
  "PUT /api/jobs/:jobId/estimate": { version: 1, markupPercent: 99 },
  "POST /api/jobs/:jobId/quotes": {},
  "POST /api/quotes/:quoteId/send": {},
  "POST /api/payments/:paymentId/refunds": { amountMinor: 100 },
};

describe("tenancy sweep: a member of company B never reaches company A's resources", () => {
  const t = useTestApp();
  let a: CompanyFixture;
  let b: CompanyFixture;

  beforeAll(async () => {
    a = await companyFixture(t.db, t.app);
    b = await companyFixture(t.db, t.app);
    // Sent, accepted and its deposit paid, so payment routes have a target too.
    quoteWorkOfA = await a.paid();
  });

  it("finds the routes that take a resource id from Express's router", () => {
    const withIds = listRoutes(t.app.app).filter((r) => r.path.startsWith("/api") && r.params.length > 0);
    expect(withIds.map((r) => `${r.method} ${r.path}`)).toEqual(
      expect.arrayContaining(["PATCH /api/members/:userId", "DELETE /api/members/:userId", "DELETE /api/invitations/:id"]),
    );
  });

  it("answers 404 to B's Owner for every one of them, and changes nothing of A's", async () => {
    // Client-link routes are public by design: the token is the authority, not the session.
    const routes = listRoutes(t.app.app).filter((r) => r.path.startsWith("/api") && r.params.length > 0 && r.access !== "public");
    const before = await companySnapshot(t.db, a.companyId);
    for (const route of routes) {
      let path = route.path;
      for (const param of route.params) {
        const target = TARGETS[param];
        expect(target, `no target for :${param} of ${route.method} ${route.path}; add it to TARGETS`).toBeDefined();
        path = path.replace(`:${param}`, target(a));
      }
      // B's Owner has every permission, so only tenancy can refuse.
      const response = await b.owner.api.call(route.method, path, BODIES[`${route.method} ${route.path}`]);
      expect(response.status, `${route.method} ${path}`).toBe(404);
      expect(response.body.error.code).toBe("not_found");
    }
    expect(await companySnapshot(t.db, a.companyId)).toEqual(before);
  });

  it("uploads aimed at A's job or system are 404 too, and store nothing", async () => {
    const before = await companySnapshot(t.db, a.companyId);
    const photo = await b.owner.api.upload(`/api/jobs/${a.work.jobId}/attachments`, { content: TINY_PNG, name: "planted.png", type: "image/png" });
    expect(photo.status).toBe(404);
    const csv = await b.owner.api.upload(`/api/systems/${a.work.systemId}/runs.csv`, { content: "id,from,to,length,size\r\nx,bus,shed,1,16 mm2", name: "r.csv" }, { version: "1" });
    expect(csv.status).toBe(404);
    expect(await companySnapshot(t.db, a.companyId)).toEqual(before);
  });

  it("ids in a body are checked too: B cannot file a job under A's client or use A's limit profile", async () => {
    const job = await b.owner.api.post("/api/jobs", { clientId: a.work.clientId, title: "Poached" });
    expect(job.status).toBe(404);
    const system = await b.owner.api.post(`/api/jobs/${b.work.jobId}/systems`, { name: "Borrowed limits", limitProfileId: a.work.profileId });
    expect(system.status).toBe(404);
    const moved = await b.owner.api.patch(`/api/jobs/${b.work.jobId}`, { clientId: a.work.clientId });
    expect(moved.status).toBe(404);
    const lists = await Promise.all(["/api/clients", "/api/jobs", "/api/limit-profiles", `/api/jobs/${b.work.jobId}/attachments`].map((p) => b.owner.api.get(p)));
    const aIds = Object.values(a.work);
    for (const list of lists) expect(list.body.items.map((i: { id: string }) => i.id).filter((id: string) => aIds.includes(id))).toEqual([]);
  });

  it("the same routes reach B's own resources, so the 404s above are about tenancy", async () => {
    const own = await b.owner.api.patch(`/api/members/${b.spare.userId}`, { role: "installer" });
    expect(own.status).toBe(200);
    expect((await b.owner.api.get(`/api/systems/${b.work.systemId}`)).status).toBe(200);
    expect((await b.owner.api.get(`/api/attachments/${b.work.attachmentId}/file`)).status).toBe(200);
    expect((await b.owner.api.delete(`/api/invitations/${b.invitationId}`)).status).toBe(204);
  });

  it("ids that arrive in a body are checked too: B cannot switch into A", async () => {
    const response = await b.owner.api.post("/api/auth/switch-company", { companyId: a.companyId });
    expect(response.status).toBe(404);
    expect((await b.owner.api.get("/api/auth/session")).body.company.id).toBe(b.companyId);
  });

  it("every signed-in GET route without an id (lists, exports, settings, dashboard, logo) shows B nothing of A's", async () => {
    const routes = listRoutes(t.app.app).filter((r) => r.path.startsWith("/api") && r.method === "GET" && r.params.length === 0 && r.access !== "public");
    expect(routes.length).toBeGreaterThan(10);
    // A's ids, and a SKU only A's price list holds (B has no quote, so no prices).
    const marks = [a.companyId, a.owner.userId, a.estimator.userId, a.installer.userId, a.spare.userId, a.invitationId, ...Object.values(a.work), quoteWorkOfA.priceItemId, quoteWorkOfA.quoteId, quoteWorkOfA.paymentId, "T-CU-16"];
    expect((await a.owner.api.get("/api/price-list/export.csv")).text).toContain("T-CU-16");
    for (const route of routes) {
      const response = await b.owner.api.get(route.path);
      expect(response.status, route.path).toBeLessThan(500);
      const text = response.text ?? Buffer.from(response.body ?? "").toString("latin1");
      for (const mark of marks) expect(text, `${route.path} showed A's ${mark}`).not.toContain(mark);
    }
  });

  it("every list answers only the session's company", async () => {
    const members = await b.owner.api.get("/api/members");
    const aIds = [a.owner.userId, a.estimator.userId, a.installer.userId, a.spare.userId];
    expect(members.body.members.map((m: { userId: string }) => m.userId).filter((id: string) => aIds.includes(id))).toEqual([]);
    const invitations = await b.owner.api.get("/api/invitations");
    expect(invitations.body.invitations.map((i: { id: string }) => i.id)).not.toContain(a.invitationId);
    expect((await b.owner.api.get("/api/company")).body.id).toBe(b.companyId);
  });
});
