import { AuthTitle } from "../../components/ui/auth-title";
import { SignInForm } from "../../features/auth/components/sign-in-form";

export default function SignInScreen() {
  return (
    <>
      <AuthTitle lead="Welcome back to your company's Runwright.">Sign in</AuthTitle>
      <SignInForm />
    </>
  );
}
