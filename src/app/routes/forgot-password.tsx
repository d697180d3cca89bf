import { AuthTitle } from "../../components/ui/auth-title";
import { ForgotPasswordForm } from "../../features/auth/components/forgot-password-form";

export default function ForgotPasswordScreen() {
  return (
    <>
      <AuthTitle>Reset your password</AuthTitle>
      <ForgotPasswordForm />
    </>
  );
}
