import type { CompanySettings } from "../../shared/schemas/company.js";
import type { Session } from "../../shared/schemas/auth.js";
import type { Invitation as InvitationView, Member } from "../../shared/schemas/team.js";
import type { AuthContext } from "../auth/context.js";
import type { Company, Invitation, Membership } from "../db/entities/index.js";

// Presenters name every field that leaves the server; nothing else does (no password hashes, no token hashes).

export function presentSession(auth: AuthContext | undefined): Session {
  if (!auth) return { signedIn: false };
  return {
    signedIn: true,
    user: { id: auth.userId, name: auth.name, email: auth.email },
    company: { id: auth.companyId, name: auth.companyName },
    role: auth.role,
    memberships: auth.memberships.map((m) => ({ company: { id: m.companyId, name: m.companyName }, role: m.role })),
  };
}

export function presentCompany(company: Company): CompanySettings {
  return {
    id: company.id,
    name: company.name,
    licenceNumber: company.licenceNumber,
    contactEmail: company.contactEmail,
    phone: company.phone,
    address: company.address,
    currency: company.currency,
    taxRatePercent: company.taxRatePercent,
    defaultMarkupPercent: company.defaultMarkupPercent,
    labourRateMinor: company.labourRateMinor,
    depositPercent: company.depositPercent,
    updatedAt: company.updatedAt.toISOString(),
  };
}

export function presentMember(membership: Membership): Member {
  return {
    userId: membership.userId,
    name: membership.user.name,
    email: membership.user.email,
    role: membership.role,
    joinedAt: membership.createdAt.toISOString(),
    lastSignInAt: membership.user.lastSignInAt?.toISOString() ?? null,
  };
}

export function presentInvitation(invitation: Invitation): InvitationView {
  return {
    id: invitation.id,
    email: invitation.email,
    role: invitation.role,
    expiresAt: invitation.expiresAt.toISOString(),
    invitedBy: invitation.invitedBy?.name ?? null,
    createdAt: invitation.createdAt.toISOString(),
  };
}
