import type { RequestHandler } from "express";
import type { DataSource } from "typeorm";
import { roleCan, type Permission } from "../../shared/permissions.js";
import { ROLE_LABELS, type Role } from "../../shared/schemas/role.js";
import { Membership } from "../db/entities/index.js";
import { AppError } from "../errors.js";

/** Who is asking, in which company, as what: resolved from the session on every request. */
export interface AuthContext {
  userId: string;
  name: string;
  email: string;
  companyId: string;
  companyName: string;
  role: Role;
  memberships: Array<{ companyId: string; companyName: string; role: Role }>;
}

declare global {
  // eslint-disable-next-line @typescript-eslint/no-namespace
  namespace Express {
    // What passport keeps on req.user: only the id; everything else is read fresh each request.
    interface User {
      id: string;
    }
    interface Request {
      auth?: AuthContext;
    }
  }
}

declare module "express-session" {
  interface SessionData {
    /** The company the user is working in (a user may belong to several). */
    companyId?: string;
  }
}

/** Loads a user's memberships and picks the active company: the preferred one if still a member, else the oldest. */
export async function loadAuthContext(db: DataSource, userId: string, preferredCompanyId?: string): Promise<AuthContext | undefined> {
  const memberships = await db.getRepository(Membership).find({
    where: { userId },
    relations: { company: true, user: true },
    order: { createdAt: "ASC" },
  });
  if (memberships.length === 0) return undefined;
  const active = memberships.find((m) => m.companyId === preferredCompanyId) ?? memberships[0];
  return {
    userId,
    name: active.user.name,
    email: active.user.email,
    companyId: active.companyId,
    companyName: active.company.name,
    role: active.role,
    memberships: memberships.map((m) => ({ companyId: m.companyId, companyName: m.company.name, role: m.role })),
  };
}

/**
 * Resolves req.auth from the session, with one query. A user whose last
 * membership was removed is treated as signed out; a removed membership or a
 * changed role takes effect on the very next request. When the user was
 * removed from the company they were working in, that request is answered
 * as signed out (never silently applied to another of their companies); the
 * session moves to their oldest remaining company for the requests after it.
 */
export function resolveAuth(db: DataSource): RequestHandler {
  return async (req, _res, next) => {
    const userId = req.user?.id;
    if (!userId) return next();
    const auth = await loadAuthContext(db, userId, req.session.companyId);
    if (!auth) return next();
    const lostCompany = req.session.companyId !== undefined && req.session.companyId !== auth.companyId;
    req.session.companyId = auth.companyId;
    if (!lostCompany) req.auth = auth;
    next();
  };
}

/** The signed-in context, or 401. */
export function requireAuth(req: Express.Request): AuthContext {
  if (!req.auth) throw new AppError("unauthenticated", "Sign in to continue");
  return req.auth;
}

/** A guard that marks the route with its permission, so the route table can show what guards it. */
export type Guard = RequestHandler & { permission?: Permission; access?: "public" | "session" };

/** Route guard: a session whose role has the permission, else 401 / 403. */
export function can(permission: Permission): Guard {
  const guard: Guard = (req, _res, next) => {
    const auth = requireAuth(req);
    if (!roleCan(auth.role, permission)) {
      throw new AppError("forbidden", `An ${ROLE_LABELS[auth.role]} cannot do this; ask the company's Owner`);
    }
    next();
  };
  guard.permission = permission;
  guard.access = "session";
  return guard;
}

/** Route guard for anyone with a session, whatever the role. */
export const signedIn: Guard = Object.assign<RequestHandler, Partial<Guard>>((req, _res, next) => {
  requireAuth(req);
  next();
}, { access: "session" });

/** Marks a route that needs no session (sign-in, sign-up, links from e-mails). */
export const publicRoute: Guard = Object.assign<RequestHandler, Partial<Guard>>((_req, _res, next) => next(), { access: "public" });
