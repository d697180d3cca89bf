import { zodResolver } from "@hookform/resolvers/zod";
import { useState } from "react";
import { useForm } from "react-hook-form";
import { Link, useNavigate } from "react-router-dom";
import { z } from "zod";
import { JobLimits, UpdateJobInput, type JobDetail, type JobStatus } from "../../../../shared/schemas/jobs";
import { ConfirmDialog } from "../../../components/ui/confirm-dialog";
import { EmptyState } from "../../../components/ui/empty-state";
import { controlClass, dangerButtonClass, Field, FormAlert, FormStatus, secondaryButtonClass, SubmitButton } from "../../../components/ui/form";
import { CompassIcon } from "../../../components/ui/icons";
import { paths } from "../../../config/paths";
import { ApiError } from "../../../lib/api-client";
import { applyServerError } from "../../../lib/form-errors";
import { cn } from "../../../utils/cn";
import { formatDate } from "../../../utils/format-date";
import { AttachmentsSection } from "../../attachments/components/attachments-section";
import { JobPaymentsSection } from "../../payments/components/job-payments-section";
import { JobQuotesSection } from "../../quotes/components/job-quotes-section";
import { useDeleteJob } from "../api/delete-job";
import { useJob } from "../api/get-job";
import { useUpdateJob } from "../api/update-job";
import { Dialog } from "../../../components/ui/dialog";
import { EditJobDetailsForm } from "./job-form";
import { JOB_STATUS_LABELS, JOB_STATUSES, JobStatusBadge } from "./job-status";
import { SystemsSection } from "./systems-section";
import { LoadFailed } from "../../../components/ui/load-failed";

const linkButtonClass = "rounded-md bg-ink-900 px-4 py-2 text-sm font-medium text-white hover:bg-ink-800";

export function JobNotFound() {
  return (
    <EmptyState
      title="Job not found"
      icon={<CompassIcon />}
      action={
        <Link to={paths.jobs.getHref()} className={linkButtonClass}>
          Back to jobs
        </Link>
      }
    >
      This job does not exist in your company. It may have been deleted, or the link belongs to another company.
    </EmptyState>
  );
}

/** "Job status": changing it saves at once. */
function StatusSelect({ job, onError }: { job: JobDetail; onError: (message: string | null) => void }) {
  const update = useUpdateJob();
  const shown = update.isPending ? (update.variables.patch.status ?? job.status) : job.status;
  return (
    <div className="flex items-center gap-2">
      <label htmlFor="job-status" className="text-sm font-medium text-ink-800">
        Job status
      </label>
      <select
        id="job-status"
        value={shown}
        disabled={update.isPending}
        aria-busy={update.isPending}
        onChange={(event) => {
          onError(null);
          update.mutate({ jobId: job.id, patch: { status: event.target.value as JobStatus } }, { onError: (error) => onError(`The status was not changed. ${error.message}`) });
        }}
        className={cn(controlClass, "w-auto py-1")}
      >
        {JOB_STATUSES.map((s) => (
          <option key={s} value={s}>
            {JOB_STATUS_LABELS[s]}
          </option>
        ))}
      </select>
    </div>
  );
}

const NotesForm = z.object({ notes: UpdateJobInput.shape.notes.unwrap() });
type NotesValues = z.input<typeof NotesForm>;

/** The job's notes: a text box with "Save notes" for writers, the text for everyone else. */
function JobNotes({ job, canWrite }: { job: JobDetail; canWrite: boolean }) {
  const update = useUpdateJob();
  const [alert, setAlert] = useState<string | null>(null);
  const [saved, setSaved] = useState(false);
  const {
    register,
    handleSubmit,
    setError,
    reset,
    formState: { errors, isDirty },
  } = useForm<NotesValues, unknown, z.output<typeof NotesForm>>({ resolver: zodResolver(NotesForm), defaultValues: { notes: job.notes ?? "" } });

  if (!canWrite) {
    return (
      <section aria-labelledby="notes-heading">
        <h2 id="notes-heading" className="text-sm font-semibold text-ink-900">
          Notes
        </h2>
        <p className="mt-1 whitespace-pre-line text-sm text-ink-700">{job.notes ?? <span className="text-ink-500">No notes.</span>}</p>
      </section>
    );
  }

  const onSubmit = handleSubmit((values) => {
    setAlert(null);
    setSaved(false);
    update.mutate(
      { jobId: job.id, patch: values },
      {
        onSuccess: (next) => {
          reset({ notes: next.notes ?? "" });
          setSaved(true);
        },
        onError: (error) => setAlert(applyServerError(error, setError, ["notes"])),
      },
    );
  });

  return (
    <form noValidate onSubmit={onSubmit} className="space-y-2">
      <FormAlert message={alert} />
      <Field label="Notes" error={errors.notes?.message}>
        {(c) => <textarea rows={4} maxLength={JobLimits.notesMax} placeholder="Access, roof type, battery location, who to call on site…" {...register("notes", { onChange: () => setSaved(false) })} {...c} className={controlClass} />}
      </Field>
      <div className="flex flex-wrap items-center gap-3">
        {isDirty || update.isPending ? <SubmitButton pending={update.isPending}>Save notes</SubmitButton> : null}
        <FormStatus message={saved && !isDirty ? "Notes saved" : null} />
      </div>
    </form>
  );
}

