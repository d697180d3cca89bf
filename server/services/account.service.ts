import type { DataSource, EntityManager } from "typeorm";
import { PASSWORD_IS_EMAIL, passwordIsNotEmail } from "../../shared/schemas/auth.js";
import { hashPassword } from "../auth/passwords.js";
import { Company, Membership, User } from "../db/entities/index.js";
import { AppError } from "../errors.js";
import { ensureDefaultLimitProfiles } from "./limit-profile.service.js";

export interface SignUpProps {
  companyName: string;
  name: string;
  /** Already lower-cased by the shared schema. */
  email: string;
  password: string;
}

/** True for PostgreSQL's unique-violation error. */
export function isUniqueViolation(error: unknown): boolean {
  return (error as { code?: unknown })?.code === "23505";
}

const EMAIL_TAKEN = "An account with this e-mail already exists; sign in, or ask its company's Owner for an invitation";

/** Creates a Company and its first Owner in one transaction. Fails with 409 when the e-mail has an account. */
export async function signUp(db: DataSource, props: SignUpProps): Promise<User> {
  const passwordHash = await hashPassword(props.password);
  try {
    return await db.transaction(async (tx) => {
      if (await tx.existsBy(User, { email: props.email })) throw new AppError("conflict", EMAIL_TAKEN, { field: "email" });
      const company = await tx.save(tx.create(Company, { name: props.companyName }));
      const user = await tx.save(tx.create(User, { email: props.email, name: props.name, passwordHash }));
      await tx.insert(Membership, { companyId: company.id, userId: user.id, role: "owner" });
      await ensureDefaultLimitProfiles(tx, company.id);
      return user;
    });
  } catch (error) {
    // Two sign-ups with one e-mail at the same moment: the unique constraint decides.
    if (isUniqueViolation(error)) throw new AppError("conflict", EMAIL_TAKEN, { field: "email" });
    throw error;
  }
}

export async function recordSignIn(db: DataSource | EntityManager, userId: string): Promise<void> {
  await db.getRepository(User).update({ id: userId }, { lastSignInAt: new Date() });
}

/** The password rules beyond the schema's length: it may not be the account's e-mail. */
export function checkNewPassword(password: string, email: string): void {
  if (!passwordIsNotEmail(password, email)) {
    throw new AppError("invalid_input", `password: ${PASSWORD_IS_EMAIL}`, {
      fields: { password: PASSWORD_IS_EMAIL },
    });
  }
}
