import type { QuoteStatus } from "../../../../shared/schemas/estimates";
import { cn } from "../../../utils/cn";
import { QUOTE_STATUS_LABELS } from "../lib/format";

// Quote stages use ink and copper only (teal, amber and brick belong to the load check); the word is always there.
const BADGE_CLASS: Record<QuoteStatus, string> = {
  draft: "border-ink-200 bg-white text-ink-700",
  sent: "border-copper-200 bg-copper-50 text-copper-800",
  viewed: "border-copper-300 bg-copper-100 text-copper-900",
  accepted: "border-copper-600 bg-copper-600 text-white",
  "deposit paid": "border-ink-800 bg-ink-800 text-white",
  declined: "border-ink-300 bg-ink-100 text-ink-700",
  expired: "border-dashed border-ink-300 bg-ink-50 text-ink-500",
};

const badgeBase = "inline-flex items-center whitespace-nowrap rounded-full border px-2 py-0.5 text-xs font-medium";

export function QuoteStatusBadge({ status, className }: { status: QuoteStatus; className?: string }) {
  return <span className={cn(badgeBase, BADGE_CLASS[status], className)}>{QUOTE_STATUS_LABELS[status]}</span>;
}

/** The mail server has not taken the e-mail yet; the server keeps trying. */
export function SendPendingBadge({ className }: { className?: string }) {
  return (
    <span title="The e-mail is waiting for the mail server; Runwright keeps trying" className={cn(badgeBase, "border-dashed border-copper-400 bg-copper-50 text-copper-800", className)}>
      Send pending
    </span>
  );
}

/** A later revision of the same quote exists. */
export function SupersededBadge({ className }: { className?: string }) {
  return (
    <span title="A later revision of this quote exists" className={cn(badgeBase, "border-dashed border-ink-400 bg-white text-ink-600", className)}>
      Superseded
    </span>
  );
}