function JobView({ job, canWrite }: { job: JobDetail; canWrite: boolean }) {
  const navigate = useNavigate();
  const remove = useDeleteJob();
  const [alert, setAlert] = useState<string | null>(null);
  const [editing, setEditing] = useState(false);
  const [deleting, setDeleting] = useState(false);

  const confirmDelete = () =>
    remove.mutate(job.id, {
      onSuccess: () => navigate(paths.jobs.getHref(), { replace: true }),
      onError: (error) => {
        setDeleting(false);
        setAlert(`The job was not deleted. ${error.message}`);
      },
    });

  const counts = [
    job.systems.length > 0 ? `${job.systems.length} ${job.systems.length === 1 ? "system" : "systems"}` : null,
    job.attachments.length > 0 ? `${job.attachments.length} ${job.attachments.length === 1 ? "attachment" : "attachments"}` : null,
  ].filter(Boolean);

  return (
    <div className="space-y-8">
      <div className="space-y-4 border-b border-ink-100 pb-5">
        <Link to={paths.jobs.getHref()} className="text-sm text-ink-500 hover:text-ink-900">
          <span aria-hidden="true">←</span> Jobs
        </Link>
        <header className="flex flex-wrap items-start justify-between gap-4">
          <div className="min-w-0">
            <h1 className="break-words text-xl font-semibold tracking-tight text-ink-900">{job.title}</h1>
            <p className="mt-1 text-sm text-ink-600">{job.client.name}</p>
          </div>
          <div className="flex flex-wrap items-center gap-2">
            {canWrite ? (
              <>
                <StatusSelect job={job} onError={setAlert} />
                <button type="button" onClick={() => setEditing(true)} className={secondaryButtonClass}>
                  Edit details
                </button>
                <button type="button" onClick={() => setDeleting(true)} className={dangerButtonClass}>
                  Delete job
                </button>
              </>
            ) : (
              <p className="flex items-center gap-2 text-sm text-ink-600">
                Status <JobStatusBadge status={job.status} />
              </p>
            )}
          </div>
        </header>
        <FormAlert message={alert} />
        <div className="grid gap-6 lg:grid-cols-[minmax(0,1fr)_minmax(0,1fr)]">
          <dl className="grid gap-x-6 gap-y-3 text-sm sm:grid-cols-2">
            <div>
              <dt className="text-xs font-medium uppercase tracking-wide text-ink-500">Client</dt>
              <dd className="mt-0.5 text-ink-900">{job.client.name}</dd>
            </div>
            <div>
              <dt className="text-xs font-medium uppercase tracking-wide text-ink-500">Site address</dt>
              <dd className="mt-0.5 whitespace-pre-line text-ink-900">{job.siteAddress ?? <span className="text-ink-500">Not given</span>}</dd>
            </div>
            <div>
              <dt className="text-xs font-medium uppercase tracking-wide text-ink-500">Created by</dt>
              <dd className="mt-0.5 text-ink-900">
                {job.createdBy?.name ?? <span className="text-ink-500">A former member</span>} · {formatDate(job.createdAt)}
              </dd>
            </div>
            <div>
              <dt className="text-xs font-medium uppercase tracking-wide text-ink-500">Updated</dt>
              <dd className="mt-0.5 text-ink-900">{formatDate(job.updatedAt)}</dd>
            </div>
          </dl>
          <JobNotes key={job.id} job={job} canWrite={canWrite} />
        </div>
      </div>

      <SystemsSection jobId={job.id} systems={job.systems} canWrite={canWrite} />
      <AttachmentsSection jobId={job.id} attachments={job.attachments} canWrite={canWrite} />

      <JobQuotesSection jobId={job.id} />
      <JobPaymentsSection jobId={job.id} />

      {editing ? (
        <Dialog size="md" closeButton title="Edit job details" onClose={() => setEditing(false)}>
          <EditJobDetailsForm job={job} onSaved={() => setEditing(false)} onCancel={() => setEditing(false)} />
        </Dialog>
      ) : null}
      {deleting ? (
        <ConfirmDialog title={`Delete ${job.title}?`} confirmLabel="Delete job" pending={remove.isPending} onConfirm={confirmDelete} onCancel={() => setDeleting(false)}>
          {counts.length > 0 ? `Its ${counts.join(" and ")} are deleted with it. ` : ""}This cannot be undone.
        </ConfirmDialog>
      ) : null}
    </div>
  );
}

/** The job page: details, systems, site photos and plans, quotes and their payments; "Job not found" for an unknown id. */
export function JobPage({ jobId, canWrite }: { jobId: string; canWrite: boolean }) {
  const { data, error, isPending, isFetching, refetch } = useJob(jobId);
  if (isPending) return <p className="text-sm text-ink-500">Loading the job…</p>;
  if (error) {
    if (error instanceof ApiError && error.status === 404) return <JobNotFound />;
    return (
      <LoadFailed className="max-w-xl" message={`The job could not be loaded. ${error.message}`} retrying={isFetching} onRetry={() => void refetch()} />
    );
  }
  return <JobView job={data} canWrite={canWrite} />;
}
