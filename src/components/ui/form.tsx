import { useId, type ComponentProps, type ReactNode } from "react";
import { cn } from "../../utils/cn";

/** The look of every text input and select. An invalid one gets an over-limit edge, always with its message in words. */
export const controlClass =
  "block w-full rounded-md border border-ink-200 bg-white px-3 py-2 text-sm text-ink-900 placeholder:text-ink-400 focus:border-copper-500 disabled:bg-ink-50 disabled:text-ink-500 aria-[invalid=true]:border-over-500";

/** What a Field hands to its control so the label, hint and error are tied to it. */
export interface ControlProps {
  id: string;
  "aria-invalid": boolean;
  "aria-describedby": string | undefined;
}

interface FieldProps {
  label: ReactNode;
  hint?: ReactNode;
  /** The message shown beside the control, from the form's validation or the server. */
  error?: string;
  /** Optional fixed id for the control; one is made up otherwise. */
  id?: string;
  className?: string;
  children: (control: ControlProps) => ReactNode;
}

/** A label, the control, its hint and its error message; the control gets id, aria-invalid and aria-describedby. */
export function Field({ label, hint, error, id, className, children }: FieldProps) {
  const generated = useId();
  const controlId = id ?? `field-${generated.replace(/[^a-zA-Z0-9_-]/g, "")}`;
  const hintId = hint ? `${controlId}-hint` : undefined;
  const errorId = error ? `${controlId}-error` : undefined;
  const describedBy = [errorId, hintId].filter(Boolean).join(" ") || undefined;
  return (
    <div className={cn("space-y-1", className)}>
      <label htmlFor={controlId} className="block text-sm font-medium text-ink-800">
        {label}
      </label>
      {children({ id: controlId, "aria-invalid": Boolean(error), "aria-describedby": describedBy })}
      {hint ? (
        <p id={hintId} className="text-xs text-ink-500">
          {hint}
        </p>
      ) : null}
      {error ? (
        <p id={errorId} className="flex gap-1 text-xs font-medium text-over-700">
          <span aria-hidden="true">✕</span>
          <span className="first-letter:uppercase">{error}</span>
        </p>
      ) : null}
    </div>
  );
}

type InputProps = Omit<ComponentProps<"input">, "id"> & { label: ReactNode; hint?: ReactNode; error?: string; id?: string };

export function TextField({ label, hint, error, id, className, ...input }: InputProps) {
  return (
    <Field label={label} hint={hint} error={error} id={id} className={className}>
      {(control) => <input type="text" {...input} {...control} className={controlClass} />}
    </Field>
  );
}

type SelectProps = Omit<ComponentProps<"select">, "id"> & { label: ReactNode; hint?: ReactNode; error?: string; id?: string };

export function SelectField({ label, hint, error, id, className, children, ...select }: SelectProps) {
  return (
    <Field label={label} hint={hint} error={error} id={id} className={className}>
      {(control) => (
        <select {...select} {...control} className={controlClass}>
          {children}
        </select>
      )}
    </Field>
  );
}

/** A form's error that belongs to no one field (wrong password, rate limit, server down). */
export function FormAlert({ message, className }: { message?: string | null; className?: string }) {
  if (!message) return null;
  return (
    <div role="alert" className={cn("flex gap-2 rounded-md border border-over-100 bg-over-50 px-3 py-2 text-sm text-over-700", className)}>
      <span aria-hidden="true" className="font-semibold">
        ✕
      </span>
      <span className="first-letter:uppercase">{message}</span>
    </div>
  );
}

/** A confirmation after a form has done its work ("Settings saved"). */
export function FormStatus({ message, className }: { message?: string | null; className?: string }) {
  if (!message) return null;
  return (
    <p role="status" aria-label={message} className={cn("flex gap-2 rounded-md border border-within-100 bg-within-50 px-3 py-2 text-sm text-within-700", className)}>
      <span aria-hidden="true" className="font-semibold">
        ✓
      </span>
      <span>{message}</span>
    </p>
  );
}

export const primaryButtonClass =
  "inline-flex items-center justify-center rounded-md bg-ink-900 px-4 py-2 text-sm font-medium text-white hover:bg-ink-800 disabled:cursor-not-allowed disabled:bg-ink-400";
export const secondaryButtonClass =
  "inline-flex items-center justify-center rounded-md border border-ink-200 bg-white px-3 py-1.5 text-sm font-medium text-ink-800 hover:bg-ink-50 disabled:cursor-not-allowed disabled:text-ink-400";
export const dangerButtonClass =
  "inline-flex items-center justify-center rounded-md border border-over-100 bg-white px-3 py-1.5 text-sm font-medium text-over-700 hover:bg-over-50 disabled:cursor-not-allowed disabled:text-ink-400";

/** The form's submit button: disabled, with "…" after its text, while the request is on its way. */
export function SubmitButton({ pending, children, className }: { pending: boolean; children: string; className?: string }) {
  return (
    <button type="submit" disabled={pending} className={cn(primaryButtonClass, className)}>
      {pending ? `${children}…` : children}
    </button>
  );
}
