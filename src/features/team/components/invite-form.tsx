import { zodResolver } from "@hookform/resolvers/zod";
import { useState } from "react";
import { useForm } from "react-hook-form";
import { InviteInput, ROLE_LABELS, type Role } from "../../../../shared/schemas/team";
import { FormAlert, FormStatus, SelectField, SubmitButton, TextField } from "../../../components/ui/form";
import { applyServerError } from "../../../lib/form-errors";
import { useCreateInvitation } from "../api/create-invitation";

// Estimator first: the usual invitation.
const ROLE_CHOICES: Role[] = ["estimator", "installer", "owner"];

/** The Owner invites someone by e-mail; the link in that e-mail lets them join as the chosen role. */
export function InviteForm() {
  const [alert, setAlert] = useState<string | null>(null);
  const [sentTo, setSentTo] = useState<string | null>(null);
  const invite = useCreateInvitation();
  const {
    register,
    handleSubmit,
    setError,
    reset,
    formState: { errors },
  } = useForm({ resolver: zodResolver(InviteInput), defaultValues: { email: "", role: "estimator" as Role } });

  const onSubmit = handleSubmit((values) => {
    setAlert(null);
    setSentTo(null);
    invite.mutate(values, {
      onSuccess: (invitation) => {
        setSentTo(invitation.email);
        reset();
      },
      onError: (error) => setAlert(applyServerError(error, setError, ["email", "role"])),
    });
  });

  return (
    <section aria-labelledby="invite-heading" className="rounded-lg border border-ink-100 bg-white p-4">
      <h2 id="invite-heading" className="text-base font-semibold text-ink-900">
        Invite someone
      </h2>
      <form noValidate onSubmit={onSubmit} className="mt-3 space-y-4">
        <FormAlert message={alert} />
        <FormStatus message={sentTo ? `Invitation sent to ${sentTo}` : null} />
        <TextField label="E-mail" type="email" autoComplete="off" inputMode="email" error={errors.email?.message} {...register("email")} />
        <SelectField
          label="Role"
          hint="Estimators lay out and price jobs. Installers read accepted jobs on site. Owners also run the team and the company settings."
          error={errors.role?.message}
          {...register("role")}
        >
          {ROLE_CHOICES.map((role) => (
            <option key={role} value={role}>
              {ROLE_LABELS[role]}
            </option>
          ))}
        </SelectField>
        <SubmitButton pending={invite.isPending}>Send invitation</SubmitButton>
      </form>
    </section>
  );
}
