import type { Request, RequestHandler } from "express";
import { CSRF_HEADER } from "../../shared/http.js";
import { AppError } from "../errors.js";

const SAFE_METHODS = new Set(["GET", "HEAD", "OPTIONS"]);

/**
 * CSRF protection for every state-changing /api route: the session cookie is
 * SameSite=Lax, and the request must also carry `X-Runwright-Request: 1` — a
 * header a cross-site form or script cannot send without a CORS preflight,
 * which this server never grants. When the browser sends an Origin, it must
 * be this server's own (its Host, or the origin of PUBLIC_URL). Stripe webhooks (a later issue) are signed instead and
 * mount before this guard.
 */
export function csrfGuard(publicUrl?: string): RequestHandler {
  // Behind a proxy that rewrites Host, the browser's Origin is the public address.
  const publicOrigin = publicUrl ? new URL(publicUrl).origin : undefined;
  const sameSite = (req: Request, origin: string): boolean => {
    let url: URL;
    try {
      url = new URL(origin);
    } catch {
      return false;
    }
    return url.origin === publicOrigin || url.host === req.get("host");
  };
  return (req, _res, next) => {
    if (SAFE_METHODS.has(req.method)) return next();
    if (req.get(CSRF_HEADER) !== "1") {
      return next(new AppError("forbidden", `The request is missing the ${CSRF_HEADER} header; cross-site requests are refused`));
    }
    const origin = req.get("origin");
    if (origin !== undefined && !sameSite(req, origin)) {
      return next(new AppError("forbidden", "The request came from another site and was refused"));
    }
    next();
  };
}
