import { memo, useId } from "react";
import type { SystemInput } from "../../../../shared/engine/schema";
import type { Finding } from "../../../../shared/engine/system";
import { secondaryButtonClass } from "../../../components/ui/form";
import type { Selection } from "../selection";
import { selectionForProblem } from "../lib/results";
import { SeverityIcon } from "./status";

const ORDER = { error: 0, warning: 1, info: 2 } as const;

/** Every finding, errors first, each with a button that selects what it is about. */
export const ResultsFindings = memo(function ResultsFindings({ doc, findings, onSelect }: { doc: SystemInput; findings: readonly Finding[]; onSelect(selection: Selection): void }) {
  const base = useId();
  if (findings.length === 0) return <p className="text-sm text-within-700">No findings: every check passed.</p>;
  const sorted = [...findings].sort((a, b) => ORDER[a.severity] - ORDER[b.severity]);
  return (
    <ul className="divide-y divide-ink-100 rounded-md border border-ink-100">
      {sorted.map((f, i) => {
        const target = selectionForProblem(doc, f);
        const messageId = `${base}-finding-${i}`;
        return (
          <li key={`${f.code}-${i}`} data-finding-code={f.code} className="flex items-start gap-2 px-3 py-2 text-sm">
            <span className="mt-0.5">
              <SeverityIcon severity={f.severity} />
            </span>
            <span id={messageId} className={f.severity === "error" ? "flex-1 font-medium text-over-700" : "flex-1 text-ink-800"}>
              {f.message}
            </span>
            {target ? (
              <button type="button" aria-describedby={messageId} onClick={() => onSelect(target)} className={`${secondaryButtonClass} py-0.5`}>
                Show
              </button>
            ) : null}
          </li>
        );
      })}
    </ul>
  );
});
