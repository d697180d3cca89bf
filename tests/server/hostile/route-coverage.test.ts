// Every mounted route is covered by the accounts sweeps: the role matrix, the tenancy sweep's
// targets, the CSRF sweep, the hostile-body sweep and the rate-limit sweep (tests/server/accounts/).
// Those sweeps walk listRoutes() themselves; this file reads their tables from their source and
// checks them against the route table, so a sweep that stopped being exhaustive (a filter added, a
// table rewritten) fails here too, naming the route. Then the session cookie's flags, which come
// from one place (express-session), under each COOKIE_SECURE setting, on every route that starts a
// session.
import { readdirSync, readFileSync, statSync } from "node:fs";
import path from "node:path";
import { fileURLToPath } from "node:url";
import { describe, expect, it } from "vitest";
import { listRoutes, type RouteEntry } from "../../../server/routes/route-table.js";
import { TEST_PASSWORD, signUpCompany, uniqueEmail } from "../../support/accounts.js";
import { ApiClient, type ApiResponse } from "../../support/api.js";
import { startTestApp, useTestApp } from "../../support/app.js";
import { linkIn, tokenOf, waitForMail } from "../../support/mail.js";
import { rateLimitedRoutes } from "./route-walk.js";

const accounts = fileURLToPath(new URL("../accounts/", import.meta.url));
const source = (file: string) => readFileSync(path.join(accounts, file), "utf8");

/** The text of `const NAME … = {` (or `[`) up to the first line that is only its closing `};` or `];`. */
function tableText(text: string, name: string): string {
  const start = text.search(new RegExp(`const ${name}\\b.*= [\\[{]$`, "m"));
  expect(start, `no table ${name}`).toBeGreaterThanOrEqual(0);
  const close = /\n\s*[}\]];/g;
  close.lastIndex = start;
  const end = close.exec(text)?.index ?? -1;
  expect(end, `no end of table ${name}`).toBeGreaterThan(start);
  return text.slice(start, end);
}
/** Keys like "GET /api/…": as written in a table. */
const routeKeys = (text: string) => [...text.matchAll(/^\s*"((?:GET|POST|PUT|PATCH|DELETE) \/api[^"]*)":/gm)].map((m) => m[1]);
const keyOf = (r: RouteEntry) => `${r.method} ${r.path}`;

