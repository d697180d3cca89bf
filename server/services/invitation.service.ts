import { IsNull, MoreThan, type DataSource } from "typeorm";
import { passwordSchema } from "../../shared/schemas/auth.js";
import type { Role } from "../../shared/schemas/role.js";
import { hashPassword, verifyPassword } from "../auth/passwords.js";
import { newLinkToken, secretMatches, splitLinkToken } from "../auth/tokens.js";
import { Company, Invitation, Membership, User } from "../db/entities/index.js";
import { AppError } from "../errors.js";
import type { Mailer } from "../mail/mailer.js";
import { invitationMail } from "../mail/templates.js";
import { checkNewPassword, isUniqueViolation } from "./account.service.js";
import { companyScope } from "./tenancy.js";

export const INVITATION_DAYS = 7;

export interface InviteProps {
  companyId: string;
  invitedById: string;
  inviterName: string;
  email: string;
  role: Role;
  /** Base of the link, e.g. http://127.0.0.1:3000 */
  publicUrl: string;
  mailer: Mailer;
}

/** Invitations still waiting: not accepted, not revoked, not expired. */
export function listPendingInvitations(db: DataSource, companyId: string): Promise<Invitation[]> {
  return companyScope(db.manager, companyId).find(Invitation, {
    where: { acceptedAt: IsNull(), revokedAt: IsNull(), expiresAt: MoreThan(new Date()) },
    relations: { invitedBy: true },
    order: { createdAt: "DESC" },
  });
}

/**
 * Saves an invitation and e-mails its link, in one transaction: when the mail
 * cannot be sent nothing is saved (503). Inviting an e-mail that already has a
 * pending invitation replaces it, so only the newest link works.
 */
export async function inviteMember(db: DataSource, props: InviteProps): Promise<Invitation> {
  return db.transaction(async (tx) => {
    // Invitations of one company are made one at a time (two at once for one address would leave two live links).
    const company = await tx.findOne(Company, { where: { id: props.companyId }, lock: { mode: "pessimistic_write" } });
    if (!company) throw new AppError("not_found", "Company not found");
    const scope = companyScope(tx, props.companyId);
    const existing = await tx.findOne(User, { where: { email: props.email } });
    if (existing && (await scope.count(Membership, { userId: existing.id })) > 0) {
      throw new AppError("conflict", "This person is already a member of the company", { field: "email" });
    }
    await scope.update(Invitation, { email: props.email, acceptedAt: IsNull(), revokedAt: IsNull() }, { revokedAt: new Date() });
    const link = newLinkToken();
    const expiresAt = new Date(Date.now() + INVITATION_DAYS * 24 * 60 * 60 * 1000);
    const invitation = await tx.save(
      tx.create(Invitation, {
        id: link.id,
        companyId: props.companyId,
        email: props.email,
        role: props.role,
        tokenHash: link.hash,
        expiresAt,
        invitedById: props.invitedById,
      }),
    );
    try {
      await props.mailer.send(
        invitationMail({
          to: props.email,
          companyName: company.name,
          inviterName: props.inviterName,
          role: props.role,
          url: `${props.publicUrl}/join#token=${link.token}`,
          expiresAt,
        }),
      );
    } catch {
      throw new AppError("service_unavailable", "The invitation e-mail could not be sent, so nothing was saved; try again shortly");
    }
    invitation.invitedBy = await tx.findOneBy(User, { id: props.invitedById });
    return invitation;
  });
}

/** Withdraws a pending invitation of the session's company; its link stops working. */
export async function revokeInvitation(db: DataSource, companyId: string, id: string): Promise<void> {
  const scope = companyScope(db.manager, companyId);
  const invitation = await scope.mustFind(Invitation, { id }, "Invitation");
  if (invitation.acceptedAt) throw new AppError("conflict", "This invitation was already accepted; remove the member instead");
  await scope.update(Invitation, { id }, { revokedAt: invitation.revokedAt ?? new Date() });
}

