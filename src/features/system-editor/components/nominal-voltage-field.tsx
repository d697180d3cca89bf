import { useId, useState } from "react";
import { inlineControlClass } from "./control";

const MIN_V = 1;
const MAX_V = 2000;

/** The nominal voltage (V): kept as typed, handed on when it is a voltage and the field is left (or Enter). */
export function NominalVoltageField({ value, onChange, disabled }: { value: number; onChange(volts: number): void; disabled?: boolean }) {
  const id = useId();
  const [text, setText] = useState(String(value));
  const [error, setError] = useState<string | null>(null);
  // A new value from outside (a reload, another edit) replaces the text in the same render, never a frame later.
  const [shown, setShown] = useState(value);
  if (!Object.is(shown, value)) {
    setShown(value);
    setText(String(value));
    setError(null);
  }

  const commit = () => {
    const volts = Number(text.trim().replace(",", "."));
    if (text.trim() === "" || !Number.isFinite(volts) || volts < MIN_V || volts > MAX_V) {
      setError(`Enter a voltage from ${MIN_V} to ${MAX_V} V`);
      return;
    }
    setError(null);
    if (volts !== value) onChange(volts);
  };

  return (
    <div className="space-y-1">
      <label htmlFor={id} className="block text-xs font-medium text-ink-600">
        Nominal voltage (V)
      </label>
      <input
        id={id}
        type="text"
        inputMode="decimal"
        value={text}
        disabled={disabled}
        aria-invalid={Boolean(error)}
        aria-describedby={error ? `${id}-error` : undefined}
        onChange={(event) => setText(event.target.value)}
        onBlur={commit}
        onKeyDown={(event) => {
          if (event.key === "Enter") commit();
        }}
        className={`${inlineControlClass} w-24 py-1.5 tabular-nums`}
      />
      {error ? (
        <p id={`${id}-error`} className="text-xs font-medium text-over-700">
          {error}
        </p>
      ) : null}
    </div>
  );
}
