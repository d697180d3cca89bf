import type { Request, RequestHandler } from "express";
import { ipKeyGenerator, rateLimit } from "express-rate-limit";
import { AppError } from "../errors.js";

export interface RateLimitSettings {
  /** Requests allowed per key and window. */
  limit: number;
  windowMs: number;
}

/** 10 requests per 15 minutes, per IP and per e-mail, for sign-in and password reset. */
export const AUTH_RATE_LIMIT: RateLimitSettings = { limit: 10, windowMs: 15 * 60 * 1000 };

function emailKey(req: Request): string {
  const email = (req.body as { email?: unknown } | undefined)?.email;
  return typeof email === "string" ? `email:${email.trim().toLowerCase()}` : "";
}

/**
 * Two limiters for one kind of request: by client IP (IPv6 grouped by /56, as
 * express-rate-limit recommends) and by the e-mail in the body, so neither
 * many addresses from one IP nor one address from many IPs gets through.
 * Counts live in this process's memory; one app server is the deployment
 * this product targets.
 */
export function limitBy(what: string, settings: RateLimitSettings, keys: Array<"ip" | "email">): RequestHandler[] {
  return keys.map((key) =>
    rateLimit({
      windowMs: settings.windowMs,
      limit: settings.limit,
      standardHeaders: "draft-7",
      legacyHeaders: false,
      keyGenerator: key === "ip" ? (req) => ipKeyGenerator(req.ip ?? "") : emailKey,
      // A body without an e-mail fails validation next; it is counted by IP.
      skip: key === "email" ? (req) => emailKey(req) === "" : undefined,
      handler: (req, res, next) => {
        const resetTime = (req as Request & { rateLimit?: { resetTime?: Date } }).rateLimit?.resetTime;
        const seconds = Math.max(1, Math.ceil(((resetTime?.getTime() ?? Date.now() + settings.windowMs) - Date.now()) / 1000));
        res.setHeader("Retry-After", String(seconds));
        next(
          new AppError("rate_limited", `Too many ${what} requests; try again in ${Math.ceil(seconds / 60)} minute(s)`, {
            retryAfterSeconds: seconds,
          }),
        );
      },
    }),
  );
}
