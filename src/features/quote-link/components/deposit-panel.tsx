import { useQuery } from "@tanstack/react-query";
import { useEffect, useRef, useState, type ReactNode, type RefObject } from "react";
import { useSearchParams } from "react-router-dom";
import { formatMoney } from "../../../../shared/money";
import type { PublicQuote } from "../../../../shared/schemas/estimates";
import { FormAlert, primaryButtonClass, secondaryButtonClass } from "../../../components/ui/form";
import { publicQuoteQueryOptions, quoteLinkReceiptHref } from "../api/get-public-quote";
import { isPaymentProcessing, usePayDeposit } from "../api/pay-deposit";
import { formatDay } from "../utils/format";
import { ContractorContact } from "./contractor-contact";

/** The payment is recorded when the payment service tells the server (a webhook): the page asks again this often… */
const CONFIRM_POLL_MS = 2000;
/** …for this long, then says the receipt will follow by e-mail. */
const CONFIRM_LIMIT_MS = 60_000;

const HEADING_ID = "quote-deposit";
const headingClass = "text-lg font-semibold text-ink-900 outline-none";

/** Moves the focus to a heading when it appears for something the client just did (paid, came back). */
function useFocusWhen(ref: RefObject<HTMLElement | null>, when: boolean) {
  useEffect(() => {
    if (when) ref.current?.focus();
  }, [ref, when]);
}

function Panel({ tone = "plain", className, children }: { tone?: "plain" | "done" | "quiet"; className?: string; children: ReactNode }) {
  const toneClass = {
    plain: "border-copper-200 bg-white",
    done: "border-within-100 bg-within-50 print:border-ink-200 print:bg-white",
    quiet: "border-ink-200 bg-ink-50 print:bg-white",
  }[tone];
  return (
    <section aria-labelledby={HEADING_ID} className={`break-inside-avoid-page rounded-lg border p-4 sm:p-6 ${toneClass} ${className ?? ""}`}>
      {children}
    </section>
  );
}

/**
 * The deposit on the client's page, under their decision: what is due and "Pay deposit" (or whom to
 * contact when online payment is off), the wait while a payment is confirmed, then the receipt.
 * The page comes back from the payment page as ?deposit=returned (paid) or ?deposit=canceled.
 */
export function DepositPanel({ token, quote }: { token: string; quote: PublicQuote }) {
  const [params] = useSearchParams();
  const back = params.get("deposit");
  const { deposit } = quote;
  // Back from paying, or told by the server that the payment is in and being confirmed.
  const [confirming, setConfirming] = useState(back === "returned");
  const [timedOut, setTimedOut] = useState(false);
  const polling = confirming && !timedOut && deposit.state === "due";
  const { refetch } = useQuery({ ...publicQuoteQueryOptions(token), refetchInterval: polling ? CONFIRM_POLL_MS : false });

  useEffect(() => {
    if (!polling) return;
    const timer = window.setTimeout(() => setTimedOut(true), CONFIRM_LIMIT_MS);
    return () => window.clearTimeout(timer);
  }, [polling]);

  switch (deposit.state) {
    case "none":
      return null;
    case "paid":
      return <PaidPanel token={token} quote={quote} takeFocus={confirming} />;
    case "refunded":
      return <RefundedPanel quote={quote} />;
    case "review":
      return <ReviewPanel quote={quote} takeFocus={back !== null} />;
    case "due":
      // Before acceptance (or after a decline) the deposit is only the line in the totals.
      if (quote.state !== "accepted") return null;
      if (confirming && !timedOut) return <ConfirmingPanel quote={quote} takeFocus={back === "returned"} />;
      if (confirming)
        return (
          <SlowConfirmationPanel
            onCheckAgain={() => {
              setTimedOut(false);
              void refetch();
            }}
          />
        );
      return (
        <DuePanel
          token={token}
          quote={quote}
          canceled={back === "canceled"}
          onProcessing={() => {
            setTimedOut(false);
            setConfirming(true);
          }}
        />
      );
  }
}

