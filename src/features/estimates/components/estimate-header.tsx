import type { ReactNode } from "react";
import { Link } from "react-router-dom";
import { paths } from "../../../config/paths";
import { useJob } from "../../jobs/api/get-job";

/** The way back to the job, the title and the screen's main actions. */
export function EstimateHeader({ jobId, subtitle, actions }: { jobId: string; subtitle?: string; actions?: ReactNode }) {
  const job = useJob(jobId);
  return (
    <div className="space-y-3 border-b border-ink-100 pb-4">
      <Link to={paths.job.getHref(jobId)} className="text-sm text-ink-500 hover:text-ink-900">
        <span aria-hidden="true">←</span> {job.data ? job.data.title : "Job"}
      </Link>
      <header className="flex flex-wrap items-end justify-between gap-4">
        <div className="min-w-0">
          <h1 className="text-xl font-semibold tracking-tight text-ink-900">Estimate</h1>
          <p className="mt-1 text-sm text-ink-500">
            {job.data ? `${job.data.title} for ${job.data.client.name}. ` : ""}
            {subtitle}
          </p>
        </div>
        {actions ? <div className="flex flex-wrap gap-2">{actions}</div> : null}
      </header>
    </div>
  );
}
