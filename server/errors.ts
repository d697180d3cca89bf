import type { ApiErrorCode } from "../shared/schemas/error.js";

// A code without a status fails to compile.
export const HTTP_STATUS: Record<ApiErrorCode, number> = {
  invalid_input: 400,
  invalid_json: 400,
  unauthenticated: 401,
  forbidden: 403,
  not_found: 404,
  conflict: 409,
  gone: 410,
  payload_too_large: 413,
  unsupported_media_type: 415,
  unprocessable: 422,
  rate_limited: 429,
  internal: 500,
  /** The mail server refused or could not be reached. */
  mail_failed: 502,
  /** The payment service (Stripe) refused or could not be reached. */
  payment_failed: 502,
  service_unavailable: 503,
};

/** An error a service throws on purpose; the error handler turns it into the API's error shape. */
export class AppError extends Error {
  override name = "AppError";
  constructor(
    readonly code: ApiErrorCode,
    message: string,
    readonly details?: Record<string, unknown>,
  ) {
    super(message);
  }

  get status(): number {
    return HTTP_STATUS[this.code];
  }
}