// ---------------------------------------------------------------- due

function DuePanel({ token, quote, canceled, onProcessing }: { token: string; quote: PublicQuote; canceled: boolean; onProcessing(): void }) {
  const { deposit } = quote;
  const { company } = quote.snapshot;
  const pay = usePayDeposit(token);
  const { reset } = pay;
  const [alert, setAlert] = useState<string | null>(null);
  const headingRef = useRef<HTMLHeadingElement>(null);
  useFocusWhen(headingRef, canceled);

  // Back from the payment page with the browser's Back button, the page can come out of the
  // browser's cache as it was left: busy. It is ready again.
  useEffect(() => {
    const onPageShow = (event: PageTransitionEvent) => {
      if (event.persisted) reset();
    };
    window.addEventListener("pageshow", onPageShow);
    return () => window.removeEventListener("pageshow", onPageShow);
  }, [reset]);

  // Still busy once the address is known: the browser is on its way to the payment page.
  const busy = pay.isPending || pay.isSuccess;
  const onPay = () => {
    setAlert(null);
    pay.mutate(undefined, {
      onError: (error) => {
        if (isPaymentProcessing(error)) onProcessing();
        else setAlert(error.message);
      },
    });
  };

  return (
    <Panel>
      <h2 id={HEADING_ID} ref={headingRef} tabIndex={-1} className={headingClass}>
        Deposit due
      </h2>
      <p className="mt-1 text-2xl font-semibold tabular-nums text-copper-700">{formatMoney(deposit.dueMinor, deposit.currency)}</p>
      {canceled ? (
        <p role="status" className="mt-3 rounded-md border border-ink-200 bg-ink-50 px-3 py-2 text-sm text-ink-800 print:hidden">
          Payment canceled — nothing was charged. You can pay the deposit whenever you are ready.
        </p>
      ) : null}
      {deposit.online ? (
        <>
          <p className="mt-2 text-sm text-ink-600">
            You pay on a secure payment page and come back here afterwards; the receipt is e-mailed to you. {company.name} arranges the work once the deposit is in.
          </p>
          <FormAlert message={alert} className="mt-3" />
          <button
            type="button"
            onClick={onPay}
            disabled={busy}
            aria-busy={busy}
            className={`${primaryButtonClass} mt-4 w-full sm:w-auto print:hidden`}
          >
            {busy ? "Opening the payment page…" : "Pay deposit"}
          </button>
        </>
      ) : (
        <>
          <p className="mt-2 text-sm text-ink-700">
            The deposit cannot be paid online for this quote. Please contact {company.name} to pay it
            {company.contactEmail || company.phone ? ":" : ", by replying to the e-mail that brought you here."}
          </p>
          <ContractorContact contactEmail={company.contactEmail} phone={company.phone} className="mt-2" />
        </>
      )}
    </Panel>
  );
}

// ---------------------------------------------------------------- confirming

function ConfirmingPanel({ quote, takeFocus }: { quote: PublicQuote; takeFocus: boolean }) {
  const headingRef = useRef<HTMLHeadingElement>(null);
  useFocusWhen(headingRef, takeFocus);
  const { deposit } = quote;
  return (
    <Panel className="print:hidden">
      <h2 id={HEADING_ID} ref={headingRef} tabIndex={-1} className={headingClass}>
        Confirming your payment…
      </h2>
      <div
        role="progressbar"
        aria-label="Confirming your payment"
        aria-valuetext="Waiting for the payment service"
        className="mt-3 h-1.5 w-full overflow-hidden rounded-full bg-copper-100"
      >
        <div className="h-full w-full animate-pulse rounded-full bg-copper-500 motion-reduce:animate-none" />
      </div>
      <p className="mt-3 text-sm text-ink-600">
        Thank you. The payment service is confirming your deposit of {formatMoney(deposit.dueMinor, deposit.currency)}; this page updates by itself in a few
        seconds. There is no need to pay again.
      </p>
    </Panel>
  );
}

