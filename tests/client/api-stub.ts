import { vi } from "vitest";

/** One recorded call to the stubbed API. */
export interface ApiCall {
  method: string;
  url: string;
  body: unknown;
  headers: Headers;
}

/** What an endpoint answers: a status and JSON body, a function of the request, or a network failure. */
export type Reply = { status?: number; body?: unknown } | "network-error" | ((call: ApiCall) => { status?: number; body?: unknown } | "network-error");

/**
 * Stubs fetch for exactly the endpoints listed ("GET /api/health"). A call to any other
 * endpoint answers 500 and is recorded in `unexpected`, so a test can assert there were none.
 */
export function stubApi(routes: Record<string, Reply>) {
  const calls: ApiCall[] = [];
  const unexpected: string[] = [];
  const fetchMock = vi.fn(async (input: RequestInfo | URL, init: RequestInit = {}) => {
    const method = (init.method ?? "GET").toUpperCase();
    const url = String(input);
    const call: ApiCall = { method, url, body: typeof init.body === "string" ? JSON.parse(init.body) : undefined, headers: new Headers(init.headers) };
    calls.push(call);
    const route = routes[`${method} ${url}`];
    if (!route) {
      unexpected.push(`${method} ${url}`);
      return json(500, { error: { code: "internal", message: `not stubbed: ${method} ${url}` } });
    }
    const reply = typeof route === "function" ? route(call) : route;
    if (reply === "network-error") throw new TypeError("Failed to fetch");
    const status = reply.status ?? 200;
    return status === 204 ? new Response(null, { status }) : json(status, reply.body);
  });
  vi.stubGlobal("fetch", fetchMock);
  return {
    calls,
    unexpected,
    /** The calls made to one endpoint, e.g. "POST /api/auth/sign-in". */
    callsTo: (key: string) => calls.filter((c) => `${c.method} ${c.url}` === key),
  };
}

function json(status: number, body: unknown): Response {
  return new Response(JSON.stringify(body), { status, headers: { "Content-Type": "application/json" } });
}

export const apiError = (status: number, code: string, message: string, details?: Record<string, unknown>) => ({
  status,
  body: { error: { code, message, ...(details ? { details } : {}) } },
});

export const COMPANY = { id: "5f0c7a52-1c3e-4d8b-9a61-2b7e4c9d0a11", name: "Kestrel Bay DC Works" };
export const OTHER_COMPANY = { id: "8d2e4b17-6a90-4c35-b1f8-3e5a7c9d2b44", name: "Marram Point Solar" };

export const healthUp = { status: 200, body: { status: "ok", db: "up", version: "0.1.0" } };
export const signedOut = { status: 200, body: { signedIn: false } };

export function sessionAs(role: "owner" | "estimator" | "installer", extra: { memberships?: unknown[] } = {}) {
  return {
    status: 200,
    body: {
      signedIn: true,
      user: { id: "0b6f3c1e-8a47-4d2b-9e15-7c3a5f8d1e22", name: "Ada Quill", email: "ada@kestrel.example" },
      company: COMPANY,
      role,
      memberships: extra.memberships ?? [{ company: COMPANY, role }],
    },
  };
}
