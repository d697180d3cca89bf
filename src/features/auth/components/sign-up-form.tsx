import { zodResolver } from "@hookform/resolvers/zod";
import { useState } from "react";
import { useForm } from "react-hook-form";
import { Link } from "react-router-dom";
import { PASSWORD_MIN, SignUpInput } from "../../../../shared/schemas/auth";
import { FormAlert, SubmitButton, TextField } from "../../../components/ui/form";
import { paths } from "../../../config/paths";
import { applyServerError } from "../../../lib/form-errors";
import { useSignUp } from "../api/sign-up";
import { useCompleteSignIn } from "../hooks/use-complete-sign-in";

export function SignUpForm() {
  const [alert, setAlert] = useState<string | null>(null);
  const signUp = useSignUp();
  const complete = useCompleteSignIn();
  const {
    register,
    handleSubmit,
    setError,
    formState: { errors },
  } = useForm({ resolver: zodResolver(SignUpInput), defaultValues: { companyName: "", name: "", email: "", password: "" } });

  const onSubmit = handleSubmit((values) => {
    setAlert(null);
    signUp.mutate(values, {
      onSuccess: complete,
      onError: (error) => setAlert(applyServerError(error, setError, ["companyName", "name", "email", "password"])),
    });
  });

  return (
    <form noValidate onSubmit={onSubmit} className="space-y-4">
      <FormAlert message={alert} />
      <TextField label="Company name" autoComplete="organization" error={errors.companyName?.message} {...register("companyName")} />
      <TextField label="Your name" autoComplete="name" error={errors.name?.message} {...register("name")} />
      <TextField label="E-mail" type="email" autoComplete="email" inputMode="email" error={errors.email?.message} {...register("email")} />
      <TextField
        label="Password"
        type="password"
        autoComplete="new-password"
        hint={`At least ${PASSWORD_MIN} characters, and not your e-mail.`}
        error={errors.password?.message}
        {...register("password")}
      />
      <SubmitButton pending={signUp.isPending} className="w-full">
        Create account
      </SubmitButton>
      <p className="text-sm text-ink-600">
        Your company already uses Runwright?{" "}
        <Link to={paths.signIn.getHref()} className="font-medium text-copper-700 underline-offset-2 hover:underline">
          Sign in
        </Link>
      </p>
    </form>
  );
}
