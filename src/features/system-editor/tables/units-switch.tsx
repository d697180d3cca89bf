import { useId, type JSX } from "react";
import { cn } from "../../../utils/cn";

type Units = "metric" | "imperial";

const OPTIONS: ReadonlyArray<{ value: Units; label: string }> = [
  { value: "metric", label: "Metric (m, mm²)" },
  { value: "imperial", label: "Imperial (ft, AWG)" },
];

/** The system's units as a two-option segmented control (native radios: arrow keys move between them). */
export function UnitsSwitch({ value, onChange, disabled = false }: { value: Units; onChange(units: Units): void; disabled?: boolean }): JSX.Element {
  const name = useId();
  return (
    <div role="radiogroup" aria-label="Units" aria-disabled={disabled || undefined} className="inline-flex rounded-md border border-ink-200 bg-white p-0.5 text-xs">
      {OPTIONS.map((option) => {
        const checked = option.value === value;
        return (
          <label
            key={option.value}
            className={cn(
              "relative cursor-pointer rounded px-2.5 py-1 font-medium select-none has-[:focus-visible]:outline-2 has-[:focus-visible]:outline-copper-500",
              checked ? "bg-ink-900 text-white" : "text-ink-700 hover:bg-ink-50",
              disabled && "cursor-not-allowed opacity-60",
            )}
          >
            <input
              type="radio"
              name={name}
              value={option.value}
              checked={checked}
              disabled={disabled}
              onChange={() => onChange(option.value)}
              className="sr-only"
            />
            {option.label}
          </label>
        );
      })}
    </div>
  );
}
