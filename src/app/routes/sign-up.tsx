import { AuthTitle } from "../../components/ui/auth-title";
import { SignUpForm } from "../../features/auth/components/sign-up-form";

export default function SignUpScreen() {
  return (
    <>
      <AuthTitle lead="You become the company's Owner and can invite your estimators and installers.">Create your company account</AuthTitle>
      <SignUpForm />
    </>
  );
}
