import { zodResolver } from "@hookform/resolvers/zod";
import { useState } from "react";
import { useForm } from "react-hook-form";
import { PASSWORD_MIN, ResetPasswordInput } from "../../../../shared/schemas/auth";
import { FormAlert, SubmitButton, TextField } from "../../../components/ui/form";
import { paths } from "../../../config/paths";
import { applyServerError } from "../../../lib/form-errors";
import { useResetPassword } from "../api/reset-password";
import { useCompleteSignIn } from "../hooks/use-complete-sign-in";

// The form asks for the password only; the token comes from the link.
const PasswordOnly = ResetPasswordInput.pick({ password: true });

export function ResetPasswordForm({ token }: { token: string }) {
  const [alert, setAlert] = useState<string | null>(null);
  const reset = useResetPassword();
  const complete = useCompleteSignIn(paths.dashboard.getHref());
  const {
    register,
    handleSubmit,
    setError,
    formState: { errors },
  } = useForm({ resolver: zodResolver(PasswordOnly), defaultValues: { password: "" } });

  const onSubmit = handleSubmit(({ password }) => {
    setAlert(null);
    reset.mutate(
      { token, password },
      { onSuccess: complete, onError: (error) => setAlert(applyServerError(error, setError, ["password"])) },
    );
  });

  return (
    <form noValidate onSubmit={onSubmit} className="space-y-4">
      <FormAlert message={alert} />
      <TextField
        label="New password"
        type="password"
        autoComplete="new-password"
        hint={`At least ${PASSWORD_MIN} characters, and not your e-mail.`}
        error={errors.password?.message}
        {...register("password")}
      />
      <SubmitButton pending={reset.isPending} className="w-full">
        Set password
      </SubmitButton>
    </form>
  );
}
