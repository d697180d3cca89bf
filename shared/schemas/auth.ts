import { z } from "zod";
import { RoleSchema } from "./role.js";

// Limits shared by the forms and the server.
export const PASSWORD_MIN = 10;
export const PASSWORD_MAX = 200;
export const NAME_MAX = 120;
export const COMPANY_NAME_MAX = 200;

// PostgreSQL cannot store NUL, and no name needs control characters (tab and newline only where a field allows lines).
const CONTROL = /[\u0000-\u0008\u000b\u000c\u000e-\u001f\u007f]/;
const LINE_BREAK = /[\n\r\t]/;

/** Refuses control characters in a one-line text field, naming the field. */
export function withoutControlCharacters<T extends z.ZodType<string>>(schema: T, field: string, { multiline = false } = {}) {
  return schema.refine((v) => !CONTROL.test(v) && (multiline || !LINE_BREAK.test(v)), `${field} contains a control character`);
}

export const emailSchema = z
  .string({ error: "e-mail is required" })
  .trim()
  .min(1, "e-mail is required")
  .max(254, "e-mail is too long")
  .pipe(z.email({ error: "e-mail is not a valid address" }))
  .transform((email) => email.toLowerCase());

export const passwordSchema = z
  .string({ error: "password is required" })
  .min(PASSWORD_MIN, `password must be at least ${PASSWORD_MIN} characters`)
  .max(PASSWORD_MAX, `password must be at most ${PASSWORD_MAX} characters`);

export const personNameSchema = withoutControlCharacters(
  z
    .string({ error: "name is required" })
    .trim()
    .min(1, "name is required")
    .max(NAME_MAX, `name must be at most ${NAME_MAX} characters`),
  "name",
);

export const companyNameSchema = withoutControlCharacters(
  z
    .string({ error: "company name is required" })
    .trim()
    .min(1, "company name is required")
    .max(COMPANY_NAME_MAX, `company name must be at most ${COMPANY_NAME_MAX} characters`),
  "company name",
);

/** The one token shape of e-mailed links: `<uuid>.<secret>`. */
export const linkTokenSchema = z
  .string({ error: "token is required" })
  .trim()
  .regex(
    /^[0-9a-f]{8}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{12}\.[A-Za-z0-9_-]{43}$/,
    "the link is incomplete or damaged; open it again from the e-mail",
  );

/** Rule shared by every form that sets a password: it may not be the e-mail itself. */
export function passwordIsNotEmail(password: string, email: string): boolean {
  return password.trim().toLowerCase() !== email.trim().toLowerCase();
}
export const PASSWORD_IS_EMAIL = "password must not be your e-mail address";

export const SignUpInput = z
  .strictObject({ companyName: companyNameSchema, name: personNameSchema, email: emailSchema, password: passwordSchema })
  .refine((v) => passwordIsNotEmail(v.password, v.email), { path: ["password"], message: PASSWORD_IS_EMAIL });
export type SignUpInput = z.input<typeof SignUpInput>;

export const SignInInput = z.strictObject({
  email: emailSchema,
  // No length rule at sign-in: a wrong password is just wrong.
  password: z.string({ error: "password is required" }).min(1, "password is required").max(PASSWORD_MAX),
});
export type SignInInput = z.input<typeof SignInInput>;

export const ForgotPasswordInput = z.strictObject({ email: emailSchema });
export type ForgotPasswordInput = z.input<typeof ForgotPasswordInput>;

export const ResetPasswordInput = z.strictObject({ token: linkTokenSchema, password: passwordSchema });
export type ResetPasswordInput = z.input<typeof ResetPasswordInput>;

export const InvitationLookupInput = z.strictObject({ token: linkTokenSchema });

/** Accepting an invitation: a new person gives a name and a new password; an existing account gives its password. */
export const AcceptInvitationInput = z.strictObject({
  token: linkTokenSchema,
  name: personNameSchema.optional(),
  password: z.string({ error: "password is required" }).min(1, "password is required").max(PASSWORD_MAX),
});
export type AcceptInvitationInput = z.input<typeof AcceptInvitationInput>;

export const SwitchCompanyInput = z.strictObject({ companyId: z.uuid({ error: "companyId must be a company id" }) });

const SessionUser = z.object({ id: z.string(), name: z.string(), email: z.string() });
const SessionCompany = z.object({ id: z.string(), name: z.string() });

/** `GET /api/auth/session`: who is signed in, where, and as what. Signed out is a normal answer, not an error. */
export const SessionSchema = z.discriminatedUnion("signedIn", [
  z.object({ signedIn: z.literal(false) }),
  z.object({
    signedIn: z.literal(true),
    user: SessionUser,
    company: SessionCompany,
    role: RoleSchema,
    /** Every company the user belongs to (to switch between them). */
    memberships: z.array(z.object({ company: SessionCompany, role: RoleSchema })),
  }),
]);
export type Session = z.infer<typeof SessionSchema>;

export const MessageSchema = z.object({ message: z.string() });
