import { zodResolver } from "@hookform/resolvers/zod";
import { useState } from "react";
import { useForm } from "react-hook-form";
import { Link } from "react-router-dom";
import { ForgotPasswordInput } from "../../../../shared/schemas/auth";
import { FormAlert, FormStatus, SubmitButton, TextField } from "../../../components/ui/form";
import { paths } from "../../../config/paths";
import { applyServerError } from "../../../lib/form-errors";
import { useRequestPasswordReset } from "../api/forgot-password";

export function ForgotPasswordForm() {
  const [alert, setAlert] = useState<string | null>(null);
  const request = useRequestPasswordReset();
  const {
    register,
    handleSubmit,
    setError,
    formState: { errors },
  } = useForm({ resolver: zodResolver(ForgotPasswordInput), defaultValues: { email: "" } });

  const onSubmit = handleSubmit((values) => {
    setAlert(null);
    request.reset();
    request.mutate(values, { onError: (error) => setAlert(applyServerError(error, setError, ["email"])) });
  });

  return (
    <form noValidate onSubmit={onSubmit} className="space-y-4">
      <p className="text-sm text-ink-600">Give the e-mail you sign in with, and we will send it a link to choose a new password.</p>
      <FormAlert message={alert} />
      <FormStatus message={request.data?.message} />
      <TextField label="E-mail" type="email" autoComplete="email" inputMode="email" error={errors.email?.message} {...register("email")} />
      <SubmitButton pending={request.isPending} className="w-full">
        Send reset link
      </SubmitButton>
      <p className="text-sm">
        <Link to={paths.signIn.getHref()} className="font-medium text-copper-700 underline-offset-2 hover:underline">
          Back to sign in
        </Link>
      </p>
    </form>
  );
}
