import { zodResolver } from "@hookform/resolvers/zod";
import { useEffect, useId, useRef, useState } from "react";
import { useForm, type Resolver } from "react-hook-form";
import type { z } from "zod";
import { AcceptQuoteInput, DeclineQuoteInput, EstimateLimits, type PublicQuote } from "../../../../shared/schemas/estimates";
import { formatMoney } from "../../../../shared/money";
import { controlClass, Field, FormAlert, SubmitButton, secondaryButtonClass } from "../../../components/ui/form";
import { applyServerError } from "../../../lib/form-errors";
import { formatDay } from "../utils/format";
import { useAcceptQuote, type AcceptQuoteBody } from "../api/accept-quote";
import { useDeclineQuote, type DeclineQuoteBody } from "../api/decline-quote";
import { ContractorContact } from "./contractor-contact";

/**
 * The end of the page: while the quote is open, the accept form and the decline button; after
 * that, what was decided. The result takes focus when it replaces the form, so a keyboard or
 * screen-reader user lands on it.
 */
export function QuoteDecision({ token, quote }: { token: string; quote: PublicQuote }) {
  // Open when the page loaded and decided now: the decision was made here, so its result takes focus.
  const [openedOpen] = useState(quote.state === "open");
  if (quote.state === "open") {
    return (
      <section aria-labelledby="quote-decision" className="rounded-lg border border-copper-200 bg-copper-50/40 p-4 sm:p-6 print:hidden">
        <h2 id="quote-decision" className="text-lg font-semibold text-ink-900">
          Your decision
        </h2>
        <div className="mt-4 space-y-6">
          <AcceptForm token={token} quote={quote} />
          <DeclineArea token={token} quote={quote} />
        </div>
      </section>
    );
  }
  return <DecidedPanel quote={quote} takeFocus={openedOpen} />;
}

// ---------------------------------------------------------------- accept

/** The box starts unticked; the schema only takes `true`, so the form holds a boolean until it is checked. */
type AcceptValues = { name: string; agree: boolean };
const acceptResolver = zodResolver(AcceptQuoteInput) as unknown as Resolver<AcceptValues, unknown, AcceptQuoteBody>;

function AcceptForm({ token, quote }: { token: string; quote: PublicQuote }) {
  const [alert, setAlert] = useState<string | null>(null);
  const accept = useAcceptQuote(token);
  const headingId = useId();
  const agreeId = `agree-${headingId.replace(/[^a-zA-Z0-9_-]/g, "")}`;
  const agreeErrorId = `${agreeId}-error`;
  const {
    register,
    handleSubmit,
    setError,
    formState: { errors },
  } = useForm<AcceptValues, unknown, AcceptQuoteBody>({ resolver: acceptResolver, defaultValues: { name: "", agree: false } });
  const { currency, totals, company } = quote.snapshot;

  const onSubmit = handleSubmit((body) => {
    setAlert(null);
    accept.mutate(body, { onError: (error) => setAlert(applyServerError(error, setError, ["name", "agree"])) });
  });

  return (
    <form noValidate onSubmit={onSubmit} aria-labelledby={headingId} className="space-y-4">
      <div>
        <h3 id={headingId} className="text-base font-semibold text-ink-900">
          Accept this quote
        </h3>
        <p className="mt-1 text-sm text-ink-600">
          Accepting asks {company.name} to go ahead with the work as quoted, for a total of {formatMoney(totals.totalMinor, currency)}. A deposit of{" "}
          {formatMoney(totals.depositMinor, currency)} is due on acceptance.
        </p>
      </div>
      <FormAlert message={alert} />
      <Field label="Your full name" error={errors.name?.message}>
        {(control) => (
          <input type="text" autoComplete="name" maxLength={EstimateLimits.acceptNameMax} {...register("name")} {...control} className={`${controlClass} max-w-md`} />
        )}
      </Field>
      <div className="space-y-1">
        <div className="flex items-start gap-2">
          <input
            type="checkbox"
            id={agreeId}
            aria-invalid={Boolean(errors.agree)}
            aria-describedby={errors.agree ? agreeErrorId : undefined}
            {...register("agree")}
            className="mt-0.5 size-4 shrink-0 cursor-pointer accent-copper-600"
          />
          <label htmlFor={agreeId} className="cursor-pointer text-sm text-ink-800">
            I have read and agree to the terms above
          </label>
        </div>
        {errors.agree?.message ? (
          <p id={agreeErrorId} className="flex gap-1 text-xs font-medium text-over-700">
            <span aria-hidden="true">✕</span>
            <span className="first-letter:uppercase">{errors.agree.message}</span>
          </p>
        ) : null}
      </div>
      <SubmitButton pending={accept.isPending}>Accept quote</SubmitButton>
    </form>
  );
}

// ---------------------------------------------------------------- decline

type DeclineValues = z.input<typeof DeclineQuoteInput>;

