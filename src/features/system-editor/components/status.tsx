import type { LoadStatus } from "../../../../shared/engine/system";
import { LoadStatusIcon } from "../../../components/ui/load-status";
import { cn } from "../../../utils/cn";

export type Severity = "error" | "warning" | "info";

const SEVERITY_WORD: Record<Severity, string> = { error: "Error", warning: "Warning", info: "Note" };

/** A finding's severity: the shape of the matching load status, or an "i" for notes, with its word for screen readers. */
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
      <LoadStatusIcon status={status} />
      <span className="sr-only">{SEVERITY_WORD[severity]}</span>
    </span>
  );
}
