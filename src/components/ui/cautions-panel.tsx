import { useId } from "react";
import { CAUTIONS } from "../../../shared/engine/cautions";
import { LoadStatusIcon } from "./load-status";

/** DESIGN.md §5: on every screen that shows results, before the first solve too. A solve's cautions join the fixed ones. */
export function CautionsPanel({ extra = [] }: { extra?: readonly string[] }) {
  const all = [...new Set([...CAUTIONS, ...extra])];
  const id = useId();
  return (
    <section aria-labelledby={id} className="rounded-lg border border-near-100 bg-near-50 px-4 py-3">
      <h2 id={id} className="flex items-center gap-2 text-sm font-semibold text-ink-900">
        <LoadStatusIcon status="near" className="text-near-700" />
        Safety cautions
      </h2>
      <ul className="mt-2 list-disc space-y-1 pl-5 text-sm text-ink-700">
        {all.map((text) => (
          <li key={text}>{text}</li>
        ))}
      </ul>
    </section>
  );
}
