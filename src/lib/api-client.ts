import { z } from "zod";
import { CSRF_HEADER } from "../../shared/http";
import { ApiErrorBody } from "../../shared/schemas/error";

/** A failed API call: the server's error code and message, or a network failure (code "network_error"). */
export class ApiError extends Error {
  override name = "ApiError";
  constructor(
    readonly status: number,
    readonly code: string,
    message: string,
    readonly details?: Record<string, unknown>,
  ) {
    super(message);
  }
}

export interface RequestOptions {
  method?: "GET" | "POST" | "PUT" | "PATCH" | "DELETE";
  body?: unknown;
  /** Non-2xx statuses whose body is still a valid answer for this call (e.g. 503 from /api/health). */
  acceptStatuses?: number[];
  signal?: AbortSignal;
}

/** The schema of a 204 answer: no body. */
export const NoContent = z.undefined();

/** Field errors of an ApiError: `details.fields` (400 invalid_input) and `details.field` (one field the message is about). */
export function apiFieldErrors(error: ApiError): Record<string, string> {
  const fields: Record<string, string> = {};
  const raw = error.details?.fields;
  if (raw && typeof raw === "object") {
    for (const [name, message] of Object.entries(raw as Record<string, unknown>)) {
      if (typeof message === "string") fields[name] = message;
    }
  }
  const single = error.details?.field;
  if (typeof single === "string" && !(single in fields)) fields[single] = error.message;
  return fields;
}

/** Calls /api{path}, sends and reads JSON, and parses the answer with the shared schema. */
export async function apiRequest<S extends z.ZodType>(path: string, schema: S, options: RequestOptions = {}): Promise<z.infer<S>> {
  const { method = "GET", body, acceptStatuses = [], signal } = options;
  let response: Response;
  try {
    response = await fetch(`/api${path}`, {
      method,
      credentials: "include",
      // The CSRF header goes on every call (the server requires it on every non-GET one).
      headers: {
        Accept: "application/json",
        [CSRF_HEADER]: "1",
        ...(body === undefined ? {} : { "Content-Type": "application/json" }),
      },
      body: body === undefined ? undefined : JSON.stringify(body),
      signal,
    });
  } catch (error) {
    if (error instanceof DOMException && error.name === "AbortError") throw error;
    throw new ApiError(0, "network_error", "The server could not be reached. Check the connection and try again.");
  }
  const payload: unknown = response.status === 204 ? undefined : await response.json().catch(() => undefined);
  if (!response.ok && !acceptStatuses.includes(response.status)) {
    const parsed = ApiErrorBody.safeParse(payload);
    if (parsed.success) {
      const { code, message, details } = parsed.data.error;
      throw new ApiError(response.status, code, message, details);
    }
    throw new ApiError(response.status, "unexpected_response", `The server answered ${response.status}.`);
  }
  const parsed = schema.safeParse(payload);
  if (!parsed.success) throw new ApiError(response.status, "unexpected_response", "The server's answer was not understood.");
  return parsed.data;
}

/**
 * POSTs a multipart form to /api{path} (uploads: CSV files, the logo) and parses the answer with the
 * shared schema. Not JSON, so not apiRequest; the CSRF header goes on it all the same. `statusMessages`
 * words a refusal whose body is not ours (a proxy's 413 page, say).
 */
export async function apiUpload<S extends z.ZodType>(path: string, form: FormData, schema: S, statusMessages: Record<number, string> = {}): Promise<z.infer<S>> {
  let response: Response;
  try {
    response = await fetch(`/api${path}`, { method: "POST", credentials: "include", headers: { Accept: "application/json", [CSRF_HEADER]: "1" }, body: form });
  } catch {
    throw new ApiError(0, "network_error", "The server could not be reached. Check the connection and try again.");
  }
  const payload: unknown = await response.json().catch(() => undefined);
  if (!response.ok) {
    const parsed = ApiErrorBody.safeParse(payload);
    if (parsed.success) throw new ApiError(response.status, parsed.data.error.code, parsed.data.error.message, parsed.data.error.details);
    throw new ApiError(response.status, "unexpected_response", statusMessages[response.status] ?? `The server answered ${response.status}.`);
  }
  const parsed = schema.safeParse(payload);
  if (!parsed.success) throw new ApiError(response.status, "unexpected_response", "The server's answer was not understood.");
  return parsed.data;
}
