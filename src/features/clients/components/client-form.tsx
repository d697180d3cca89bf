import { zodResolver } from "@hookform/resolvers/zod";
import { useState } from "react";
import { useForm } from "react-hook-form";
import type { z } from "zod";
import { CreateClientInput, JobLimits, type Client } from "../../../../shared/schemas/jobs";
import { controlClass, Field, FormAlert, secondaryButtonClass, SubmitButton, TextField } from "../../../components/ui/form";
import { applyServerError } from "../../../lib/form-errors";
import { useCreateClient } from "../api/create-client";
import { useUpdateClient } from "../api/update-client";

type ClientFormValues = z.input<typeof CreateClientInput>;
type ClientFormOutput = z.output<typeof CreateClientInput>;

const FIELDS = ["name", "email", "phone", "billingAddress", "notes"] as const;

const toValues = (client?: Client): ClientFormValues => ({
  name: client?.name ?? "",
  email: client?.email ?? "",
  phone: client?.phone ?? "",
  billingAddress: client?.billingAddress ?? "",
  notes: client?.notes ?? "",
});

interface ClientFormProps {
  /** The client to edit; a new one without. */
  client?: Client;
  onSaved: (client: Client) => void;
  onCancel: () => void;
}

/** Name, e-mail, phone, billing address and notes of a client; creates or saves. */
export function ClientForm({ client, onSaved, onCancel }: ClientFormProps) {
  const [alert, setAlert] = useState<string | null>(null);
  const create = useCreateClient();
  const update = useUpdateClient();
  const pending = create.isPending || update.isPending;
  const {
    register,
    handleSubmit,
    setError,
    formState: { errors },
  } = useForm<ClientFormValues, unknown, ClientFormOutput>({ resolver: zodResolver(CreateClientInput), defaultValues: toValues(client) });

  const onSubmit = handleSubmit((values) => {
    setAlert(null);
    const onError = (error: Error) => setAlert(applyServerError(error, setError, FIELDS));
    if (client) update.mutate({ clientId: client.id, patch: values }, { onSuccess: onSaved, onError });
    else create.mutate(values, { onSuccess: onSaved, onError });
  });

  return (
    <form noValidate onSubmit={onSubmit} className="space-y-4">
      <FormAlert message={alert} />
      <div className="grid gap-4 sm:grid-cols-2">
        <TextField label="Name" autoComplete="off" maxLength={JobLimits.clientNameMax} className="sm:col-span-2" error={errors.name?.message} {...register("name")} />
        <TextField label="E-mail" type="email" inputMode="email" autoComplete="off" hint="Quotes are sent here." error={errors.email?.message} {...register("email")} />
        <TextField label="Phone" type="tel" autoComplete="off" maxLength={JobLimits.phoneMax} error={errors.phone?.message} {...register("phone")} />
        <Field label="Billing address" error={errors.billingAddress?.message} className="sm:col-span-2">
          {(control) => <textarea rows={3} maxLength={JobLimits.addressMax} {...register("billingAddress")} {...control} className={controlClass} />}
        </Field>
        <Field label="Notes" error={errors.notes?.message} className="sm:col-span-2">
          {(control) => <textarea rows={3} maxLength={JobLimits.notesMax} {...register("notes")} {...control} className={controlClass} />}
        </Field>
      </div>
      <div className="flex flex-wrap justify-end gap-2">
        <button type="button" onClick={onCancel} disabled={pending} className={secondaryButtonClass}>
          Cancel
        </button>
        <SubmitButton pending={pending}>{client ? "Save client" : "Create client"}</SubmitButton>
      </div>
    </form>
  );
}