describe("every route is in every accounts sweep", () => {
  const t = useTestApp();
  const routes = () => listRoutes(t.app.app).filter((r) => r.path.startsWith("/api"));

  it("the route table has the routes of every router (a sanity check of listRoutes itself)", () => {
    const keys = routes().map(keyOf);
    expect(keys.length).toBeGreaterThan(70);
    for (const key of ["GET /api/health", "POST /api/webhooks/stripe", "POST /api/company/logo", "GET /api/price-list/export.csv", "POST /api/quote-links/:token/deposit", "POST /api/payments/:paymentId/refunds"]) expect(keys).toContain(key);
    expect(new Set(keys).size, "a route is registered twice").toBe(keys.length);
  });

  it("every route has a guard and a row in the role matrix", () => {
    const matrix = new Set(routeKeys(tableText(source("role-matrix.test.ts"), "MATRIX")));
    expect(matrix.size).toBeGreaterThan(70);
    expect(routes().filter((r) => r.access === "unguarded").map(keyOf), "routes without a guard").toEqual([]);
    expect(routes().map(keyOf).filter((k) => !matrix.has(k)), "routes missing from role-matrix.test.ts MATRIX").toEqual([]);
  });

  it("every id a signed-in route takes has a tenancy target; only client-link tokens are left to their own proof", () => {
    const text = source("tenancy-sweep.test.ts");
    const targets = new Set([...tableText(text, "TARGETS").matchAll(/^\s*(\w+): /gm)].map((m) => m[1]));
    expect(targets.size).toBeGreaterThan(5);
    // The sweep walks every non-public route with an id; none is filtered out otherwise.
    expect(text, "tenancy-sweep.test.ts no longer walks every non-public route with an id").toContain('r.path.startsWith("/api") && r.params.length > 0 && r.access !== "public"');
    const missing = routes()
      .filter((r) => r.access !== "public")
      .flatMap((r) => r.params.filter((p) => !targets.has(p)).map((p) => `${keyOf(r)} :${p}`));
    expect(missing, "route ids without a target in tenancy-sweep.test.ts TARGETS").toEqual([]);
    // Public routes with an id are the client's link: the token is the authority, tested in the estimates suites.
    const publicWithIds = routes().filter((r) => r.access === "public" && r.params.length > 0);
    expect(publicWithIds.map((r) => r.params.join(",")).every((p) => p === "token")).toBe(true);
    expect(publicWithIds.every((r) => r.path.startsWith("/api/quote-links/:token"))).toBe(true);
  });

  it("the CSRF sweep covers every state-changing route; only Stripe's signed webhook is left out", () => {
    const text = source("abuse.test.ts");
    const csrf = text.slice(text.indexOf('describe("CSRF'), text.indexOf('describe("no password hash'));
    const changes = /const changes = listRoutes\(t\.app\.app\)\.filter\(\(r\) => (.*)\);/.exec(csrf)?.[1];
    expect(changes, "abuse.test.ts's CSRF sweep chooses its routes differently now: check it still takes every state-changing route").toBe(
      'r.path.startsWith("/api") && r.method !== "GET" && r.path !== "/api/webhooks/stripe"',
    );
    const exempt = [...(changes ?? "").matchAll(/r\.path !== "([^"]+)"/g)].map((m) => m[1]);
    expect(exempt).toEqual(["/api/webhooks/stripe"]);
    // The methods there are: GET (safe, needs no header) and the changes the sweep sends.
    expect([...new Set(routes().map((r) => r.method))].sort()).toEqual(["DELETE", "GET", "PATCH", "POST", "PUT"]);
    // The webhook is mounted before the API's CSRF guard on purpose; it is public and its only method is POST.
    expect(routes().filter((r) => r.path === "/api/webhooks/stripe").map((r) => [r.method, r.access])).toEqual([["POST", "public"]]);
  });

  it("the hostile-body sweep has a valid body for every route that reads one", () => {
    const text = source("abuse.test.ts");
    const valid = new Set(routeKeys(tableText(text, "VALID")));
    const writes = routes().filter((r) => ["POST", "PATCH", "PUT"].includes(r.method) && r.path !== "/api/auth/sign-out");
    expect(writes.map(keyOf).filter((k) => !valid.has(k)), "routes missing from abuse.test.ts VALID").toEqual([]);
    expect(text, "abuse.test.ts's hostile-body sweep chooses its routes differently now").toContain('["POST", "PATCH", "PUT"].includes(r.method) && r.path !== "/api/auth/sign-out"');
  });

  it("every rate-limited route is in the rate-limit sweep, and every public route that changes something is limited", () => {
    const text = source("abuse.test.ts");
    const listed = new Set([...tableText(text, "LIMITED").matchAll(/\[["`](\/api[^"`]+)["`]/g)].map((m) => m[1].replace(/\$\{NO_SUCH_TOKEN\}/g, ":token")));
    const limited = rateLimitedRoutes(t.app.app);
    expect(limited.length).toBeGreaterThanOrEqual(9);
    expect(limited.filter((key) => !key.startsWith("POST ")), "a limited route that is not a POST").toEqual([]);
    expect(limited.map((key) => key.slice(5)).filter((p) => !listed.has(p)), "limited routes missing from abuse.test.ts LIMITED").toEqual([]);
    // Sign-out only ends the caller's own session; Stripe's webhook is signed (and retried by Stripe).
    const unlimited = routes().filter((r) => r.access === "public" && r.method !== "GET" && !limited.includes(keyOf(r)));
    expect(unlimited.map(keyOf).sort()).toEqual(["POST /api/auth/sign-out", "POST /api/webhooks/stripe"]);
  });
});

describe("the session cookie", () => {
  const t = useTestApp();

  it("comes only from express-session: no route sets or writes a cookie itself", () => {
    const server = fileURLToPath(new URL("../../../server/", import.meta.url));
    const files: string[] = [];
    const walk = (dir: string) => {
      for (const name of readdirSync(dir)) {
        const full = path.join(dir, name);
        if (statSync(full).isDirectory()) walk(full);
        else if (name.endsWith(".ts")) files.push(full);
      }
    };
    walk(server);
    // The Stripe fake is another server, and the bench scripts are clients.
    const app = files.filter((f) => !f.includes(`${path.sep}fakes${path.sep}`) && !f.includes(`${path.sep}scripts${path.sep}`));
    const setters = app.filter((f) => /\bres\.cookie\(|setHeader\(\s*["']set-cookie/i.test(readFileSync(f, "utf8"))).map((f) => path.relative(server, f));
    expect(setters).toEqual([]);
    const clearers = app.filter((f) => /clearCookie\(/.test(readFileSync(f, "utf8"))).map((f) => path.relative(server, f));
    expect(clearers).toEqual(["routes/auth.routes.ts"]);
  });

  const cookieOf = (response: ApiResponse) => ([] as string[]).concat(response.headers["set-cookie"] ?? []).find((c) => c.startsWith("runwright.sid="));

  /** Starts a session through every route that can: sign-up, sign-in, an accepted invitation, a password reset. */
  async function sessionStarts(app: Awaited<ReturnType<typeof startTestApp>>, headers: Record<string, string>): Promise<Array<[string, ApiResponse]>> {
    const out: Array<[string, ApiResponse]> = [];
    // Invitations and reset links are made on the suite's usual app (plain HTTP, "auto"): the tokens
    // are rows in the database, used here through `app`.
    const owner = await signUpCompany(t.app);
    const email = uniqueEmail("cookie");
    out.push(["sign-up", await new ApiClient(app.app, headers).post("/api/auth/sign-up", { companyName: "Cookie Co", name: "C", email, password: TEST_PASSWORD })]);
    out.push(["sign-in", await new ApiClient(app.app, headers).post("/api/auth/sign-in", { email, password: TEST_PASSWORD })]);
    const invitee = uniqueEmail("cookie-invitee");
    expect((await owner.api.post("/api/invitations", { email: invitee, role: "installer" })).status).toBe(201);
    const invitation = tokenOf(linkIn(await waitForMail(invitee), `${t.app.url}/join#token=`));
    out.push(["invitation accept", await new ApiClient(app.app, headers).post("/api/invitations/accept", { token: invitation, name: "Invited", password: TEST_PASSWORD })]);
    expect((await new ApiClient(t.app.app).post("/api/auth/forgot-password", { email })).status).toBe(202);
    const reset = tokenOf(linkIn(await waitForMail(email), `${t.app.url}/reset-password#token=`));
    out.push(["password reset", await new ApiClient(app.app, headers).post("/api/auth/reset-password", { token: reset, password: `${TEST_PASSWORD}-2` })]);
    for (const [what, response] of out) expect(response.status, `${what}: ${JSON.stringify(response.body)}`).toBeLessThan(300);
    return out;
  }

  it("COOKIE_SECURE=true: Secure, HttpOnly, SameSite=Lax on every session start over HTTPS, and never sent over plain HTTP", async () => {
    const app = await startTestApp(t.db, { cookieSecure: "true" });
    try {
      for (const [what, response] of await sessionStarts(app, { "X-Forwarded-Proto": "https" })) {
        const cookie = cookieOf(response);
        expect(cookie, what).toBeDefined();
        expect(cookie, what).toMatch(/;\s*Secure(;|$)/i);
        expect(cookie, what).toMatch(/;\s*HttpOnly(;|$)/i);
        expect(cookie, what).toMatch(/;\s*SameSite=Lax(;|$)/i);
        expect(cookie, what).toMatch(/;\s*Path=\/(;|$)/);
      }
      // Over plain HTTP the session works for the request but no cookie is handed out.
      for (const [what, response] of await sessionStarts(app, {})) expect(cookieOf(response), what).toBeUndefined();
    } finally {
      await app.close();
    }
  });

  it("COOKIE_SECURE=false: never Secure, even behind an HTTPS proxy; still HttpOnly and SameSite=Lax", async () => {
    const app = await startTestApp(t.db, { cookieSecure: "false" });
    try {
      for (const [what, response] of await sessionStarts(app, { "X-Forwarded-Proto": "https" })) {
        const cookie = cookieOf(response);
        expect(cookie, what).toBeDefined();
        expect(cookie, what).not.toMatch(/;\s*Secure/i);
        expect(cookie, what).toMatch(/;\s*HttpOnly(;|$)/i);
        expect(cookie, what).toMatch(/;\s*SameSite=Lax(;|$)/i);
      }
    } finally {
      await app.close();
    }
  });

  it("COOKIE_SECURE=auto (the default): Secure exactly when the request came over HTTPS", async () => {
    for (const [headers, secure] of [
      [{ "X-Forwarded-Proto": "https" }, true],
      [{}, false],
    ] as const) {
      for (const [what, response] of await sessionStarts(t.app, headers)) {
        const cookie = cookieOf(response);
        expect(cookie, what).toMatch(/;\s*HttpOnly(;|$)/i);
        expect(/;\s*Secure(;|$)/i.test(cookie ?? ""), `${what} over ${secure ? "HTTPS" : "HTTP"}`).toBe(secure);
      }
    }
  });
});
