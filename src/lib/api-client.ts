import type { z } from "zod";
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

/** Calls /api{path}, sends and reads JSON, and parses the answer with the shared schema. */
export async function apiRequest<S extends z.ZodType>(path: string, schema: S, options: RequestOptions = {}): Promise<z.infer<S>> {
  const { method = "GET", body, acceptStatuses = [], signal } = options;
  let response: Response;
  try {
    response = await fetch(`/api${path}`, {
      method,
      credentials: "include",
      headers: { Accept: "application/json", ...(body === undefined ? {} : { "Content-Type": "application/json" }) },
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
