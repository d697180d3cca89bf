import { zodResolver } from "@hookform/resolvers/zod";
import { useState } from "react";
import { Controller, useForm } from "react-hook-form";
import { z } from "zod";
import { CreateJobInput, JobLimits, type JobDetail } from "../../../../shared/schemas/jobs";
import { controlClass, Field, FormAlert, secondaryButtonClass, SelectField, SubmitButton, TextField } from "../../../components/ui/form";
import { applyServerError } from "../../../lib/form-errors";
import { useCreateJob } from "../api/create-job";
import { useUpdateJob } from "../api/update-job";
import { ClientPicker } from "./client-picker";
import { JOB_STATUS_LABELS, JOB_STATUSES } from "./job-status";

// The shared body, with a plainer word than "not a valid id" while no client is chosen.
const NewJobForm = CreateJobInput.extend({ clientId: z.string().min(1, "Choose a client").pipe(CreateJobInput.shape.clientId) });
type NewJobValues = z.input<typeof NewJobForm>;
type NewJobOutput = z.output<typeof NewJobForm>;
const NEW_FIELDS = ["clientId", "title", "siteAddress", "status", "notes"] as const;

interface NewJobFormProps {
  onCreated: (job: JobDetail) => void;
  onCancel: () => void;
}

/** Client, title, site address, status and notes → POST /api/jobs. */
export function JobForm({ onCreated, onCancel }: NewJobFormProps) {
  const [alert, setAlert] = useState<string | null>(null);
  const create = useCreateJob();
  const {
    register,
    control,
    handleSubmit,
    setError,
    formState: { errors },
  } = useForm<NewJobValues, unknown, NewJobOutput>({
    resolver: zodResolver(NewJobForm),
    defaultValues: { clientId: "", title: "", siteAddress: "", status: "lead", notes: "" },
  });

  const onSubmit = handleSubmit((values) => {
    setAlert(null);
    create.mutate(values, { onSuccess: onCreated, onError: (error) => setAlert(applyServerError(error, setError, NEW_FIELDS)) });
  });

  return (
    <form noValidate onSubmit={onSubmit} className="space-y-4">
      <FormAlert message={alert} />
      <Controller
        control={control}
        name="clientId"
        render={({ field, fieldState }) => <ClientPicker value={field.value} onChange={field.onChange} onBlur={field.onBlur} error={fieldState.error?.message} />}
      />
      <TextField label="Title" autoComplete="off" maxLength={JobLimits.titleMax} placeholder="Cabin battery bank and outbuilding lights" error={errors.title?.message} {...register("title")} />
      <Field label="Site address" error={errors.siteAddress?.message}>
        {(c) => <textarea rows={2} maxLength={JobLimits.addressMax} {...register("siteAddress")} {...c} className={controlClass} />}
      </Field>
      <SelectField label="Status" error={errors.status?.message} {...register("status")}>
        {JOB_STATUSES.map((s) => (
          <option key={s} value={s}>
            {JOB_STATUS_LABELS[s]}
          </option>
        ))}
      </SelectField>
      <Field label="Notes" error={errors.notes?.message}>
        {(c) => <textarea rows={3} maxLength={JobLimits.notesMax} {...register("notes")} {...c} className={controlClass} />}
      </Field>
      <div className="flex flex-wrap justify-end gap-2">
        <button type="button" onClick={onCancel} disabled={create.isPending} className={secondaryButtonClass}>
          Cancel
        </button>
        <SubmitButton pending={create.isPending}>Create job</SubmitButton>
      </div>
    </form>
  );
}

const S = CreateJobInput.shape;
const JobDetailsForm = z.object({
  clientId: z.string().min(1, "Choose a client").pipe(S.clientId),
  title: S.title,
  siteAddress: S.siteAddress,
});
type JobDetailsValues = z.input<typeof JobDetailsForm>;
type JobDetailsOutput = z.output<typeof JobDetailsForm>;

/** Client, title and site address of an existing job → PATCH /api/jobs/:jobId. */
export function EditJobDetailsForm({ job, onSaved, onCancel }: { job: JobDetail; onSaved: (job: JobDetail) => void; onCancel: () => void }) {
  const [alert, setAlert] = useState<string | null>(null);
  const update = useUpdateJob();
  const {
    register,
    control,
    handleSubmit,
    setError,
    formState: { errors },
  } = useForm<JobDetailsValues, unknown, JobDetailsOutput>({
    resolver: zodResolver(JobDetailsForm),
    defaultValues: { clientId: job.client.id, title: job.title, siteAddress: job.siteAddress ?? "" },
  });

  const onSubmit = handleSubmit((patch) => {
    setAlert(null);
    update.mutate(
      { jobId: job.id, patch: patch.clientId === job.client.id ? { title: patch.title, siteAddress: patch.siteAddress } : patch },
      { onSuccess: onSaved, onError: (error) => setAlert(applyServerError(error, setError, ["clientId", "title", "siteAddress"])) },
    );
  });

  return (
    <form noValidate onSubmit={onSubmit} className="space-y-4">
      <FormAlert message={alert} />
      <Controller
        control={control}
        name="clientId"
        render={({ field, fieldState }) => (
          <ClientPicker value={field.value} onChange={field.onChange} onBlur={field.onBlur} error={fieldState.error?.message} current={job.client} />
        )}
      />
      <TextField label="Title" autoComplete="off" maxLength={JobLimits.titleMax} error={errors.title?.message} {...register("title")} />
      <Field label="Site address" error={errors.siteAddress?.message}>
        {(c) => <textarea rows={2} maxLength={JobLimits.addressMax} {...register("siteAddress")} {...c} className={controlClass} />}
      </Field>
      <div className="flex flex-wrap justify-end gap-2">
        <button type="button" onClick={onCancel} disabled={update.isPending} className={secondaryButtonClass}>
          Cancel
        </button>
        <SubmitButton pending={update.isPending}>Save job</SubmitButton>
      </div>
    </form>
  );
}
