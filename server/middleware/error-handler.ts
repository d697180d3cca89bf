import type { ErrorRequestHandler, RequestHandler } from "express";
import { ZodError } from "zod";
import type { ApiErrorBody } from "../../shared/schemas/error.js";
import { AppError } from "../errors.js";

/** Unknown /api routes answer 404 in the error shape, never the client's HTML. */
export const apiNotFound: RequestHandler = (req, _res, next) => {
  next(new AppError("not_found", `No API route for ${req.method} ${req.originalUrl.split("?")[0]}`));
};

// Connection-level failures of PostgreSQL: the request could not be served, try later.
const DB_UNAVAILABLE_CODES = new Set(["ECONNREFUSED", "ECONNRESET", "ETIMEDOUT", "EHOSTUNREACH", "57P01", "57P02", "57P03"]);

function isDatabaseUnavailable(error: unknown): boolean {
  if (!(error instanceof Error)) return false;
  const code = (error as { code?: unknown }).code;
  if (typeof code === "string" && (DB_UNAVAILABLE_CODES.has(code) || code.startsWith("08"))) return true;
  return /timeout exceeded when trying to connect|Connection terminated|Driver not Connected/i.test(error.message);
}

/** Turns anything thrown into `{ error: { code, message, details? } }` with the right status. */
export const errorHandler: ErrorRequestHandler = (error, req, res, _next) => {
  const appError = toAppError(error);
  if (appError.status >= 500) req.log?.error({ err: loggable(error) }, appError.message);
  const body: ApiErrorBody = { error: { code: appError.code, message: appError.message } };
  if (appError.details) body.error.details = appError.details;
  if (res.headersSent) return;
  res.status(appError.status).json(body);
};

/**
 * What of an error goes to the log: a database error's query parameters are
 * left out, since they can hold password hashes, e-mails and names.
 */
function loggable(error: unknown): unknown {
  if (error instanceof Error && "parameters" in error) {
    const { code } = error as { code?: unknown };
    return { type: error.name, message: error.message, code, stack: error.stack };
  }
  return error;
}

function toAppError(error: unknown): AppError {
  if (error instanceof AppError) return error;
  if (error instanceof ZodError) {
    const fields: Record<string, string> = {};
    for (const issue of error.issues) {
      const key = issue.path.join(".") || "(body)";
      fields[key] ??= issue.message;
    }
    const [first] = Object.entries(fields);
    return new AppError("invalid_input", first ? `${first[0]}: ${first[1]}` : "Invalid input", { fields });
  }
  // body-parser marks its errors with a type and a status.
  const type = (error as { type?: unknown })?.type;
  if (type === "entity.parse.failed") return new AppError("invalid_json", "The request body is not valid JSON");
  if (type === "entity.too.large") {
    const limit = (error as { limit?: number }).limit;
    return new AppError("payload_too_large", `The request body is larger than the limit of ${limit ?? "?"} bytes`);
  }
  if (type === "encoding.unsupported" || type === "charset.unsupported") {
    return new AppError("unsupported_media_type", "The request body's encoding is not supported");
  }
  if (isDatabaseUnavailable(error)) return new AppError("service_unavailable", "The database is not reachable; try again shortly");
  // SQLSTATE class 22 (data exception: a value the column cannot hold). The
  // schemas should refuse such values first; this is the backstop, never a 500.
  const sqlState = (error as { code?: unknown })?.code;
  if (typeof sqlState === "string" && /^22[0-9A-Z]{3}$/.test(sqlState)) {
    return new AppError("invalid_input", "A value in the request cannot be stored (out of range or an invalid character)");
  }
  // Integrity constraints (class 23): the services check these first; when two requests race past
  // the checks, the database's refusal is a conflict or bad input, never a 500.
  if (sqlState === "23505" || sqlState === "23503") {
    return new AppError("conflict", "Someone changed the same records at the same moment; reload and try again");
  }
  // Deadlock or serialization failure: PostgreSQL rolled the transaction back; trying again works
  // (Stripe retries a webhook answered 503 on its own).
  if (sqlState === "40P01" || sqlState === "40001") {
    return new AppError("service_unavailable", "The server was busy with the same records; nothing was saved — try again");
  }
  if (sqlState === "23514" || sqlState === "23502") {
    return new AppError("invalid_input", "A value in the request is outside what can be stored");
  }
  const status = (error as { status?: unknown })?.status;
  if (typeof status === "number" && status >= 400 && status < 500) {
    return new AppError("invalid_input", "The request could not be read");
  }
  return new AppError("internal", "Something went wrong on our side; the error has been logged");
}
