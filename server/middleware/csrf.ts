import type { RequestHandler } from "express";
import { CSRF_HEADER } from "../../shared/http.js";
import { AppError } from "../errors.js";

const SAFE_METHODS = new Set(["GET", "HEAD", "OPTIONS"]);

/**
 * CSRF protection for every state-changing /api route: the session cookie is
 * SameSite=Lax, and the request must also carry `X-Runwright-Request: 1` — a
 * header a cross-site form or script cannot send without a CORS preflight,
 * which this server never grants. When the browser sends an Origin, it must
 * be this server's own. Stripe webhooks (a later issue) are signed instead and
 * mount before this guard.
 */
export const csrfGuard: RequestHandler = (req, _res, next) => {
  if (SAFE_METHODS.has(req.method)) return next();
  if (req.get(CSRF_HEADER) !== "1") {
    return next(new AppError("forbidden", `The request is missing the ${CSRF_HEADER} header; cross-site requests are refused`));
  }
  const origin = req.get("origin");
  if (origin && origin !== "null") {
    let host: string | undefined;
    try {
      host = new URL(origin).host;
    } catch {
      host = undefined;
    }
    if (host !== req.get("host")) return next(new AppError("forbidden", "The request came from another site and was refused"));
  } else if (origin === "null") {
    return next(new AppError("forbidden", "The request came from another site and was refused"));
  }
  next();
};
