import { zodResolver } from "@hookform/resolvers/zod";
import { useState } from "react";
import { useForm } from "react-hook-form";
import { z } from "zod";
import { CreateLimitProfileInput, JobLimits, type LimitProfileRecord } from "../../../../shared/schemas/jobs";
import { controlClass, Field, FormAlert, secondaryButtonClass, SubmitButton, TextField } from "../../../components/ui/form";
import { applyServerError } from "../../../lib/form-errors";
import { useCreateLimitProfile } from "../api/create-limit-profile";
import { useUpdateLimitProfile } from "../api/update-limit-profile";

const S = CreateLimitProfileInput.shape;
const DECIMAL = /^(\d+(\.\d*)?|\.\d+)$/;
const numberText = (field: string) =>
  z.string().trim().min(1, `${field} is required`).regex(DECIMAL, `${field} must be a number, such as 3`).transform(Number);

/**
 * The form holds text; each figure then passes the shared CreateLimitProfileInput's rule for it.
 * The near-limit threshold is typed as a percentage of the limit (80) and sent as a fraction (0.8).
 */
const LimitProfileForm = z
  .object({
    name: S.name,
    branchPercent: numberText("branch limit").pipe(S.branchPercent),
    totalPercent: numberText("total limit").pipe(S.totalPercent),
    criticalPercent: numberText("critical limit").pipe(S.criticalPercent),
    nearPercent: numberText("near-limit threshold").pipe(
      z.number().gt(0, "near-limit threshold must be more than 0 %").lt(100, "near-limit threshold must be less than 100 %"),
    ),
    notes: S.notes,
  })
  .transform(({ nearPercent, ...rest }): CreateLimitProfileInput => ({ ...rest, nearFraction: Number((nearPercent / 100).toFixed(6)) }));
type FormValues = z.input<typeof LimitProfileForm>;
type FormOutput = z.output<typeof LimitProfileForm>;
const FIELDS = ["name", "branchPercent", "totalPercent", "criticalPercent", "nearPercent", "notes"] as const;

/** The profile's figures as the form shows them ("3", "80"). */
const toValues = (profile?: Pick<LimitProfileRecord, "name" | "branchPercent" | "totalPercent" | "criticalPercent" | "nearFraction" | "notes">): FormValues => ({
  name: profile?.name ?? "",
  branchPercent: profile ? String(profile.branchPercent) : "3",
  totalPercent: profile ? String(profile.totalPercent) : "5",
  criticalPercent: profile ? String(profile.criticalPercent) : "3",
  nearPercent: profile ? String(Number((profile.nearFraction * 100).toFixed(4))) : "80",
  notes: profile?.notes ?? "",
});

/** "Name (copy)", kept within the name's length limit. */
export function copyName(name: string): string {
  const suffix = " (copy)";
  return name.length + suffix.length <= JobLimits.profileNameMax ? `${name}${suffix}` : `${name.slice(0, JobLimits.profileNameMax - suffix.length).trimEnd()}${suffix}`;
}

export type LimitProfileFormMode = { mode: "new" } | { mode: "duplicate"; from: LimitProfileRecord } | { mode: "edit"; profile: LimitProfileRecord };

interface LimitProfileFormProps {
  target: LimitProfileFormMode;
  onSaved: (profile: LimitProfileRecord) => void;
  onCancel: () => void;
}

/** Owner only: a new profile, a copy of one, or changes to one the company made. */
export function LimitProfileFormPanel({ target, onSaved, onCancel }: LimitProfileFormProps) {
  const [alert, setAlert] = useState<string | null>(null);
  const create = useCreateLimitProfile();
  const update = useUpdateLimitProfile();
  const pending = create.isPending || update.isPending;
  const initial =
    target.mode === "edit" ? toValues(target.profile) : target.mode === "duplicate" ? toValues({ ...target.from, name: copyName(target.from.name) }) : toValues();
  const {
    register,
    handleSubmit,
    setError,
    formState: { errors },
  } = useForm<FormValues, unknown, FormOutput>({ resolver: zodResolver(LimitProfileForm), defaultValues: initial });

  const onSubmit = handleSubmit((values) => {
    setAlert(null);
    const onError = (error: Error) => setAlert(applyServerError(error, setError, FIELDS, { nearFraction: "nearPercent" }));
    if (target.mode === "edit") update.mutate({ profileId: target.profile.id, patch: values }, { onSuccess: onSaved, onError });
    else create.mutate(values, { onSuccess: onSaved, onError });
  });

  return (
    <form noValidate onSubmit={onSubmit} className="space-y-4">
      <FormAlert message={alert} />
      <TextField label="Name" autoComplete="off" maxLength={JobLimits.profileNameMax} error={errors.name?.message} {...register("name")} />
      <div className="grid gap-4 sm:grid-cols-2">
        <TextField
          label="Branch limit (%)"
          hint="Drop on the last run to a load, as a share of the nominal voltage."
          inputMode="decimal"
          autoComplete="off"
          error={errors.branchPercent?.message}
          {...register("branchPercent")}
        />
        <TextField
          label="Total limit (%)"
          hint="Drop from the source to a load, as a share of the nominal voltage."
          inputMode="decimal"
          autoComplete="off"
          error={errors.totalPercent?.message}
          {...register("totalPercent")}
        />
        <TextField
          label="Critical limit (%)"
          hint="Total drop allowed at loads marked critical (pumps, controls)."
          inputMode="decimal"
          autoComplete="off"
          error={errors.criticalPercent?.message}
          {...register("criticalPercent")}
        />
        <TextField
          label="Near limit from (% of the limit)"
          hint="A load reads Near limit from this share of its limit: 80 means 4 % of a 5 % limit."
          inputMode="decimal"
          autoComplete="off"
          error={errors.nearPercent?.message}
          {...register("nearPercent")}
        />
      </div>
      <Field label="Notes or source" hint="Where the figures come from: a code section, a manufacturer's instruction, the client's specification." error={errors.notes?.message}>
        {(c) => <textarea rows={3} maxLength={JobLimits.notesMax} {...register("notes")} {...c} className={controlClass} />}
      </Field>
      <div className="flex flex-wrap justify-end gap-2">
        <button type="button" onClick={onCancel} disabled={pending} className={secondaryButtonClass}>
          Cancel
        </button>
        <SubmitButton pending={pending}>{target.mode === "edit" ? "Save limit profile" : "Create limit profile"}</SubmitButton>
      </div>
    </form>
  );
}
