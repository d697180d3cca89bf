import { useId } from "react";
import { inlineControlClass } from "./control";

/** "Case: <name>": which case the runs, points and the path chart show. */
export function CaseSelect({ cases, value, onChange }: { cases: readonly string[]; value: string; onChange(name: string): void }) {
  const id = useId();
  if (cases.length <= 1) return <p className="text-sm text-ink-600">Case: {cases[0] ?? "—"}</p>;
  return (
    <div className="flex items-center gap-2 text-sm">
      <label htmlFor={id} className="font-medium text-ink-800">
        Case:
      </label>
      <select id={id} value={value} onChange={(event) => onChange(event.target.value)} className={`${inlineControlClass} py-1`}>
        {cases.map((name) => (
          <option key={name} value={name}>
            {name}
          </option>
        ))}
      </select>
    </div>
  );
}
