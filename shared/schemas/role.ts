import { z } from "zod";

export const ROLES = ["owner", "estimator", "installer"] as const;
export const RoleSchema = z.enum(ROLES, { error: "role must be owner, estimator or installer" });
export type Role = z.infer<typeof RoleSchema>;

export const ROLE_LABELS: Record<Role, string> = {
  owner: "Owner",
  estimator: "Estimator",
  installer: "Installer",
};
