// Fuzz of POST /api/systems/:id/solve with generated network documents (tests/support/
// fuzz-documents.ts: valid, near-valid, extreme and broken documents, shared with the engine's fuzz
// in tests/shared/engine/fuzz.test.ts) sent as raw JSON bodies: NaN as "NaN" or null, ±Infinity
// as ±1e999 (which JSON.parse reads as ±Infinity), values nested 10,000 deep, 50,000-element
// arrays, bodies over the 1 MB limit, bodies that are not JSON or not an object, unknown keys.
// Every answer must be 200 with a result (or the engine's errors naming the field) or a 4xx in
// the one error shape naming the field; never a 5xx, never a hang; and the server's heap must be
// back where it started after the run.
// The app runs in this process (startTestApp), so its memory is this process's. Reproduce a run
// with FUZZ_SEED=<seed>; FUZZ_HTTP_RUNS changes the number of requests.
import fc from "fast-check";
import { performance } from "node:perf_hooks";
import v8 from "node:v8";
import vm from "node:vm";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { API_ERROR_CODES, ApiErrorBody } from "../../../shared/schemas/error.js";
import { MAX_JSON_BODY_BYTES } from "../../../shared/limits.js";
import { CSRF_HEADER } from "../../../shared/http.js";
import { TEST_PASSWORD, uniqueEmail } from "../../support/accounts.js";
import { useTestApp } from "../../support/app.js";
import { exampleSystem } from "../../support/jobs.js";
import { bigNetwork, describeCase, fuzzCase, NESTED_VALUES, problemsWith, type FuzzCase } from "../../support/fuzz-documents.js";

const SEED = Number(process.env.FUZZ_SEED ?? 20_261_202);
/** Requests in flight at once. One at a time a request takes about 10 ms here, most of it waiting
 *  for the session, account and system queries; eight at a time about 3.6 ms each. */
const IN_FLIGHT = 8;
const RUNS = Math.ceil(Number(process.env.FUZZ_HTTP_RUNS ?? 10_000) / IN_FLIGHT) * IN_FLIGHT;
/** One request taking longer than this is a hang. The solve runs on the event loop of this very
 *  process, so the abort signal cannot fire during it; the elapsed time is checked as well. */
const HANG_MS = Number(process.env.FUZZ_HANG_MS ?? 5000);

// A real gc() for the memory figures: the flag works once V8 is running, and a new context sees it.
v8.setFlagsFromString("--expose-gc");
const gc = vm.runInNewContext("gc") as (() => void) | undefined;

// ---------------------------------------------------------------------------------------------
// Raw JSON: what JSON.stringify cannot write (NaN, ±Infinity, a value nested 10,000 deep).

type NanAs = "string" | "null";

/** The document as JSON text, with NaN written as "NaN" or null, ±Infinity as ±1e999, and the
 *  nested values (fuzz-documents.ts nested()) as text (JSON.stringify overflows the stack on them). */
function rawJson(value: unknown, nanAs: NanAs): string {
  const raw: string[] = [];
  const token = (text: string) => `\u0000raw${raw.push(text) - 1}\u0000`;
  const text = JSON.stringify(value, (_key, v) => {
    if (typeof v === "number" && !Number.isFinite(v)) return token(Number.isNaN(v) ? (nanAs === "string" ? '"NaN"' : "null") : v > 0 ? "1e999" : "-1e999");
    if (v && typeof v === "object" && NESTED_VALUES.has(v)) {
      const { depth, kind } = NESTED_VALUES.get(v)!;
      return token(kind === "array" ? `${"[".repeat(depth + 1)}${"]".repeat(depth + 1)}` : `${'{"k":'.repeat(depth)}{}${"}".repeat(depth)}`);
    }
    return v;
  });
  return text.replace(/"\\u0000raw(\d+)\\u0000"/g, (_m, i: string) => raw[Number(i)]);
}

// ---------------------------------------------------------------------------------------------
// Bodies that are not a document in { document } (expected answer known in advance).

