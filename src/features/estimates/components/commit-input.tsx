import { useId, useState, type ComponentProps } from "react";
import { cn } from "../../../utils/cn";
import type { Parsed } from "../lib/format";

type CommitInputProps = Omit<ComponentProps<"input">, "value" | "defaultValue" | "onChange" | "onBlur" | "onKeyDown"> & {
  /** The committed value as text. */
  value: string;
  /** Typed text → the value, or the reason it is not one. */
  parse: (text: string) => Parsed<number | null>;
  onCommit: (value: number | null) => void;
  /** Where the message goes when the text is not a value: under the box (forms) or in a tooltip-sized line (table cells). */
  errorClassName?: string;
};

/**
 * A text box that commits on Enter or when it loses focus (Escape puts the committed value back).
 * Text that is not a value stays in the box, marked invalid with the reason in words, and is not committed.
 */
export function CommitInput({ value, parse, onCommit, className, errorClassName, "aria-describedby": describedBy, ...input }: CommitInputProps) {
  const [text, setText] = useState(value);
  const [editing, setEditing] = useState(false);
  const [error, setError] = useState<string | null>(null);
  const [shown, setShown] = useState(value);
  const errorId = useId();
  // A new committed value (saved, reset, rebuilt) replaces the text unless the box is being typed in.
  if (!editing && value !== shown) {
    setShown(value);
    setText(value);
    setError(null);
  }

  const commit = () => {
    setEditing(false);
    if (text.trim() === value) {
      setError(null);
      return;
    }
    const parsed = parse(text);
    if (!parsed.ok) {
      setError(parsed.error);
      return;
    }
    setError(null);
    onCommit(parsed.value);
  };

  return (
    <span className="block">
      <input
        type="text"
        inputMode="decimal"
        autoComplete="off"
        {...input}
        value={text}
        aria-invalid={error ? true : undefined}
        aria-describedby={[error ? errorId : null, describedBy].filter(Boolean).join(" ") || undefined}
        onFocus={() => setEditing(true)}
        onChange={(event) => {
          setEditing(true);
          setText(event.target.value);
        }}
        onBlur={commit}
        onKeyDown={(event) => {
          if (event.key === "Enter") {
            event.preventDefault();
            commit();
          } else if (event.key === "Escape") {
            setText(value);
            setError(null);
          }
        }}
        className={cn(
          "rounded border border-ink-200 bg-white px-2 py-1 text-sm tabular-nums text-ink-900 focus:border-copper-500 aria-[invalid=true]:border-over-500",
          className,
        )}
      />
      {error ? (
        <span id={errorId} className={cn("mt-0.5 flex gap-1 text-left text-xs font-medium text-over-700", errorClassName)}>
          <span aria-hidden="true">✕</span>
          <span className="first-letter:uppercase">{error}</span>
        </span>
      ) : null}
    </span>
  );
}
