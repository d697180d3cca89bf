import type { Express } from "express";
import request from "supertest";
import { expect } from "vitest";
import { CSRF_HEADER } from "../../shared/http.js";

// Anything that looks like a stored secret: an argon2 PHC string, a SHA-256
// in hex (how link tokens are kept), or the field names under which hashes
// are kept. No response may ever carry one.
const SECRET_PATTERN = /\$argon2(id|i|d)\$|\b[0-9a-f]{64}\b|password_?hash|token_?hash/i;

/** Asserts a response body carries no password or token hash. */
export function expectNoSecrets(text: string | undefined): void {
  expect(SECRET_PATTERN.test(text ?? ""), `a response leaked a hash: ${text?.slice(0, 200)}`).toBe(false);
}

export type ApiResponse = request.Response;

/** Any JSON value as the body (supertest alone sends only objects and arrays as JSON). */
function withJson(test: request.Test, body: unknown): request.Test {
  if (body === undefined) return test;
  return test.set("Content-Type", "application/json").send(JSON.stringify(body));
}

/**
 * A cookie-keeping HTTP client for one person (supertest agent). Every
 * request sends the CSRF header unless told not to, and every response is
 * checked for leaked hashes — so the whole suite asserts it.
 */
export class ApiClient {
  readonly agent: ReturnType<typeof request.agent>;
  constructor(
    /** The app (supertest serves it on its own ephemeral port per request) or the URL of a running server. */
    readonly app: Express | string,
    private readonly headers: Record<string, string> = {},
  ) {
    this.agent = request.agent(app);
  }

  private async send(test: request.Test, csrf: boolean): Promise<ApiResponse> {
    for (const [name, value] of Object.entries(this.headers)) test.set(name, value);
    if (csrf) test.set(CSRF_HEADER, "1");
    const response = await test;
    expectNoSecrets(response.text);
    return response;
  }

  get(path: string): Promise<ApiResponse> {
    return this.send(this.agent.get(path), false);
  }
  post(path: string, body?: unknown, { csrf = true } = {}): Promise<ApiResponse> {
    return this.send(withJson(this.agent.post(path), body), csrf);
  }
  patch(path: string, body?: unknown, { csrf = true } = {}): Promise<ApiResponse> {
    return this.send(withJson(this.agent.patch(path), body), csrf);
  }
  put(path: string, body?: unknown, { csrf = true } = {}): Promise<ApiResponse> {
    return this.send(withJson(this.agent.put(path), body), csrf);
  }
  delete(path: string, { csrf = true } = {}): Promise<ApiResponse> {
    return this.send(this.agent.delete(path), csrf);
  }
  /** A multipart/form-data POST: form fields plus one file (what a browser's file input sends). */
  upload(path: string, file: { field?: string; content: Buffer | string; name: string; type?: string } | null, fields: Record<string, string> = {}, { csrf = true } = {}): Promise<ApiResponse> {
    const test = this.agent.post(path);
    for (const [name, value] of Object.entries(fields)) test.field(name, value);
    if (file) {
      const content = typeof file.content === "string" ? Buffer.from(file.content) : file.content;
      test.attach(file.field ?? "file", content, { filename: file.name, contentType: file.type ?? "application/octet-stream" });
    }
    return this.send(test, csrf);
  }
  /** Any method, by name (for route sweeps). */
  call(method: string, path: string, body?: unknown, options: { csrf?: boolean } = {}): Promise<ApiResponse> {
    switch (method) {
      case "GET":
        return this.get(path);
      case "POST":
        return this.post(path, body, options);
      case "PATCH":
        return this.patch(path, body, options);
      case "PUT":
        return this.put(path, body, options);
      case "DELETE":
        return this.delete(path, options);
      default:
        throw new Error(`no helper for ${method}`);
    }
  }
}

/** The session id in a response's Set-Cookie (signed cookie value, decoded), if it sets one. */
export function sessionIdSetBy(response: ApiResponse): string | undefined {
  const cookies = ([] as string[]).concat(response.headers["set-cookie"] ?? []);
  const cookie = cookies.find((c) => c.startsWith("runwright.sid="));
  if (!cookie) return undefined;
  const value = decodeURIComponent(cookie.slice("runwright.sid=".length).split(";")[0]);
  // express-session signs as "s:<id>.<signature>".
  return value.startsWith("s:") ? value.slice(2, value.lastIndexOf(".")) : value;
}