function DeclineArea({ token, quote }: { token: string; quote: PublicQuote }) {
  const [open, setOpen] = useState(false);
  const openerRef = useRef<HTMLButtonElement>(null);
  const wasOpen = useRef(false);
  // Back to the button that opened the form when it is cancelled.
  useEffect(() => {
    if (!open && wasOpen.current) openerRef.current?.focus();
    wasOpen.current = open;
  }, [open]);
  return (
    <div className="border-t border-copper-100 pt-4">
      {open ? (
        <DeclineForm token={token} quote={quote} onCancel={() => setOpen(false)} />
      ) : (
        <div className="space-y-2">
          <p className="text-sm text-ink-600">Not going ahead? Let {quote.snapshot.company.name} know.</p>
          <button ref={openerRef} type="button" className={secondaryButtonClass} onClick={() => setOpen(true)}>
            Decline quote
          </button>
        </div>
      )}
    </div>
  );
}

function DeclineForm({ token, quote, onCancel }: { token: string; quote: PublicQuote; onCancel(): void }) {
  const [alert, setAlert] = useState<string | null>(null);
  const decline = useDeclineQuote(token);
  const headingId = useId();
  const {
    register,
    handleSubmit,
    setError,
    setFocus,
    formState: { errors },
  } = useForm<DeclineValues, unknown, DeclineQuoteBody>({ resolver: zodResolver(DeclineQuoteInput), defaultValues: { reason: "" } });
  useEffect(() => setFocus("reason"), [setFocus]);

  const onSubmit = handleSubmit((values) => {
    setAlert(null);
    // An empty box sends no reason at all.
    const body: DeclineQuoteBody = values.reason ? { reason: values.reason } : {};
    decline.mutate(body, { onError: (error) => setAlert(applyServerError(error, setError, ["reason"])) });
  });

  return (
    <form noValidate onSubmit={onSubmit} aria-labelledby={headingId} className="space-y-4">
      <h3 id={headingId} className="text-base font-semibold text-ink-900">
        Decline this quote
      </h3>
      <FormAlert message={alert} />
      <Field label="Reason (optional)" hint={`Anything that would help ${quote.snapshot.company.name}: timing, price, scope.`} error={errors.reason?.message}>
        {(control) => <textarea rows={4} maxLength={EstimateLimits.reasonMax} {...register("reason")} {...control} className={controlClass} />}
      </Field>
      <div className="flex flex-wrap gap-3">
        <SubmitButton pending={decline.isPending}>Confirm decline</SubmitButton>
        <button type="button" className={secondaryButtonClass} onClick={onCancel} disabled={decline.isPending}>
          Cancel
        </button>
      </div>
    </form>
  );
}

// ---------------------------------------------------------------- decided

/** The thanks under "Accepted by …": what happens next depends on the deposit (its own panel follows). */
function thanksText(quote: PublicQuote): string {
  const { company, totals, currency } = quote.snapshot;
  const { deposit } = quote;
  const due = formatMoney(totals.depositMinor, currency);
  if (deposit.state === "paid") {
    return `Thank you. The deposit of ${formatMoney(deposit.paidMinor ?? deposit.dueMinor, deposit.currency)} has been received, and ${company.name} will be in touch to arrange the work.`;
  }
  if (deposit.state === "due" && deposit.online) return `Thank you for accepting. Pay the deposit of ${due} below, and ${company.name} will be in touch to arrange the work.`;
  if (deposit.state === "due") return `Thank you for accepting. ${company.name} will be in touch about the deposit of ${due} and to arrange the work.`;
  return `Thank you for accepting. ${company.name} will be in touch to arrange the work.`;
}

function DecidedPanel({ quote, takeFocus }: { quote: PublicQuote; takeFocus: boolean }) {
  const headingRef = useRef<HTMLHeadingElement>(null);
  useEffect(() => {
    if (takeFocus) headingRef.current?.focus();
  }, [takeFocus]);
  const { company } = quote.snapshot;

  if (quote.state === "declined") {
    return (
      <section aria-labelledby="quote-decision" className="rounded-lg border border-ink-200 bg-ink-50 p-4 sm:p-6">
        <h2 id="quote-decision" ref={headingRef} tabIndex={-1} className="text-lg font-semibold text-ink-900">
          You declined this quote
        </h2>
        {quote.declinedAt ? <p className="mt-1 text-sm text-ink-600">Declined on {formatDay(quote.declinedAt)}.</p> : null}
        <p className="mt-3 text-sm text-ink-700">If you change your mind or would like a different quote, contact {company.name}.</p>
        <ContractorContact contactEmail={company.contactEmail} phone={company.phone} className="mt-2" />
      </section>
    );
  }

  const who = quote.acceptedName ?? "you";
  const when = quote.acceptedAt ? ` on ${formatDay(quote.acceptedAt)}` : "";
  return (
    <section aria-labelledby="quote-decision" className="rounded-lg border border-within-100 bg-within-50 p-4 sm:p-6">
      <h2 id="quote-decision" ref={headingRef} tabIndex={-1} className="flex items-center gap-2 text-lg font-semibold text-within-700">
        <span aria-hidden="true">✓</span>
        <span>
          Accepted by {who}
          {when}
        </span>
      </h2>
      <p className="mt-2 text-sm text-ink-800">{thanksText(quote)}</p>
      <ContractorContact contactEmail={company.contactEmail} phone={company.phone} className="mt-2" />
    </section>
  );
}
