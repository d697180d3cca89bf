// How quotes, their events and their times are written, shared by the quote screen, the job's
// quotes and the dashboard.
import type { QuoteStatus } from "../../../../shared/schemas/estimates";

export const QUOTE_STATUS_LABELS: Record<QuoteStatus, string> = {
  draft: "Draft",
  sent: "Sent",
  viewed: "Viewed",
  accepted: "Accepted",
  declined: "Declined",
  expired: "Expired",
  "deposit paid": "Deposit paid",
};

export const QUOTE_EVENT_LABELS: Record<string, string> = {
  created: "Quote created",
  sent: "Sent to the client",
  send_pending: "Send pending: the mail server did not take it; retrying",
  send_failed: "Could not be sent",
  viewed: "Opened by the client",
  accepted: "Accepted by the client",
  declined: "Declined by the client",
  expired: "Expired",
  link_revoked: "Client link stopped",
  link_issued: "New client link made",
  deposit_paid: "Deposit paid",
  payment_flagged: "Payment flagged",
  refunded: "Refunded",
};

/** An event type in words; an unknown one with its underscores as spaces. */
export const quoteEventLabel = (type: string) => QUOTE_EVENT_LABELS[type] ?? type.replace(/_/g, " ").replace(/^./, (c) => c.toUpperCase());

/** A quote the client has agreed to: the installer's cut list exists from here on. */
export const isAcceptedStatus = (status: QuoteStatus) => status === "accepted" || status === "deposit paid";

const whenFormat = new Intl.DateTimeFormat(undefined, { dateStyle: "medium", timeStyle: "short" });
const dayFormat = new Intl.DateTimeFormat(undefined, { day: "numeric", month: "short", year: "numeric" });

/** An ISO timestamp as date and time in the reader's locale. */
export function formatWhen(iso: string): string {
  const date = new Date(iso);
  return Number.isNaN(date.getTime()) ? iso : whenFormat.format(date);
}

/** A day ("2026-12-31", or a timestamp) in the reader's locale; a plain date is that day wherever the reader is. */
export function formatDay(value: string): string {
  const plain = /^(\d{4})-(\d{2})-(\d{2})$/.exec(value);
  const date = plain ? new Date(Number(plain[1]), Number(plain[2]) - 1, Number(plain[3])) : new Date(value);
  return Number.isNaN(date.getTime()) ? value : dayFormat.format(date);
}

/** Whole days from `iso` to `now`. */
export function daysSince(iso: string, now = Date.now()): number {
  const t = new Date(iso).getTime();
  return Number.isNaN(t) ? 0 : Math.max(0, Math.floor((now - t) / 86_400_000));
}

export const quotePdfHref = (quoteId: string, download = false) => `/api/quotes/${encodeURIComponent(quoteId)}/pdf${download ? "?download=1" : ""}`;
export const cutListHref = (jobId: string) => `/api/jobs/${encodeURIComponent(jobId)}/cut-list.pdf`;
