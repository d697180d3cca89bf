// SQL-injection strings, wildcards, NULs and very long values in every query parameter the API
// reads (search, filters, sort, paging, download, apply) and in every id or token in a path: each
// answer is 200 with a normal, correctly filtered result or a 4xx naming the parameter — never a
// 500 — and nothing of the company changes, and every table is still there.
import { readdirSync, readFileSync } from "node:fs";
import { fileURLToPath } from "node:url";
import { beforeAll, describe, expect, it } from "vitest";
import { listRoutes } from "../../../server/routes/route-table.js";
import { AttachmentListQuery, ClientListQuery, JobListQuery, LimitProfileListQuery } from "../../../shared/schemas/jobs.js";
import { signUpCompany, type SignedInOwner } from "../../support/accounts.js";
import { ApiClient } from "../../support/api.js";
import { useTestApp } from "../../support/app.js";
import { companySnapshot } from "../../support/fixtures.js";
import { createJobWork, type JobWork } from "../../support/jobs.js";
import { createQuoteWork, type QuoteWork } from "../../support/quotes.js";

const HOSTILE = [
  "' OR 1=1 --",
  "'; DROP TABLE job; --",
  "1; DROP TABLE client",
  "%' --",
  "%",
  "_",
  "\\",
  "\\\\'",
  '" OR ""="',
  "\u0000",
  "a\u0000' OR 1=1",
  "$1",
  ":companyId",
  "x".repeat(10_000),
  "1e309",
  "-1",
  "0",
  "1.5",
  "99999999999999999999",
  "NaN",
  "__proto__",
  "constructor",
  "name; SELECT pg_sleep(5)",
  "-name,id",
  "ñ'ü∂\u202E",
];

// The list routes and their query parameters (shared/schemas/jobs.ts listQuery()), and the other
// parameters routes read from req.query. A parameter read anywhere in server/routes but missing here
// fails the first test.
const LISTS: Record<string, { path: (w: JobWork) => string; schema: { shape: Record<string, unknown> } }> = {
  "GET /api/clients": { path: () => "/api/clients", schema: ClientListQuery },
  "GET /api/jobs": { path: () => "/api/jobs", schema: JobListQuery },
  "GET /api/limit-profiles": { path: () => "/api/limit-profiles", schema: LimitProfileListQuery },
  "GET /api/jobs/:jobId/attachments": { path: (w) => `/api/jobs/${w.jobId}/attachments`, schema: AttachmentListQuery },
};
/** Routes that read a flag: any value only switches the flag. */
const FLAGS: Record<string, { param: string; path: (w: JobWork, q: QuoteWork & { paymentId: string }) => string }> = {
  "GET /api/attachments/:attachmentId/file": { param: "download", path: (w) => `/api/attachments/${w.attachmentId}/file` },
  "GET /api/quotes/:quoteId/pdf": { param: "download", path: (_w, q) => `/api/quotes/${q.quoteId}/pdf` },
  "GET /api/jobs/:jobId/cut-list.pdf": { param: "download", path: (w) => `/api/jobs/${w.jobId}/cut-list.pdf` },
  "GET /api/quote-links/:token/pdf": { param: "download", path: (_w, q) => `/api/quote-links/${q.token}/pdf` },
  "GET /api/quote-links/:token/receipt.pdf": { param: "download", path: (_w, q) => `/api/quote-links/${q.token}/receipt.pdf` },
  "GET /api/payments/:paymentId/receipt.pdf": { param: "download", path: (_w, q) => `/api/payments/${q.paymentId}/receipt.pdf` },
};

// A valid body for routes that check the body before the id, so the answer is about the id.
const BODIES: Record<string, unknown> = {
  "POST /api/quote-links/:token/accept": { name: "Injected Client", agree: true },
};

const q = (name: string, value: string) => `${encodeURIComponent(name)}=${encodeURIComponent(value)}`;