interface BodyCase { label: string; body: string; contentType?: string; status: number; code?: string; field?: string }
const bodyCase: fc.Arbitrary<BodyCase> = fc.oneof(
  fc.constantFrom<BodyCase>(
    { label: "not JSON", body: "{", status: 400, code: "invalid_json" },
    { label: "truncated", body: '{"document": {"format": "runwright-system/1", "points": [', status: 400, code: "invalid_json" },
    { label: "NaN literal", body: '{"document": {"nominalVoltage": NaN}}', status: 400, code: "invalid_json" },
    { label: "a string", body: '"document"', status: 400, code: "invalid_json" },
    { label: "a number", body: "5", status: 400, code: "invalid_json" },
    { label: "null", body: "null", status: 400, code: "invalid_json" },
    { label: "an array", body: "[]", status: 400, code: "invalid_input", field: "(body)" },
    { label: "unknown key", body: '{"document": {}, "docment": 1}', status: 400, code: "invalid_input", field: "docment" },
    { label: "__proto__ key", body: '{"__proto__": {"document": 1}}', status: 400, code: "invalid_input", field: "__proto__" },
    { label: "empty object (the saved document)", body: "{}", status: 200 },
    { label: "document null", body: '{"document": null}', status: 200 },
    { label: "duplicate keys", body: '{"document": {}, "document": 5}', status: 200 },
    { label: "text/plain (not read as JSON: the saved document)", body: '{"document": 5}', contentType: "text/plain", status: 200 },
  ),
  fc.integer({ min: 1000, max: 10_000 }).map((d): BodyCase => ({ label: `body nested ${d} deep`, body: `${"[".repeat(d)}${"]".repeat(d)}`, status: 400, code: "invalid_input", field: "(body)" })),
  fc.integer({ min: 1000, max: 10_000 }).map((d): BodyCase => ({ label: `document nested ${d} deep`, body: `{"document": ${'{"k":'.repeat(d)}{}${"}".repeat(d)}}`, status: 200 })),
  fc.constantFrom(MAX_JSON_BODY_BYTES - 200, MAX_JSON_BODY_BYTES + 1, 2 * MAX_JSON_BODY_BYTES).map((size): BodyCase => {
    const body = `{"document": {"name": "${"x".repeat(size - 26)}"}}`;
    return body.length > MAX_JSON_BODY_BYTES
      ? { label: `${body.length} bytes`, body, status: 413, code: "payload_too_large" }
      : { label: `${body.length} bytes`, body, status: 200 };
  }),
);

type HttpCase = { kind: "document"; c: FuzzCase; nanAs: NanAs; profiled: boolean } | { kind: "body"; b: BodyCase };
const httpCase: fc.Arbitrary<HttpCase> = fc.oneof(
  { weight: 95, arbitrary: fc.record({ c: fuzzCase({ textLengths: true, textLengthsResolved: true }), nanAs: fc.constantFrom<NanAs>("string", "null"), profiled: fc.boolean() }).map((x): HttpCase => ({ kind: "document", ...x })) },
  { weight: 5, arbitrary: bodyCase.map((b): HttpCase => ({ kind: "body", b })) },
);

/** The system's limit profile replaces the document's (system.service.ts withProfile): a mutation
 *  there is not refused, so for the system with a profile it does not count as one. */
function asSeenWithProfile(c: FuzzCase): FuzzCase {
  if (c.kind !== "near-valid") return c;
  const applied = c.applied.map((a) => (a.target?.startsWith("limitProfile") ? { ...a, target: undefined } : a));
  return applied.some((a) => a.target) ? { ...c, applied } : { ...c, kind: "broken", applied };
}

// ---------------------------------------------------------------------------------------------

