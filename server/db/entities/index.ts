import { Company } from "./company.entity.js";
import { Invitation } from "./invitation.entity.js";
import { Membership } from "./membership.entity.js";
import { PasswordReset } from "./password-reset.entity.js";
import { User } from "./user.entity.js";

/** Every entity, in one list for the DataSource. */
export const entities = [Company, User, Membership, Invitation, PasswordReset];
export { Company, Invitation, Membership, PasswordReset, User };
