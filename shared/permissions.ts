import type { Role } from "./schemas/role.js";

/**
 * What each role may do. The server guards every route with one of these
 * (`can("members:write")`); the client reads the same table to hide what a
 * role cannot use. Installers are read-only; Estimators run jobs but do not
 * administer the team or the company.
 */
export const PERMISSIONS = {
  "company:read": ["owner", "estimator", "installer"],
  "company:write": ["owner"],
  "members:read": ["owner", "estimator", "installer"],
  "members:write": ["owner"],
  "invitations:read": ["owner"],
  "invitations:write": ["owner"],
  /** Clients, jobs, systems and attachments: everyone reads, Installers change nothing. */
  "jobs:read": ["owner", "estimator", "installer"],
  "jobs:write": ["owner", "estimator"],
  /** The price list: Owners and Estimators keep it current; everyone reads it. */
  "prices:write": ["owner", "estimator"],
  /** Estimates and quotes: built and sent by Owners and Estimators (Installers read). */
  "quotes:write": ["owner", "estimator"],
  /** Refunds send money back to the client: the Owner decides. */
  "payments:refund": ["owner"],
  /** Limit profiles are company policy: the Owner sets them. */
  "limits:write": ["owner"],
} as const satisfies Record<string, readonly Role[]>;

export type Permission = keyof typeof PERMISSIONS;

export function roleCan(role: Role, permission: Permission): boolean {
  return (PERMISSIONS[permission] as readonly Role[]).includes(role);
}
