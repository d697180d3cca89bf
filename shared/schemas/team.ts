import { z } from "zod";
import { emailSchema } from "./auth.js";
import { RoleSchema } from "./role.js";

export { ROLE_LABELS, ROLES, RoleSchema, type Role } from "./role.js";

export const MemberSchema = z.object({
  userId: z.string(),
  name: z.string(),
  email: z.string(),
  role: RoleSchema,
  joinedAt: z.string(),
  lastSignInAt: z.string().nullable(),
});
export type Member = z.infer<typeof MemberSchema>;
export const MemberListSchema = z.object({ members: z.array(MemberSchema) });

export const ChangeRoleInput = z.strictObject({ role: RoleSchema });
export type ChangeRoleInput = z.infer<typeof ChangeRoleInput>;

export const InviteInput = z.strictObject({ email: emailSchema, role: RoleSchema });
export type InviteInput = z.infer<typeof InviteInput>;

export const InvitationSchema = z.object({
  id: z.string(),
  email: z.string(),
  role: RoleSchema,
  expiresAt: z.string(),
  invitedBy: z.string().nullable(),
  createdAt: z.string(),
});
export type Invitation = z.infer<typeof InvitationSchema>;
export const InvitationListSchema = z.object({ invitations: z.array(InvitationSchema) });

/** What the holder of an invitation link may learn before accepting. */
export const InvitationPreviewSchema = z.object({
  companyName: z.string(),
  email: z.string(),
  role: RoleSchema,
  expiresAt: z.string(),
  /** True when the e-mail already has an account: accepting then asks for its password instead of a new one. */
  hasAccount: z.boolean(),
});
export type InvitationPreview = z.infer<typeof InvitationPreviewSchema>;
