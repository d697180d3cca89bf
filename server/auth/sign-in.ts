import type { Request } from "express";
import type { DataSource } from "typeorm";
import { recordSignIn } from "../services/account.service.js";
import { loadAuthContext, type AuthContext } from "./context.js";

/**
 * Signs the request in as a user: passport's req.login regenerates the session
 * id first (no session fixation), then the session remembers the company.
 */
export async function signInAs(db: DataSource, req: Request, userId: string, companyId?: string): Promise<AuthContext | undefined> {
  await new Promise<void>((resolve, reject) => req.login({ id: userId }, (error) => (error ? reject(error) : resolve())));
  await recordSignIn(db, userId);
  const auth = await loadAuthContext(db, userId, companyId);
  req.session.companyId = auth?.companyId;
  req.auth = auth;
  await new Promise<void>((resolve, reject) => req.session.save((error) => (error ? reject(error) : resolve())));
  return auth;
}

/** Signs out and destroys the session row. */
export async function signOut(req: Request): Promise<void> {
  if (!req.session) return;
  await new Promise<void>((resolve, reject) => req.logout({ keepSessionInfo: false }, (error) => (error ? reject(error) : resolve())));
  await new Promise<void>((resolve, reject) => req.session.destroy((error) => (error ? reject(error) : resolve())));
}