describe("fuzz: POST /api/systems/:id/solve", () => {
  const t = useTestApp();
  let cookie = "";
  /** A system whose document's own limit profile applies, and one with the company's profile. */
  const systems = { own: "", profiled: "" };
  const memory = { before: process.memoryUsage(), after: process.memoryUsage(), peakRss: 0, peakHeap: 0, maxRssBefore: 0, maxRssAfter: 0 };

  async function call(path: string, body: string, contentType = "application/json"): Promise<{ status: number; text: string; ms: number }> {
    const started = performance.now();
    const response = await fetch(`${t.app.url}${path}`, {
      method: "POST",
      headers: { cookie, "content-type": contentType, [CSRF_HEADER]: "1" },
      body,
      signal: AbortSignal.timeout(HANG_MS),
    });
    const text = await response.text();
    return { status: response.status, text, ms: performance.now() - started };
  }
  async function json(path: string, value: unknown) {
    const r = await call(path, JSON.stringify(value));
    return { status: r.status, body: JSON.parse(r.text) };
  }

  beforeAll(async () => {
    const signUp = await fetch(`${t.app.url}/api/auth/sign-up`, {
      method: "POST",
      headers: { "content-type": "application/json", [CSRF_HEADER]: "1" },
      body: JSON.stringify({ companyName: "Fuzz Co", name: "Fay Fuzz", email: uniqueEmail("fuzz"), password: TEST_PASSWORD }),
    });
    expect(signUp.status).toBe(201);
    cookie = signUp.headers.getSetCookie().map((c) => c.split(";")[0]).join("; ");
    const client = await json("/api/clients", { name: "Fuzz client" });
    const job = await json("/api/jobs", { clientId: client.body.id, title: "Fuzz" });
    const own = await json(`/api/jobs/${job.body.id}/systems`, { name: "Own profile", limitProfileId: null, document: exampleSystem("cabin-24v") });
    const profiled = await json(`/api/jobs/${job.body.id}/systems`, { name: "Company profile", document: exampleSystem("cabin-24v") });
    expect([own.status, profiled.status]).toEqual([201, 201]);
    expect(own.body.limitProfileId).toBeNull();
    expect(profiled.body.limitProfileId).not.toBeNull();
    systems.own = own.body.id;
    systems.profiled = profiled.body.id;
    // mathjs (text lengths) loads on first use, about 0.6 s: once, before the clock starts.
    const warm = { ...exampleSystem("cabin-24v") } as Record<string, any>;
    warm.runs = warm.runs.map((r: Record<string, unknown>) => ({ ...r, length: `${r.length} m` }));
    const warmed = await call(`/api/systems/${systems.own}/solve`, JSON.stringify({ document: warm }));
    expect(warmed.status).toBe(200);
    expect(JSON.parse(warmed.text).ok).toBe(true);
    gc?.();
    memory.before = process.memoryUsage();
    memory.maxRssBefore = process.resourceUsage().maxRSS * 1024;
  });

  afterAll(() => {
    const mb = (n: number) => `${(n / 2 ** 20).toFixed(1)} MB`;
    console.info(`memory: heapUsed ${mb(memory.before.heapUsed)} → ${mb(memory.after.heapUsed)} after gc (sampled peak ${mb(memory.peakHeap)}), rss ${mb(memory.before.rss)} → ${mb(memory.after.rss)} (sampled peak ${mb(memory.peakRss)}; the process's maximum ${mb(memory.maxRssBefore)} before, ${mb(memory.maxRssAfter)} after); gc ${gc ? "available" : "not available"}`);
  });

  it(`answers ${RUNS} generated requests with 200 and a result or a 4xx naming the field; no 5xx, no hang; the heap comes back`, async () => {
    const counts = { valid: 0, "near-valid": 0, extreme: 0, broken: 0, body: 0 };
    const statuses = new Map<number, number>();
    let slowest = { ms: 0, what: "" };
    let sent = 0;
    const started = performance.now();
    const one = async (h: HttpCase) => {
        sent++;
        if (sent % 50 === 0) {
          const m = process.memoryUsage();
          memory.peakRss = Math.max(memory.peakRss, m.rss);
          memory.peakHeap = Math.max(memory.peakHeap, m.heapUsed);
        }
        let systemId = systems.own;
        let body: string;
        let contentType: string | undefined;
        if (h.kind === "body") {
          counts.body++;
          body = h.b.body;
          contentType = h.b.contentType;
        } else {
          counts[h.c.kind]++;
          if (h.profiled) systemId = systems.profiled;
          body = rawJson({ document: h.c.doc }, h.nanAs);
        }
        const r = await call(`/api/systems/${systemId}/solve`, body, contentType);
        statuses.set(r.status, (statuses.get(r.status) ?? 0) + 1);
        const what = h.kind === "body" ? `body: ${h.b.label}` : describeCase(h.c).split("\n")[0];
        if (r.ms > slowest.ms) slowest = { ms: r.ms, what };
        const fail = (message: string) => { throw new Error(`${what}\n${r.status} in ${Math.round(r.ms)} ms: ${message}\n${r.text.slice(0, 800)}`); };
        if (r.ms > HANG_MS) fail(`took ${Math.round(r.ms)} ms (limit ${HANG_MS} ms)`);
        if (r.status >= 500) fail("a server error");
        const answer = JSON.parse(r.text);
        if (r.status >= 400) {
          // The one error shape, with a known code, naming the field.
          if (!ApiErrorBody.safeParse(answer).success || !(API_ERROR_CODES as readonly string[]).includes(answer.error.code)) fail("not the error shape");
          if (answer.error.code === "invalid_input") {
            const fields = Object.keys(answer.error.details?.fields ?? {});
            if (fields.length === 0 || !answer.error.message.startsWith(fields[0])) fail("invalid_input without the field");
          }
        }
        if (h.kind === "body") {
          if (r.status !== h.b.status) fail(`expected ${h.b.status}`);
          if (h.b.code && answer.error?.code !== h.b.code) fail(`expected ${h.b.code}`);
          if (h.b.field && !answer.error.message.includes(h.b.field)) fail(`the message does not name ${h.b.field}`);
          if (r.status === 200 && typeof answer.ok !== "boolean") fail("not a solve result");
          return;
        }
        // A document: over the body limit 413, otherwise 200 with a result or the engine's errors.
        if (Buffer.byteLength(body) > MAX_JSON_BODY_BYTES) {
          if (r.status !== 413 || answer.error.code !== "payload_too_large") fail("expected 413 payload_too_large");
          return;
        }
        if (r.status !== 200) fail("expected 200");
        const problems = problemsWith(answer, h.profiled ? asSeenWithProfile(h.c) : h.c, true);
        if (problems.length > 0) fail(problems.slice(0, 5).join("\n"));
    };
    // Each run of the property sends IN_FLIGHT generated requests at once.
    await fc.assert(
      fc.asyncProperty(fc.array(httpCase, { minLength: IN_FLIGHT, maxLength: IN_FLIGHT }), async (batch) => {
        await Promise.all(batch.map(one));
      }),
      { numRuns: RUNS / IN_FLIGHT, seed: SEED },
    );
    const seconds = (performance.now() - started) / 1000;
    gc?.();
    memory.after = process.memoryUsage();
    memory.maxRssAfter = process.resourceUsage().maxRSS * 1024;
    const total = counts.valid + counts["near-valid"] + counts.extreme + counts.broken + counts.body;
    console.info(
      `HTTP fuzz (seed ${SEED}): ${total} requests in ${seconds.toFixed(1)} s — ${counts.valid} valid, ${counts["near-valid"]} near-valid, ${counts.extreme} extreme, ${counts.broken} broken documents, ${counts.body} other bodies; ` +
        `statuses ${[...statuses].sort().map(([s, n]) => `${s}×${n}`).join(", ")}; slowest ${Math.round(slowest.ms)} ms (${slowest.what})`,
    );
    // The count actually sent, and every kind of case among them.
    expect(total).toBe(RUNS);
    expect(sent).toBe(RUNS);
    expect(counts["near-valid"]).toBeGreaterThan(RUNS * 0.3);
    expect(counts.body).toBeGreaterThan(RUNS * 0.02);
    expect(statuses.get(413) ?? 0).toBeGreaterThan(0);
    expect([...statuses.keys()].every((s) => s === 200 || (s >= 400 && s < 500))).toBe(true);
    // Memory: after a full gc the heap holds what it held before plus what stays by design — the
    // solver's scratch arrays (sized by the largest network solved: a few MB at 60,000 points) and
    // the database pool's buffers. A leak of even 3 KB per request would pass 32 MB over the run.
    // Without gc() (the flag refused) the heap still holds the garbage of the last requests:
    // the bound is then 200 MB, what 1 MB requests with 100,000-error answers can leave behind.
    const growth = memory.after.heapUsed - memory.before.heapUsed;
    expect(growth).toBeLessThan((gc ? 32 : 200) * 2 ** 20);
    // The process's peak resident memory (the kernel's maximum): it starts near 210 MB; eight
    // requests in flight of at most 1 MB each, parsed into at most 60,000 objects and answered
    // with at most about 100,000 errors, add a few hundred MB at most (about 600 MB in all here).
    expect(memory.maxRssAfter).toBeLessThan(1024 * 2 ** 20);
    // Not a speed target (npm run bench:solve measures those): room for a loaded machine.
  }, 300_000);

  it("a network that would take minutes to solve is answered with TOO_LARGE in seconds (the API's work budget)", async () => {
    const cases = [
      // A 60 × 60 grid of runs whose constant-power loads collapse, 20 cases: 177 s before the budget.
      { name: "collapsing grid", doc: bigNetwork({ shape: "grid", size: 3600, watts: 5, cases: 20, cp: true }), ok: false },
      // 1,000 points joined by about 8,000 runs at random: 19 s before the budget.
      { name: "dense mesh", doc: bigNetwork({ shape: "dense", size: 1000, watts: 1, cases: 1, cp: false }), ok: false },
      // Within the budget: the same grid with resistive loads.
      { name: "resistive grid", doc: bigNetwork({ shape: "grid", size: 3600, watts: 1, cases: 1, cp: false }), ok: true },
    ];
    for (const { name, doc, ok } of cases) {
      const body = JSON.stringify({ document: doc });
      expect(Buffer.byteLength(body), name).toBeLessThan(MAX_JSON_BODY_BYTES);
      const r = await call(`/api/systems/${systems.own}/solve`, body);
      expect(r.status, name).toBe(200);
      // Not a speed target: a guard that the budget stopped it (minutes without one).
      expect(r.ms, name).toBeLessThan(HANG_MS);
      const answer = JSON.parse(r.text);
      expect(answer.ok, name).toBe(ok);
      if (!ok) {
        expect(answer.errors[0].code, name).toBe("TOO_LARGE");
        expect(answer.errors[0].message, name).toMatch(/too large to solve within the engine's work budget/);
      }
    }
  }, 60_000);
});
