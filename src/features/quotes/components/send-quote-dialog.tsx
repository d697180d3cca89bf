import { zodResolver } from "@hookform/resolvers/zod";
import { useState } from "react";
import { useForm } from "react-hook-form";
import { z } from "zod";
import type { QuoteDetail } from "../../../../shared/schemas/estimates";
import { Dialog } from "../../../components/ui/dialog";
import { controlClass, Field, FormAlert, secondaryButtonClass, SubmitButton, TextField } from "../../../components/ui/form";
import { applyServerError } from "../../../lib/form-errors";
import { isMailFailure, useSendQuote } from "../api/send-quote";

const SendForm = z.object({
  to: z.string().trim().min(1, "the client's e-mail address is required").max(254, "the address is too long").pipe(z.email("this is not an e-mail address")),
  message: z.string().trim().max(2000, "message must be at most 2000 characters"),
});
type SendValues = z.input<typeof SendForm>;

/** "Send to client": the address (the client's by default) and a message of your own; the mail carries the client link and the PDF. */
export function SendQuoteDialog({ quote, onSent, onClose }: { quote: QuoteDetail; onSent: () => void; onClose: () => void }) {
  const send = useSendQuote();
  const [alert, setAlert] = useState<string | null>(null);
  const {
    register,
    handleSubmit,
    setError,
    formState: { errors },
  } = useForm<SendValues, unknown, z.output<typeof SendForm>>({ resolver: zodResolver(SendForm), defaultValues: { to: quote.snapshot.client.email ?? "", message: "" } });

  const onSubmit = handleSubmit((values) => {
    setAlert(null);
    send.mutate(
      { quoteId: quote.id, input: { to: values.to, ...(values.message ? { message: values.message } : {}) } },
      {
        onSuccess: onSent,
        onError: (error) => {
          if (isMailFailure(error)) setAlert(`The e-mail could not be sent: ${error.message} The quote stays a draft; check the address and try again.`);
          else setAlert(applyServerError(error, setError, ["to", "message"]));
        },
      },
    );
  });

  return (
    <Dialog size="md" closeButton busy={send.isPending} title={`Send ${quote.label} to the client`} description={`${quote.snapshot.client.name} gets an e-mail with a link to the quote and its PDF.`} onClose={onClose}>
      <form noValidate onSubmit={onSubmit} className="space-y-4">
        <FormAlert message={alert} />
        <TextField label="To" type="email" inputMode="email" autoComplete="off" error={errors.to?.message} {...register("to")} />
        <Field label="Message (optional)" hint="Added above the link in the e-mail." error={errors.message?.message}>
          {(c) => <textarea rows={4} maxLength={2000} {...register("message")} {...c} className={controlClass} />}
        </Field>
        <div className="flex flex-wrap justify-end gap-2">
          <button type="button" onClick={onClose} disabled={send.isPending} className={secondaryButtonClass}>
            Cancel
          </button>
          <SubmitButton pending={send.isPending}>Send quote</SubmitButton>
        </div>
      </form>
    </Dialog>
  );
}
