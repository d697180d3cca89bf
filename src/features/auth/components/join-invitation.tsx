import { zodResolver } from "@hookform/resolvers/zod";
import { useMemo, useState } from "react";
import { useForm } from "react-hook-form";
import { z } from "zod";
import { AcceptInvitationInput, PASSWORD_MIN, PASSWORD_IS_EMAIL, passwordIsNotEmail, passwordSchema, personNameSchema } from "../../../../shared/schemas/auth";
import { ROLE_LABELS, type InvitationPreview } from "../../../../shared/schemas/team";
import { AuthTitle } from "../../../components/ui/auth-title";
import { FormAlert, SubmitButton, TextField } from "../../../components/ui/form";
import { paths } from "../../../config/paths";
import { applyServerError } from "../../../lib/form-errors";
import { formatDate } from "../../../utils/format-date";
import { useAcceptInvitation } from "../api/accept-invitation";
import { useInvitationPreview } from "../api/lookup-invitation";
import { useCompleteSignIn } from "../hooks/use-complete-sign-in";

/** A person new to Runwright gives a name and a new password; it may not be the invited e-mail. */
const newAccountForm = (email: string) =>
  z
    .object({ name: personNameSchema, password: passwordSchema })
    .refine((v) => passwordIsNotEmail(v.password, email), { path: ["password"], message: PASSWORD_IS_EMAIL });

/** Someone who already has an account proves it with that account's password (any length: it is checked, not set). */
const existingAccountForm = z.object({ name: z.string().optional(), password: AcceptInvitationInput.shape.password });

function AcceptForm({ token, preview }: { token: string; preview: InvitationPreview }) {
  const [alert, setAlert] = useState<string | null>(null);
  const accept = useAcceptInvitation();
  const complete = useCompleteSignIn(paths.dashboard.getHref());
  const schema = useMemo(() => (preview.hasAccount ? existingAccountForm : newAccountForm(preview.email)), [preview]);
  const {
    register,
    handleSubmit,
    setError,
    formState: { errors },
  } = useForm<{ name?: string; password: string }>({ resolver: zodResolver(schema), defaultValues: { name: "", password: "" } });

  const onSubmit = handleSubmit((values) => {
    setAlert(null);
    const body = preview.hasAccount ? { token, password: values.password } : { token, name: values.name, password: values.password };
    accept.mutate(body, { onSuccess: complete, onError: (error) => setAlert(applyServerError(error, setError, ["name", "password"])) });
  });

  return (
    <form noValidate onSubmit={onSubmit} className="space-y-4">
      <FormAlert message={alert} />
      {preview.hasAccount ? (
        <>
          <p className="text-sm text-ink-600">
            This e-mail already has a Runwright account. Accepting adds {preview.companyName} to that account: you keep one sign-in and
            can switch between your companies.
          </p>
          <TextField label="Your Runwright password" type="password" autoComplete="current-password" error={errors.password?.message} {...register("password")} />
        </>
      ) : (
        <>
          <TextField label="Your name" autoComplete="name" error={errors.name?.message} {...register("name")} />
          <TextField
            label="Choose a password"
            type="password"
            autoComplete="new-password"
            hint={`At least ${PASSWORD_MIN} characters, and not your e-mail.`}
            error={errors.password?.message}
            {...register("password")}
          />
        </>
      )}
      <SubmitButton pending={accept.isPending} className="w-full">
        Accept invitation
      </SubmitButton>
    </form>
  );
}

/** The invitation behind a /join link: who invites, as what, and the form to accept it. */
export function JoinInvitation({ token }: { token: string }) {
  const { data: preview, error, isPending } = useInvitationPreview(token);

  if (isPending) {
    return (
      <>
        <AuthTitle>Your invitation</AuthTitle>
        <p className="text-sm text-ink-500">Checking your invitation…</p>
      </>
    );
  }
  if (error) {
    return (
      <>
        <AuthTitle>Your invitation</AuthTitle>
        <FormAlert message={error.message} />
        <p className="mt-4 text-sm text-ink-600">Ask the person who invited you to send a new invitation.</p>
      </>
    );
  }
  return (
    <>
      <AuthTitle lead="You have been invited to work in this company on Runwright.">Join {preview.companyName}</AuthTitle>
      <dl className="grid grid-cols-[auto_1fr] gap-x-4 gap-y-1 rounded-md bg-ink-50 px-4 py-3 text-sm">
        <dt className="text-ink-500">E-mail</dt>
        <dd className="font-medium text-ink-900">{preview.email}</dd>
        <dt className="text-ink-500">Role</dt>
        <dd className="font-medium text-ink-900">{ROLE_LABELS[preview.role]}</dd>
        <dt className="text-ink-500">Open until</dt>
        <dd className="text-ink-900">{formatDate(preview.expiresAt)}</dd>
      </dl>
      <div className="mt-6">
        <AcceptForm token={token} preview={preview} />
      </div>
    </>
  );
}
