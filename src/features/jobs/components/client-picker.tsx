import { zodResolver } from "@hookform/resolvers/zod";
import { useId, useState } from "react";
import { useForm } from "react-hook-form";
import { Link } from "react-router-dom";
import type { z } from "zod";
import { CreateClientInput, JobLimits, type Client } from "../../../../shared/schemas/jobs";
import { controlClass, Field, FormAlert, secondaryButtonClass, TextField } from "../../../components/ui/form";
import { paths } from "../../../config/paths";
import { applyServerError } from "../../../lib/form-errors";
import { useCreateClient } from "../../clients/api/create-client";
import { CLIENT_CHOICES, useClients } from "../../clients/api/get-clients";

type QuickClientValues = z.input<typeof CreateClientInput>;

/** A new client from inside the job form: name and e-mail (the rest can be filled in on Clients). Not a <form>: it sits inside one. */
function QuickClient({ onCreated, onCancel }: { onCreated: (client: Client) => void; onCancel: () => void }) {
  const create = useCreateClient();
  const [alert, setAlert] = useState<string | null>(null);
  const headingId = useId();
  const {
    register,
    handleSubmit,
    setError,
    formState: { errors },
  } = useForm<QuickClientValues, unknown, z.output<typeof CreateClientInput>>({ resolver: zodResolver(CreateClientInput), defaultValues: { name: "", email: "" } });

  const submit = handleSubmit((values) => {
    setAlert(null);
    create.mutate(values, { onSuccess: onCreated, onError: (error) => setAlert(applyServerError(error, setError, ["name", "email"])) });
  });

  return (
    <div role="group" aria-labelledby={headingId} className="space-y-3 rounded-md border border-copper-200 bg-copper-50/50 p-3">
      <p id={headingId} className="text-sm font-semibold text-ink-900">
        New client
      </p>
      <FormAlert message={alert} />
      <div className="grid gap-3 sm:grid-cols-2">
        <TextField
          label="Client name"
          autoComplete="off"
          maxLength={JobLimits.clientNameMax}
          error={errors.name?.message}
          {...register("name")}
          onKeyDown={(event) => {
            // Enter adds the client rather than submitting the job form around it.
            if (event.key === "Enter") {
              event.preventDefault();
              void submit();
            }
          }}
        />
        <TextField
          label="Client e-mail"
          type="email"
          inputMode="email"
          autoComplete="off"
          error={errors.email?.message}
          {...register("email")}
          onKeyDown={(event) => {
            if (event.key === "Enter") {
              event.preventDefault();
              void submit();
            }
          }}
        />
      </div>
      <div className="flex gap-2">
        <button type="button" disabled={create.isPending} onClick={() => void submit()} className={secondaryButtonClass}>
          {create.isPending ? "Add client…" : "Add client"}
        </button>
        <button type="button" disabled={create.isPending} onClick={onCancel} className={secondaryButtonClass}>
          Cancel
        </button>
      </div>
    </div>
  );
}

interface ClientPickerProps {
  value: string;
  onChange: (clientId: string) => void;
  onBlur?: () => void;
  error?: string;
  /** The job's current client, shown even when it is not in the first 100 by name. */
  current?: { id: string; name: string };
}

/** "Client": a select of the company's clients (first 100 by name) with a way to add one on the spot. */
export function ClientPicker({ value, onChange, onBlur, error, current }: ClientPickerProps) {
  const { data, error: loadError, isPending } = useClients(CLIENT_CHOICES);
  const [added, setAdded] = useState<Array<{ id: string; name: string }>>([]);
  const [adding, setAdding] = useState(false);
  const noClients = data !== undefined && data.total === 0 && added.length === 0;

  const byId = new Map<string, { id: string; name: string }>();
  for (const c of [...(current ? [current] : []), ...(data?.items ?? []), ...added]) byId.set(c.id, { id: c.id, name: c.name });
  const choices = [...byId.values()].sort((a, b) => a.name.localeCompare(b.name));

  return (
    <div className="space-y-2">
      <Field
        label="Client"
        error={error}
        hint={
          loadError
            ? `The clients could not be loaded: ${loadError.message}`
            : data && data.total > data.items.length
              ? `The first ${data.items.length} clients by name are listed.`
              : undefined
        }
      >
        {(control) => (
          <select
            {...control}
            value={value}
            disabled={isPending}
            onChange={(event) => onChange(event.target.value)}
            onBlur={onBlur}
            className={controlClass}
          >
            <option value="">{isPending ? "Loading clients…" : noClients ? "No clients yet — add one below" : "Choose a client"}</option>
            {choices.map((c) => (
              <option key={c.id} value={c.id}>
                {c.name}
              </option>
            ))}
          </select>
        )}
      </Field>
      {adding || noClients ? (
        <QuickClient
          onCreated={(client) => {
            setAdded((list) => [...list, client]);
            setAdding(false);
            onChange(client.id);
          }}
          onCancel={() => setAdding(false)}
        />
      ) : (
        <p className="text-xs text-ink-500">
          <button type="button" onClick={() => setAdding(true)} className="font-medium text-copper-700 underline underline-offset-2">
            Add a new client
          </button>{" "}
          or manage them on <Link to={paths.clients.getHref()} className="underline underline-offset-2">Clients</Link>.
        </p>
      )}
    </div>
  );
}
