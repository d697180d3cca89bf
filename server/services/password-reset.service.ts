import { type DataSource } from "typeorm";
import type { Logger } from "pino";
import { endOtherSessions } from "../auth/session.js";
import { hashPassword } from "../auth/passwords.js";
import { newLinkToken, secretMatches, splitLinkToken } from "../auth/tokens.js";
import { Membership, PasswordReset, User } from "../db/entities/index.js";
import { AppError } from "../errors.js";
import type { Mailer } from "../mail/mailer.js";
import { passwordResetMail } from "../mail/templates.js";
import { checkNewPassword } from "./account.service.js";

export const RESET_MINUTES = 60;

/**
 * Starts a reset for an e-mail: when it has an account, saves a one-hour
 * single-use link and e-mails it. The route answers before calling this (in
 * the background), so neither the answer nor its timing tells whether the
 * address has an account. Never rejects: failures are logged.
 */
export async function requestPasswordReset(db: DataSource, email: string, publicUrl: string, mailer: Mailer, logger: Logger): Promise<void> {
  try {
    await startReset(db, email, publicUrl, mailer);
  } catch (error) {
    logger.error({ err: error instanceof Error ? { message: error.message } : error }, "password reset could not be started");
  }
}

async function startReset(db: DataSource, email: string, publicUrl: string, mailer: Mailer): Promise<void> {
  const user = await db.getRepository(User).findOneBy({ email });
  if (!user) return;
  const link = newLinkToken();
  await db.getRepository(PasswordReset).insert({
    id: link.id,
    userId: user.id,
    tokenHash: link.hash,
    expiresAt: new Date(Date.now() + RESET_MINUTES * 60 * 1000),
  });
  const membership = await db.getRepository(Membership).findOne({ where: { userId: user.id }, relations: { company: true }, order: { createdAt: "ASC" } });
  await mailer.send(
    passwordResetMail({ to: user.email, name: user.name, companyName: membership?.company.name ?? "Runwright", url: `${publicUrl}/reset-password#token=${link.token}` }),
  );
}

const LINK_BAD = "This reset link is not valid; ask for a new one";
const LINK_USED = "This reset link has already been used; ask for a new one";
const LINK_EXPIRED = "This reset link has expired (links work for one hour); ask for a new one";

/**
 * Sets a new password from a reset link, marks the link used, and ends every
 * other session of the user. Returns the user's id (the caller signs them in).
 */
export async function completePasswordReset(db: DataSource, token: string, password: string, currentSid: string): Promise<string> {
  const { id, secret } = splitLinkToken(token);
  const reset = await db.getRepository(PasswordReset).findOne({ where: { id }, relations: { user: true } });
  if (!reset || !secretMatches(secret, reset.tokenHash)) throw new AppError("not_found", LINK_BAD, { field: "token" });
  if (reset.usedAt) throw new AppError("gone", LINK_USED, { field: "token" });
  if (reset.expiresAt.getTime() <= Date.now()) throw new AppError("gone", LINK_EXPIRED, { field: "token" });
  checkNewPassword(password, reset.user.email);
  const passwordHash = await hashPassword(password);
  await db.transaction(async (tx) => {
    // Marked used under the row lock: of two requests with one link, one wins.
    const marked = await tx
      .createQueryBuilder()
      .update(PasswordReset)
      .set({ usedAt: () => "now()" })
      .where("id = :id AND used_at IS NULL", { id })
      .execute();
    if (marked.affected !== 1) throw new AppError("gone", LINK_USED, { field: "token" });
    await tx.update(User, { id: reset.userId }, { passwordHash });
    // Any other outstanding links of this user stop working too.
    await tx
      .createQueryBuilder()
      .update(PasswordReset)
      .set({ usedAt: () => "now()" })
      .where("user_id = :userId AND used_at IS NULL", { userId: reset.userId })
      .execute();
    // In the same transaction: the new password and the end of the other sessions happen together or not at all.
    await endOtherSessions(tx, reset.userId, currentSid);
  });
  return reset.userId;
}