function SlowConfirmationPanel({ onCheckAgain }: { onCheckAgain(): void }) {
  return (
    <Panel className="print:hidden">
      <h2 id={HEADING_ID} tabIndex={-1} className={headingClass}>
        Payment received
      </h2>
      <p role="status" className="mt-2 text-sm text-ink-700">
        Your payment is being confirmed. You will receive a receipt by e-mail shortly.
      </p>
      <button type="button" onClick={onCheckAgain} className={`${secondaryButtonClass} mt-3`}>
        Check again
      </button>
    </Panel>
  );
}

// ---------------------------------------------------------------- after the payment

function PaidPanel({ token, quote, takeFocus }: { token: string; quote: PublicQuote; takeFocus: boolean }) {
  const headingRef = useRef<HTMLHeadingElement>(null);
  useFocusWhen(headingRef, takeFocus);
  const { deposit } = quote;
  return (
    <Panel tone="done">
      <h2 id={HEADING_ID} ref={headingRef} tabIndex={-1} className="flex items-center gap-2 text-lg font-semibold text-within-700 outline-none">
        <span aria-hidden="true">✓</span>
        <span>Deposit paid — thank you</span>
      </h2>
      <dl className="mt-3 grid grid-cols-[auto_1fr] gap-x-4 gap-y-1 text-sm">
        <dt className="text-ink-500">Amount</dt>
        <dd className="font-medium tabular-nums text-ink-900">{formatMoney(deposit.paidMinor ?? deposit.dueMinor, deposit.currency)}</dd>
        {deposit.paidAt ? (
          <>
            <dt className="text-ink-500">Paid on</dt>
            <dd className="text-ink-900">{formatDay(deposit.paidAt)}</dd>
          </>
        ) : null}
        {deposit.receiptNumber ? (
          <>
            <dt className="text-ink-500">Receipt number</dt>
            <dd className="break-all text-ink-900">{deposit.receiptNumber}</dd>
          </>
        ) : null}
      </dl>
      <div className="mt-4 flex flex-wrap gap-2 print:hidden">
        <a href={quoteLinkReceiptHref(token, true)} download className={secondaryButtonClass}>
          Download receipt (PDF)
        </a>
        <a href={quoteLinkReceiptHref(token)} target="_blank" rel="noopener" className={secondaryButtonClass}>
          Open receipt
        </a>
      </div>
    </Panel>
  );
}

function RefundedPanel({ quote }: { quote: PublicQuote }) {
  const { deposit } = quote;
  const { company } = quote.snapshot;
  const paid = deposit.paidAt ? ` paid on ${formatDay(deposit.paidAt)}` : "";
  return (
    <Panel tone="quiet">
      <h2 id={HEADING_ID} tabIndex={-1} className={headingClass}>
        Your deposit was refunded
      </h2>
      <p className="mt-2 text-sm text-ink-700">
        The deposit of {formatMoney(deposit.paidMinor ?? deposit.dueMinor, deposit.currency)}
        {paid} was sent back to the card or account you paid with; it can take several days to appear there. If you have a question about it, contact{" "}
        {company.name}.
      </p>
      <ContractorContact contactEmail={company.contactEmail} phone={company.phone} className="mt-2" />
    </Panel>
  );
}

function ReviewPanel({ quote, takeFocus }: { quote: PublicQuote; takeFocus: boolean }) {
  const headingRef = useRef<HTMLHeadingElement>(null);
  useFocusWhen(headingRef, takeFocus);
  const { company } = quote.snapshot;
  return (
    <Panel tone="quiet">
      <h2 id={HEADING_ID} ref={headingRef} tabIndex={-1} className={headingClass}>
        Your payment is being checked
      </h2>
      <p className="mt-2 text-sm text-ink-700">We received a payment that the contractor needs to check; they will be in touch.</p>
      <ContractorContact contactEmail={company.contactEmail} phone={company.phone} className="mt-2" />
    </Panel>
  );
}
