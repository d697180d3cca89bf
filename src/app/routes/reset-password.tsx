import { Link, useLocation } from "react-router-dom";
import { linkTokenSchema } from "../../../shared/schemas/auth";
import { AuthTitle } from "../../components/ui/auth-title";
import { FormAlert } from "../../components/ui/form";
import { paths } from "../../config/paths";
import { ResetPasswordForm } from "../../features/auth/components/reset-password-form";
import { readLinkToken } from "../../features/auth/utils/link-token";

const MISSING = "This page needs the link from your password reset e-mail, and this address has no token. Open the link from the e-mail again.";

export default function ResetPasswordScreen() {
  const token = readLinkToken(useLocation().hash);
  const checked = token === null ? null : linkTokenSchema.safeParse(token);
  const problem = checked === null ? MISSING : checked.success ? null : (checked.error.issues[0]?.message ?? MISSING);
  return (
    <>
      <AuthTitle>Set a new password</AuthTitle>
      {token && !problem ? <ResetPasswordForm token={token} /> : <FormAlert message={problem} />}
      <p className="mt-4 text-sm">
        <Link to={paths.forgotPassword.getHref()} className="font-medium text-copper-700 underline-offset-2 hover:underline">
          Ask for a new reset link
        </Link>
      </p>
    </>
  );
}