describe("hostile query parameters and path ids", () => {
  const t = useTestApp();
  let owner: SignedInOwner;
  let work: JobWork;
  let quotes: QuoteWork & { paymentId: string };

  /** Everything of the company, and proof that no table went missing. */
  const state = async () => ({
    company: await companySnapshot(t.db, owner.companyId),
    tables: await t.db.query(`SELECT to_regclass('public.job') AS job, to_regclass('public.client') AS client, to_regclass('public.company') AS company`),
  });

  beforeAll(async () => {
    owner = await signUpCompany(t.app);
    work = await createJobWork(owner.api);
    // Names with the characters LIKE treats specially, so a search for them has one right answer.
    for (const name of ["O'Brien 100% _under\\score", "Plain Client"]) expect((await owner.api.post("/api/clients", { name })).status).toBe(201);
    const quoteWork = await createQuoteWork(owner.api, work.jobId, t.app.url);
    const { payDeposit } = await import("../../support/stripe.js");
    quotes = { ...quoteWork, paymentId: await payDeposit(t.app, owner.api, work.jobId, quoteWork.token) };
  }, 60_000);

  it("knows every query parameter the routes read", () => {
    const routesDir = fileURLToPath(new URL("../../../server/routes/", import.meta.url));
    const read = new Set<string>();
    const schemas = new Set<string>();
    for (const file of readdirSync(routesDir).filter((f) => f.endsWith(".routes.ts"))) {
      const source = readFileSync(`${routesDir}${file}`, "utf8");
      for (const m of source.matchAll(/req\.query\.(\w+)/g)) read.add(m[1]);
      for (const m of source.matchAll(/(\w+)\.parse\(req\.query\)/g)) schemas.add(m[1]);
      // Nothing reads the query some other way (destructuring, bracket access, whole-object use).
      expect(source.replace(/req\.query\.\w+/g, "").replace(/\w+\.parse\(req\.query\)/g, ""), file).not.toMatch(/req\.query/);
    }
    expect([...schemas].sort()).toEqual(["AttachmentListQuery", "ClientListQuery", "JobListQuery", "LimitProfileListQuery"]);
    expect([...read].sort()).toEqual(["apply", "download"]);
    // Every GET route that lists is here; every route with a flag is here.
    const gets = listRoutes(t.app.app).filter((r) => r.method === "GET").map((r) => `${r.method} ${r.path}`);
    for (const key of [...Object.keys(LISTS), ...Object.keys(FLAGS)]) expect(gets, key).toContain(key);
    const downloadRoutes = listRoutes(t.app.app).filter((r) => /\.pdf$|\/pdf$|\/file$/.test(r.path)).map((r) => `${r.method} ${r.path}`);
    expect(downloadRoutes.sort()).toEqual(Object.keys(FLAGS).sort());
  });

  for (const [key, list] of Object.entries(LISTS)) {
    it(`${key}: every parameter × every hostile value is 200 (filtered) or 400 naming it, never 500, and changes nothing`, async () => {
      const params = Object.keys(list.schema.shape);
      expect(params.length).toBeGreaterThanOrEqual(4);
      const before = await state();
      let answered = 0;
      for (const param of [...params, "search[$ne]", "unknown"]) {
        for (const value of HOSTILE) {
          const response = await owner.api.get(`${list.path(work)}?${q(param, value)}`);
          answered++;
          const label = `${key} ?${param}=${JSON.stringify(value.slice(0, 40))}`;
          expect([200, 400], `${label}: ${response.status} ${JSON.stringify(response.body).slice(0, 200)}`).toContain(response.status);
          if (response.status === 400) {
            expect(response.body.error.code, label).toBe("invalid_input");
            // Named: as the field (zod), or quoted in the message for a key the list does not take.
            const named = response.body.error.details?.fields?.[param] !== undefined || response.body.error.message.includes(`"${param}"`);
            expect(named, `${label}: ${response.body.error.message}`).toBe(true);
          } else {
            expect(Array.isArray(response.body.items), label).toBe(true);
            expect(response.body.items.length, label).toBeLessThanOrEqual(response.body.pageSize);
            if (param === "search") {
              // A search matches its text literally: % _ \ and quotes are characters, not patterns.
              const needle = value.trim().toLowerCase();
              for (const item of response.body.items as Array<Record<string, unknown>>) {
                const haystack = [item.name, item.email, item.phone, item.title, item.siteAddress, (item.client as { name?: string } | undefined)?.name, item.fileName].filter((v) => typeof v === "string").join("\n").toLowerCase();
                expect(haystack, `${label} returned ${JSON.stringify(item).slice(0, 120)}`).toContain(needle);
              }
            }
          }
        }
      }
      // Parameters repeated (?x=1&x=2) and bracketed (?search[]=…) are refused the same way.
      for (const param of params) {
        const repeated = await owner.api.get(`${list.path(work)}?${q(param, "1")}&${q(param, "' OR 1=1 --")}`);
        expect(repeated.status, `${key} repeated ${param}`).toBe(400);
      }
      expect(answered).toBe((params.length + 2) * HOSTILE.length);
      expect(await state()).toEqual(before);
    });
  }

  it("a search for LIKE's own characters finds the one client whose name holds them, and only it", async () => {
    for (const needle of ["'", "%", "_", "\\", "100%", "_under\\", "O'B"]) {
      const response = await owner.api.get(`/api/clients?${q("search", needle)}`);
      expect(response.status, needle).toBe(200);
      expect(response.body.items.map((c: { name: string }) => c.name), needle).toEqual(["O'Brien 100% _under\\score"]);
    }
    const none = await owner.api.get(`/api/clients?${q("search", "' OR 1=1 --")}`);
    expect(none.body).toMatchObject({ items: [], total: 0 });
  });

  it("the download flag of every file route takes any value as a flag, and apply on the price list import as preview", async () => {
    const before = await state();
    for (const [key, flag] of Object.entries(FLAGS)) {
      for (const value of HOSTILE) {
        const response = await owner.api.get(`${flag.path(work, quotes)}?${q(flag.param, value)}`);
        expect(response.status, `${key} ${JSON.stringify(value.slice(0, 30))}`).toBe(200);
        // The file's name is ours (quote and receipt numbers, the stored name), never the query's.
        expect(response.headers["content-disposition"], key).toMatch(/^attachment; filename="?[A-Za-z0-9 ._-]+"?$/);
      }
    }
    const csv = "sku,description,category,unit,unit_cost\r\nINJ-1,Injected,other,each,1\r\n";
    for (const value of HOSTILE) {
      const response = await owner.api.upload(`/api/price-list/import.csv?${q("apply", value)}`, { content: csv, name: "p.csv" });
      expect(response.status, JSON.stringify(value.slice(0, 30))).toBe(200);
      expect(response.body.applied, JSON.stringify(value.slice(0, 30))).toBe(false);
    }
    expect(await state()).toEqual(before);
  });

  it("every id and token in a path: hostile values are 404 not_found for every method, and change nothing", async () => {
    const before = await state();
    const routes = listRoutes(t.app.app).filter((r) => r.path.startsWith("/api") && r.params.length > 0);
    expect(routes.length).toBeGreaterThan(30);
    const visitor = new ApiClient(t.app.app);
    let answered = 0;
    for (const route of routes) {
      for (const value of HOSTILE) {
        const path = route.path.replace(/:(\w+)/g, () => encodeURIComponent(value));
        const client = route.access === "public" ? visitor : owner.api;
        const response = await client.call(route.method, path, route.method === "GET" || route.method === "DELETE" ? undefined : (BODIES[`${route.method} ${route.path}`] ?? {}));
        answered++;
        const label = `${route.method} ${route.path} with ${JSON.stringify(value.slice(0, 30))}`;
        expect(response.status, `${label}: ${JSON.stringify(response.body).slice(0, 200)}`).toBe(404);
        expect(response.body.error.code, label).toBe("not_found");
      }
    }
    expect(answered).toBe(routes.length * HOSTILE.length);
    expect(await state()).toEqual(before);
    // The owner's things are all still reachable.
    expect((await owner.api.get(`/api/jobs/${work.jobId}`)).status).toBe(200);
    expect((await owner.api.get("/api/clients")).body.total).toBe(4);
  }, 120_000);

  it("the Stripe fake's event list filter (ours too) takes any text and answers only matching events", async () => {
    const account = t.app.stripe!;
    for (const value of HOSTILE) {
      const response = await fetch(`${account.apiBase}/_fake/events?${q("type", value)}`, { headers: { Authorization: `Bearer ${account.secretKey}` } });
      expect(response.status, JSON.stringify(value.slice(0, 30))).toBe(200);
      const body = (await response.json()) as { data: Array<{ type: string }> };
      expect(body.data.every((e) => e.type === value)).toBe(true);
    }
  });
});
