import { zodResolver } from "@hookform/resolvers/zod";
import { useState } from "react";
import { useForm } from "react-hook-form";
import { Link } from "react-router-dom";
import { SignInInput } from "../../../../shared/schemas/auth";
import { FormAlert, SubmitButton, TextField } from "../../../components/ui/form";
import { paths } from "../../../config/paths";
import { applyServerError } from "../../../lib/form-errors";
import { useSignIn } from "../api/sign-in";
import { useCompleteSignIn } from "../hooks/use-complete-sign-in";

export function SignInForm() {
  const [alert, setAlert] = useState<string | null>(null);
  const signIn = useSignIn();
  const complete = useCompleteSignIn();
  const {
    register,
    handleSubmit,
    setError,
    formState: { errors },
  } = useForm({ resolver: zodResolver(SignInInput), defaultValues: { email: "", password: "" } });

  const onSubmit = handleSubmit((values) => {
    setAlert(null);
    signIn.mutate(values, {
      onSuccess: complete,
      onError: (error) => setAlert(applyServerError(error, setError, ["email", "password"])),
    });
  });

  return (
    <form noValidate onSubmit={onSubmit} className="space-y-4">
      <FormAlert message={alert} />
      <TextField label="E-mail" type="email" autoComplete="email" inputMode="email" error={errors.email?.message} {...register("email")} />
      <TextField label="Password" type="password" autoComplete="current-password" error={errors.password?.message} {...register("password")} />
      <SubmitButton pending={signIn.isPending} className="w-full">
        Sign in
      </SubmitButton>
      <div className="flex flex-wrap justify-between gap-2 text-sm">
        <Link to={paths.forgotPassword.getHref()} className="font-medium text-copper-700 underline-offset-2 hover:underline">
          Forgot your password?
        </Link>
        <Link to={paths.signUp.getHref()} className="font-medium text-copper-700 underline-offset-2 hover:underline">
          Create a company account
        </Link>
      </div>
    </form>
  );
}
