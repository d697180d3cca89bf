import { zodResolver } from "@hookform/resolvers/zod";
import { useState } from "react";
import { useForm } from "react-hook-form";
import { z } from "zod";
import { formatMoney, minorToPlain, parseMoney } from "../../../../shared/money";
import { REFUND_REASON_LABELS, REFUND_REASONS, RefundReason, type Payment } from "../../../../shared/schemas/payments";
import { Dialog } from "../../../components/ui/dialog";
import { FormAlert, secondaryButtonClass, SelectField, SubmitButton, TextField } from "../../../components/ui/form";
import { applyServerError } from "../../../lib/form-errors";
import { formatDay } from "../../quotes/lib/format";
import { useRefundPayment } from "../api/refund-payment";
import { leftToRefund } from "../lib/format";

/** The amount typed in major units → minor units, with the bounds the server also checks (more than zero, no more than is left). */
function refundForm(leftMinor: number, currency: string) {
  return z.object({
    amount: z.string().transform((text, ctx) => {
      const minor = parseMoney(text, currency);
      if (minor === null) {
        ctx.addIssue({ code: "custom", message: `enter the amount as a number, such as ${minorToPlain(leftMinor, currency)}` });
        return z.NEVER;
      }
      if (minor <= 0) {
        ctx.addIssue({ code: "custom", message: "the amount must be more than zero" });
        return z.NEVER;
      }
      if (minor > leftMinor) {
        ctx.addIssue({ code: "custom", message: `at most ${formatMoney(leftMinor, currency)} is left to refund` });
        return z.NEVER;
      }
      return minor;
    }),
    reason: RefundReason,
  });
}
type Reason = z.infer<typeof RefundReason>;
type RefundValues = { amount: string; reason: Reason };
type RefundOutput = { amount: number; reason: Reason };

/**
 * "Refund": how much (what is left, to start with) and why. The money goes back through Stripe to
 * what the client paid with; the server checks the amount again and answers Stripe's refusal in words.
 */
export function RefundDialog({ payment, onRefunded, onClose }: { payment: Payment; onRefunded: (amountMinor: number) => void; onClose: () => void }) {
  const { currency } = payment;
  const left = leftToRefund(payment);
  const money = (minor: number) => formatMoney(minor, currency);
  const refund = useRefundPayment();
  const [alert, setAlert] = useState<string | null>(null);
  // One id per opened dialog: a double press or a retried request refunds once (the server's idempotency key).
  const [requestId] = useState(() => crypto.randomUUID());
  const {
    register,
    handleSubmit,
    setError,
    watch,
    formState: { errors },
  } = useForm<RefundValues, unknown, RefundOutput>({
    resolver: zodResolver(refundForm(left, currency)),
    defaultValues: { amount: minorToPlain(left, currency), reason: "requested_by_customer" },
  });

  // The question under the fields follows what is typed, once it is an amount that can be refunded.
  const typed = parseMoney(watch("amount") ?? "", currency);
  const question = typed !== null && typed > 0 && typed <= left ? `Refund ${money(typed)} to the client?` : "Enter an amount to refund.";

  const onSubmit = handleSubmit(({ amount, reason }) => {
    setAlert(null);
    refund.mutate(
      { paymentId: payment.id, body: { amountMinor: amount, reason, requestId } },
      {
        onSuccess: () => onRefunded(amount),
        onError: (error) => {
          const rest = applyServerError(error, setError, ["amount", "reason"], { amountMinor: "amount" });
          setAlert(rest ? `No refund was made. ${rest}` : null);
        },
      },
    );
  });

  return (
    <Dialog
      size="md"
      closeButton
      busy={refund.isPending}
      title={`Refund ${payment.receiptNumber}`}
      description={
        <>
          {money(payment.amountMinor)} paid on {formatDay(payment.paidAt)}
          {payment.refundedMinor > 0 ? `, ${money(payment.refundedMinor)} already refunded` : ""}. {money(left)} can be refunded.
        </>
      }
      onClose={onClose}
    >
      <form noValidate onSubmit={onSubmit} className="space-y-4">
        <FormAlert message={alert} />
        <TextField
          label="Amount to refund"
          hint={`In ${currency}, at most ${money(left)}.`}
          inputMode="decimal"
          autoComplete="off"
          error={errors.amount?.message}
          {...register("amount")}
        />
        <SelectField label="Reason" error={errors.reason?.message} {...register("reason")}>
          {REFUND_REASONS.map((reason) => (
            <option key={reason} value={reason}>
              {REFUND_REASON_LABELS[reason]}
            </option>
          ))}
        </SelectField>
        <p aria-live="polite" className="font-medium text-ink-900">
          {question}
        </p>
        <p className="text-xs text-ink-500">The money goes back to the card or account the client paid with. A refund cannot be undone.</p>
        <div className="flex flex-wrap justify-end gap-2">
          <button type="button" onClick={onClose} disabled={refund.isPending} className={secondaryButtonClass}>
            Cancel
          </button>
          <SubmitButton pending={refund.isPending}>Refund</SubmitButton>
        </div>
      </form>
    </Dialog>
  );
}
