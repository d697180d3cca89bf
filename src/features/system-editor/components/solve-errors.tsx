import type { SystemInput } from "../../../../shared/engine/schema";
import type { EngineError } from "../../../../shared/engine/system";
import type { Selection } from "../selection";
import { selectionForProblem } from "../lib/results";
import { SeverityIcon } from "./status";

/** Why the layout cannot be solved: each error in words; clicking one selects what it names. */
export function SolveErrors({ doc, errors, onSelect }: { doc: SystemInput; errors: readonly EngineError[]; onSelect(selection: Selection): void }) {
  return (
    <div role="alert" className="rounded-md border border-over-100 bg-over-50 px-3 py-2">
      <p className="text-sm font-semibold text-over-700">
        The layout cannot be solved ({errors.length} {errors.length === 1 ? "problem" : "problems"})
      </p>
      <ul className="mt-1 space-y-1">
        {errors.map((e, i) => {
          const target = selectionForProblem(doc, e);
          return (
            <li key={`${e.code}-${e.path ?? ""}-${i}`} className="flex items-start gap-2 text-sm text-over-700">
              <span className="mt-0.5">
                <SeverityIcon severity="error" />
              </span>
              {target ? (
                <button type="button" onClick={() => onSelect(target)} className="text-left underline decoration-over-300 underline-offset-2 hover:decoration-over-700">
                  {e.message}
                </button>
              ) : (
                <span>{e.message}</span>
              )}
            </li>
          );
        })}
      </ul>
    </div>
  );
}
