import type { QuoteDetail } from "../../../../shared/schemas/estimates";
import { formatWhen, quoteEventLabel } from "../lib/format";

/** Events that need someone to look: drawn with the alert's colour (their label says why). */
const ALERT_EVENTS = new Set(["send_failed", "payment_flagged"]);

/** The quote's history, oldest first: created, sent, opened, answered, links made and stopped, deposits paid and refunded. */
export function QuoteEvents({ events }: { events: QuoteDetail["events"] }) {
  const ordered = [...events].sort((a, b) => a.at.localeCompare(b.at));
  return (
    <section aria-labelledby="events-heading" className="space-y-2">
      <h2 id="events-heading" className="text-base font-semibold text-ink-900">
        History
      </h2>
      {ordered.length === 0 ? (
        <p className="text-sm text-ink-500">Nothing has happened to this quote yet.</p>
      ) : (
        <ol aria-label="History" className="relative space-y-3 border-l border-ink-200 pl-4 text-sm">
          {ordered.map((event, i) => (
            <li key={`${event.type}-${event.at}-${i}`} className="relative">
              <span aria-hidden="true" className={`absolute -left-[21px] top-1.5 h-2.5 w-2.5 rounded-full border-2 border-white ${ALERT_EVENTS.has(event.type) ? "bg-over-500" : "bg-copper-500"}`} />
              <p className="font-medium text-ink-900">{quoteEventLabel(event.type)}</p>
              <p className="text-xs text-ink-500">
                <time dateTime={event.at}>{formatWhen(event.at)}</time>
                {event.actor ? ` · ${event.actor}` : ""}
              </p>
              {event.detail ? <p className="mt-0.5 whitespace-pre-line text-ink-700">{event.detail}</p> : null}
            </li>
          ))}
        </ol>
      )}
    </section>
  );
}
