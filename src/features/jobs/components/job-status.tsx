import { JOB_STATUSES, type JobStatus } from "../../../../shared/schemas/jobs";
import { cn } from "../../../utils/cn";

export const JOB_STATUS_LABELS: Record<JobStatus, string> = {
  lead: "Lead",
  quoted: "Quoted",
  won: "Won",
  lost: "Lost",
  installed: "Installed",
};

export { JOB_STATUSES };

// Job stages use ink and copper only: teal, amber and brick belong to the load check.
const BADGE_CLASS: Record<JobStatus, string> = {
  lead: "border-ink-200 bg-white text-ink-700",
  quoted: "border-copper-200 bg-copper-50 text-copper-800",
  won: "border-copper-500 bg-copper-500 text-white",
  lost: "border-ink-100 bg-ink-50 text-ink-500",
  installed: "border-ink-800 bg-ink-800 text-white",
};

/** The job's stage as a badge; the word is always there. */
export function JobStatusBadge({ status, className }: { status: JobStatus; className?: string }) {
  return (
    <span className={cn("inline-flex items-center whitespace-nowrap rounded-full border px-2 py-0.5 text-xs font-medium", BADGE_CLASS[status], className)}>
      {JOB_STATUS_LABELS[status]}
    </span>
  );
}

export const isJobStatus = (value: string | null): value is JobStatus => value !== null && (JOB_STATUSES as readonly string[]).includes(value);