const LINK_USED = "This invitation link has already been used or was withdrawn; ask the company's Owner for a new one";
const LINK_EXPIRED = "This invitation link has expired; ask the company's Owner for a new one";
const LINK_UNKNOWN = "This invitation link is not valid; open it again from the e-mail";

/** Finds the invitation a link names and checks its secret, expiry and use. Every failure is 404 or 410. */
async function usableInvitation(db: DataSource, token: string): Promise<Invitation> {
  const { id, secret } = splitLinkToken(token);
  const invitation = await db.getRepository(Invitation).findOne({ where: { id }, relations: { company: true } });
  if (!invitation || !secretMatches(secret, invitation.tokenHash)) throw new AppError("not_found", LINK_UNKNOWN, { field: "token" });
  if (invitation.acceptedAt || invitation.revokedAt) throw new AppError("gone", LINK_USED, { field: "token" });
  if (invitation.expiresAt.getTime() <= Date.now()) throw new AppError("gone", LINK_EXPIRED, { field: "token" });
  return invitation;
}

export async function lookupInvitation(db: DataSource, token: string) {
  const invitation = await usableInvitation(db, token);
  const hasAccount = await db.getRepository(User).existsBy({ email: invitation.email });
  return {
    companyName: invitation.company.name,
    email: invitation.email,
    role: invitation.role,
    expiresAt: invitation.expiresAt.toISOString(),
    hasAccount,
  };
}

export interface AcceptProps {
  token: string;
  /** Required for a new account. */
  name?: string;
  /** A new password for a new account; the account's password for an existing one. */
  password: string;
}

/**
 * Accepts an invitation: creates the user (or, for an e-mail that has an
 * account, checks its password) and adds the membership. The invitation is
 * marked used in the same transaction, under a row lock, so a link works once.
 */
export async function acceptInvitation(db: DataSource, props: AcceptProps): Promise<{ userId: string; companyId: string }> {
  const checked = await usableInvitation(db, props.token);
  const existing = await db.getRepository(User).findOneBy({ email: checked.email });
  let newHash: string | undefined;
  if (existing) {
    if (!(await verifyPassword(existing.passwordHash, props.password))) {
      throw new AppError("unauthenticated", "The password of your existing Runwright account is wrong", { field: "password" });
    }
  } else {
    if (!props.name) {
      throw new AppError("invalid_input", "name: name is required", { fields: { name: "name is required" } });
    }
    checkNewPassword(props.password, checked.email);
    const rule = passwordSchema.safeParse(props.password);
    if (!rule.success) {
      const message = rule.error.issues[0]?.message ?? "password is not allowed";
      throw new AppError("invalid_input", `password: ${message}`, { fields: { password: message } });
    }
    newHash = await hashPassword(props.password);
  }
  try {
    return await db.transaction(async (tx) => {
      const invitation = await tx.findOne(Invitation, { where: { id: checked.id }, lock: { mode: "pessimistic_write" } });
      if (!invitation || invitation.acceptedAt || invitation.revokedAt) throw new AppError("gone", LINK_USED, { field: "token" });
      if (invitation.expiresAt.getTime() <= Date.now()) throw new AppError("gone", LINK_EXPIRED, { field: "token" });
      let userId = existing?.id;
      if (!userId) {
        const user = await tx.save(tx.create(User, { email: invitation.email, name: props.name as string, passwordHash: newHash as string }));
        userId = user.id;
      } else if (await tx.existsBy(Membership, { companyId: invitation.companyId, userId })) {
        throw new AppError("conflict", "You are already a member of this company; sign in instead");
      }
      await tx.insert(Membership, { companyId: invitation.companyId, userId, role: invitation.role });
      await tx.update(Invitation, { id: invitation.id }, { acceptedAt: new Date() });
      return { userId, companyId: invitation.companyId };
    });
  } catch (error) {
    if (isUniqueViolation(error)) throw new AppError("conflict", "An account with this e-mail was created meanwhile; open the link again");
    throw error;
  }
}
