import type { LoadStatus } from "../../../../shared/engine/system";
import { cn } from "../../../utils/cn";
import { STATUS_LABEL } from "../lib/format";

/** Status shapes, each distinct without colour: a ring with a tick, a triangle with a bar, an octagon with a cross. */
export function StatusIcon({ status, size = 16, className }: { status: LoadStatus; size?: number; className?: string }) {
  return (
    <svg viewBox="0 0 16 16" width={size} height={size} aria-hidden="true" className={className} fill="none" stroke="currentColor" strokeWidth={1.8} strokeLinecap="round" strokeLinejoin="round">
      {status === "within" ? (
        <>
          <circle cx="8" cy="8" r="6.5" />
          <path d="M5 8.3l2 2 4-4.3" />
        </>
      ) : status === "near" ? (
        <>
          <path d="M8 1.8l6.5 12H1.5z" />
          <path d="M8 6.5v3.3M8 11.9v.1" />
        </>
      ) : (
        <>
          <path d="M5.2 1.5h5.6l3.7 3.7v5.6l-3.7 3.7H5.2l-3.7-3.7V5.2z" />
          <path d="M5.7 5.7l4.6 4.6M10.3 5.7l-4.6 4.6" />
        </>
      )}
    </svg>
  );
}

const BADGE_CLASS: Record<LoadStatus, string> = {
  within: "text-within-700",
  near: "text-near-700",
  over: "font-bold text-over-700",
};

/** Icon + words; the colour only repeats them. */
export function StatusBadge({ status, className }: { status: LoadStatus; className?: string }) {
  return (
    <span className={cn("inline-flex items-center gap-1 whitespace-nowrap", BADGE_CLASS[status], className)}>
      <StatusIcon status={status} />
      <span>{STATUS_LABEL[status]}</span>
    </span>
  );
}

export type Severity = "error" | "warning" | "info";

const SEVERITY_WORD: Record<Severity, string> = { error: "Error", warning: "Warning", info: "Note" };

/** A finding's severity: the shape of the matching status, or an "i" for notes, with its word for screen readers. */
export function SeverityIcon({ severity }: { severity: Severity }) {
  if (severity === "info") {
    return (
      <span className="inline-flex text-ink-500">
        <svg viewBox="0 0 16 16" width={16} height={16} aria-hidden="true" fill="none" stroke="currentColor" strokeWidth={1.8} strokeLinecap="round">
          <circle cx="8" cy="8" r="6.5" />
          <path d="M8 7.2v4.2M8 4.6v.1" />
        </svg>
        <span className="sr-only">{SEVERITY_WORD.info}</span>
      </span>
    );
  }
  const status: LoadStatus = severity === "error" ? "over" : "near";
  return (
    <span className={cn("inline-flex", severity === "error" ? "text-over-700" : "text-near-700")}>
      <StatusIcon status={status} />
      <span className="sr-only">{SEVERITY_WORD[severity]}</span>
    </span>
  );
}
