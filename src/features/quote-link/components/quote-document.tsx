import type { ReactNode } from "react";
import type { PublicQuote } from "../../../../shared/schemas/estimates";
import { CautionsPanel } from "../../../components/ui/cautions-panel";
import { secondaryButtonClass } from "../../../components/ui/form";
import { quoteLinkPdfHref } from "../api/get-public-quote";
import { formatDay, logoSrc } from "../utils/format";
import { ContractorContact } from "./contractor-contact";
import { DepositPanel } from "./deposit-panel";
import { PricedLines } from "./priced-lines";
import { QuoteDecision } from "./quote-decision";
import { VoltageDropSummary } from "./voltage-drop-summary";

const STATE_BADGE: Record<PublicQuote["state"], { text: string; className: string; mark: string } | null> = {
  open: null,
  accepted: { text: "Accepted", className: "border-within-100 bg-within-50 text-within-700", mark: "✓" },
  "deposit paid": { text: "Accepted, deposit paid", className: "border-within-100 bg-within-50 text-within-700", mark: "✓" },
  declined: { text: "Declined", className: "border-ink-200 bg-ink-50 text-ink-700", mark: "–" },
};

/** The quote as the client reads and prints it, with the accept / decline actions and then the deposit at the end. */
export function QuoteDocument({ token, quote }: { token: string; quote: PublicQuote }) {
  const { snapshot } = quote;
  const { company, client, job } = snapshot;
  const logo = logoSrc(company.logo);
  const badge = STATE_BADGE[quote.state];
  return (
    <article className="space-y-10">
      <header className="space-y-6">
        <div className="flex flex-col gap-6 border-b border-ink-100 pb-6 sm:flex-row sm:items-start sm:justify-between">
          <div className="flex min-w-0 items-start gap-4">
            {logo ? <img src={logo} alt={`${company.name} logo`} className="h-16 w-auto max-w-40 shrink-0 object-contain" /> : null}
            <div className="min-w-0 space-y-1">
              <p className="text-lg font-semibold leading-tight text-ink-900">{company.name}</p>
              {company.licenceNumber ? <p className="text-sm text-ink-600">Licence no. {company.licenceNumber}</p> : null}
              {company.address ? <p className="whitespace-pre-line text-sm text-ink-600">{company.address}</p> : null}
              <ContractorContact contactEmail={company.contactEmail} phone={company.phone} />
            </div>
          </div>
          <div className="shrink-0 sm:text-right">
            <h1 className="text-2xl font-semibold tracking-tight text-ink-900">Quote {quote.label}</h1>
            <dl className="mt-2 grid grid-cols-[auto_auto] justify-start gap-x-3 gap-y-0.5 text-sm sm:justify-end">
              <dt className="text-ink-500">Issued</dt>
              <dd className="text-ink-900">{formatDay(snapshot.issuedAt)}</dd>
              <dt className="text-ink-500">Valid until</dt>
              <dd className="text-ink-900">{formatDay(snapshot.validUntil)}</dd>
            </dl>
            {badge ? (
              <p className={`mt-2 inline-flex items-center gap-1.5 rounded-full border px-2.5 py-0.5 text-xs font-semibold ${badge.className}`}>
                <span aria-hidden="true">{badge.mark}</span>
                {badge.text}
              </p>
            ) : null}
          </div>
        </div>

        <div className="grid gap-4 sm:grid-cols-2">
          <dl className="space-y-0.5 text-sm">
            <dt className="text-xs font-semibold uppercase tracking-wide text-ink-500">Prepared for</dt>
            <dd className="font-medium text-ink-900">{client.name}</dd>
            {client.billingAddress ? <dd className="whitespace-pre-line text-ink-600">{client.billingAddress}</dd> : null}
          </dl>
          <dl className="space-y-0.5 text-sm">
            <dt className="text-xs font-semibold uppercase tracking-wide text-ink-500">Job and site</dt>
            <dd className="font-medium text-ink-900">{job.title}</dd>
            {job.siteAddress ? <dd className="whitespace-pre-line text-ink-600">{job.siteAddress}</dd> : null}
          </dl>
        </div>

        <p className="print:hidden">
          <a href={quoteLinkPdfHref(token)} className={secondaryButtonClass}>
            Download PDF
          </a>
        </p>
      </header>

      <Section title="Scope of work">
        {snapshot.scope.length > 0 ? (
          <ul className="list-disc space-y-1 pl-5 text-sm text-ink-800">
            {snapshot.scope.map((item, index) => (
              <li key={index}>{item}</li>
            ))}
          </ul>
        ) : (
          <p className="text-sm text-ink-500">The work is as priced below.</p>
        )}
      </Section>

      <Section title="Prices">
        <PricedLines lines={snapshot.lines} totals={snapshot.totals} currency={snapshot.currency} />
      </Section>

      <Section
        title="Voltage drop"
        lead="Every load was checked for the voltage it receives, against the drop limit for its kind of circuit, before any cable is installed."
      >
        <VoltageDropSummary systems={snapshot.systems} />
      </Section>

      <CautionsPanel extra={snapshot.cautions} />

      <Section title="Terms">
        {snapshot.terms.trim() ? (
          <p className="whitespace-pre-line text-sm text-ink-800">{snapshot.terms}</p>
        ) : (
          <p className="text-sm text-ink-500">No further terms were added to this quote.</p>
        )}
      </Section>

      <QuoteDecision token={token} quote={quote} />
      <DepositPanel token={token} quote={quote} />
    </article>
  );
}

function Section({ title, lead, children }: { title: string; lead?: string; children: ReactNode }) {
  const id = `quote-${title.toLowerCase().replace(/[^a-z]+/g, "-")}`;
  return (
    <section aria-labelledby={id}>
      <h2 id={id} className="border-b border-copper-200 pb-1 text-lg font-semibold text-ink-900">
        {title}
      </h2>
      {lead ? <p className="mt-2 text-sm text-ink-600">{lead}</p> : null}
      <div className="mt-3">{children}</div>
    </section>
  );
}
