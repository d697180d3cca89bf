import type { PaymentStatus } from "../../../../shared/schemas/payments";
import { cn } from "../../../utils/cn";
import { PAYMENT_STATUS_LABELS } from "../lib/format";

// Like the quote stages, ink for money that is settled; a payment to check takes the alert's colours and a mark,
// never colour alone: the word is always there.
const BADGE_CLASS: Record<PaymentStatus, string> = {
  paid: "border-ink-800 bg-ink-800 text-white",
  mismatch: "border-over-100 bg-over-50 text-over-700",
  "partially refunded": "border-ink-300 bg-ink-100 text-ink-700",
  refunded: "border-dashed border-ink-300 bg-ink-50 text-ink-600",
};

export function PaymentStatusBadge({ status, className }: { status: PaymentStatus; className?: string }) {
  return (
    <span className={cn("inline-flex items-center gap-1 whitespace-nowrap rounded-full border px-2 py-0.5 text-xs font-medium", BADGE_CLASS[status], className)}>
      {status === "mismatch" ? (
        <span aria-hidden="true" className="font-bold">
          !
        </span>
      ) : null}
      {PAYMENT_STATUS_LABELS[status]}
    </span>
  );
}
