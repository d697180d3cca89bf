import type { LOAD_STATUSES } from "../../../../shared/schemas/jobs";
import { cn } from "../../../utils/cn";

export type LoadStatus = (typeof LOAD_STATUSES)[number];

export const LOAD_STATUS_LABELS: Record<LoadStatus, string> = {
  within: "Within limit",
  near: "Near limit",
  over: "Over limit",
};

const STATUS_CLASS: Record<LoadStatus, string> = {
  within: "text-within-700",
  near: "text-near-700",
  over: "text-over-700",
};

/** Each status has its own shape as well as its hue: a tick in a circle, a triangle with "!", a cross in an octagon. */
export function LoadStatusIcon({ status, className }: { status: LoadStatus | null; className?: string }) {
  const common = { viewBox: "0 0 16 16", width: 16, height: 16, fill: "none", stroke: "currentColor", strokeWidth: 1.6, strokeLinecap: "round" as const, strokeLinejoin: "round" as const, "aria-hidden": true, className: cn("shrink-0", className) };
  switch (status) {
    case "within":
      return (
        <svg {...common}>
          <circle cx="8" cy="8" r="6.5" />
          <path d="M5 8.2l2 2 4-4.2" />
        </svg>
      );
    case "near":
      return (
        <svg {...common}>
          <path d="M8 1.8l6.6 12H1.4z" />
          <path d="M8 6.2v3.4M8 11.7v.1" />
        </svg>
      );
    case "over":
      return (
        <svg {...common}>
          <path d="M5.3 1.5h5.4l3.8 3.8v5.4l-3.8 3.8H5.3l-3.8-3.8V5.3z" />
          <path d="M5.8 5.8l4.4 4.4M10.2 5.8l-4.4 4.4" />
        </svg>
      );
    default:
      return (
        <svg {...common}>
          <circle cx="8" cy="8" r="6.5" strokeDasharray="2 2" />
        </svg>
      );
  }
}

/** A load status in words with its icon; null reads "Not solved" (or the given text). */
export function LoadStatusLabel({ status, emptyText = "Not solved", className }: { status: LoadStatus | null; emptyText?: string; className?: string }) {
  return (
    <span className={cn("inline-flex items-center gap-1.5 whitespace-nowrap font-medium", status ? STATUS_CLASS[status] : "text-ink-500", className)}>
      <LoadStatusIcon status={status} />
      {status ? LOAD_STATUS_LABELS[status] : emptyText}
    </span>
  );
}
