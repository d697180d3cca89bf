import type { ClosedLink } from "../api/get-public-quote";
import { ContractorContact } from "./contractor-contact";
import { QuoteLinkShell } from "./quote-link-shell";

const TITLES: Record<ClosedLink["reason"], string> = {
  expired: "This quote has expired",
  revoked: "This link no longer works",
  superseded: "A newer version of this quote was sent to you",
  unknown: "We could not find this quote",
};

function explanation(reason: ClosedLink["reason"], company: string): string {
  switch (reason) {
    case "expired":
      return `The time to accept this quote has passed. If you would still like the work done, ask ${company} for a new quote.`;
    case "revoked":
      return `${company} has withdrawn this link. They can send you a new one.`;
    case "superseded":
      return `Use the link in the latest e-mail from ${company}: it opens the current version of the quote.`;
    case "unknown":
      return "Check that the whole link from the e-mail was opened: long links are sometimes split across two lines.";
  }
}

/** The page of a link that no longer opens its quote: why, and how to reach the contractor. */
export function ClosedLinkPage({ closed }: { closed: ClosedLink }) {
  const company = closed.companyName ?? "the company that sent it";
  const hasContact = Boolean(closed.contactEmail || closed.phone);
  return (
    <QuoteLinkShell narrow>
      <h1 className="text-xl font-semibold tracking-tight text-ink-900">{TITLES[closed.reason]}</h1>
      <p className="mt-2 text-sm text-ink-600">{explanation(closed.reason, company)}</p>
      <section aria-labelledby="closed-link-contact" className="mt-6 rounded-md bg-ink-50 px-4 py-3">
        <h2 id="closed-link-contact" className="text-sm font-semibold text-ink-900">
          {closed.companyName ? `Contact ${closed.companyName}` : "Contact the contractor"}
        </h2>
        {hasContact ? (
          <ContractorContact contactEmail={closed.contactEmail} phone={closed.phone} className="mt-1" />
        ) : (
          <p className="mt-1 text-sm text-ink-600">Reply to the e-mail that brought you here, or call the company that sent you the quote.</p>
        )}
      </section>
    </QuoteLinkShell>
  );
}
