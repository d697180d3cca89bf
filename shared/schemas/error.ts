import { z } from "zod";

/** Every error code the API answers with. The server maps each to its HTTP status. */
export const API_ERROR_CODES = [
  "invalid_input",
  "invalid_json",
  "unauthenticated",
  "forbidden",
  "not_found",
  "conflict",
  "gone",
  "payload_too_large",
  "unsupported_media_type",
  "unprocessable",
  "rate_limited",
  "internal",
  "mail_failed",
  "payment_failed",
  "service_unavailable",
] as const;

export const ApiErrorCode = z.enum(API_ERROR_CODES);
export type ApiErrorCode = z.infer<typeof ApiErrorCode>;

/** The one error shape of every /api response that is not a success. */
export const ApiErrorBody = z.object({
  error: z.object({
    code: z.string(),
    message: z.string(),
    details: z.record(z.string(), z.unknown()).optional(),
  }),
});
export type ApiErrorBody = z.infer<typeof ApiErrorBody>;
