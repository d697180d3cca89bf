import { useState } from "react";
import { secondaryButtonClass } from "../../../components/ui/form";

/**
 * Results tables show their first rows (loads worst first) and the rest on request: with 500 loads
 * a full table made every keystroke in the entry tables repaint it. bench:editor on this 2-core
 * machine: a key took p50 ≈ 135 ms with all 500 rows, ≈ 48 ms with 50 rows (and the deferred
 * rendering in system-editor.tsx).
 */
export const RESULT_ROWS_SHOWN = 50;

/** The rows to draw: the first RESULT_ROWS_SHOWN, plus the selected one wherever it is, or all of them. */
export function useRowCap<T extends { id: string }>(rows: readonly T[], selectedId: string | null) {
  const [all, setAll] = useState(false);
  const capped = !all && rows.length > RESULT_ROWS_SHOWN;
  let shown: readonly T[] = rows;
  if (capped) {
    shown = rows.slice(0, RESULT_ROWS_SHOWN);
    const selected = selectedId === null ? undefined : rows.find((r) => r.id === selectedId);
    if (selected && !shown.includes(selected)) shown = [...shown, selected];
  }
  return { shown, capped, total: rows.length, showAll: () => setAll(true), showFewer: () => setAll(false), all };
}

/** "Showing 50 of 500 loads — Show all" under a capped table. */
export function RowCapNote({ cap, noun }: { cap: ReturnType<typeof useRowCap>; noun: string }) {
  if (cap.total <= RESULT_ROWS_SHOWN) return null;
  return (
    <p className="flex flex-wrap items-center gap-2 px-2 py-2 text-sm text-ink-600">
      {cap.capped ? `Showing the first ${RESULT_ROWS_SHOWN} of ${cap.total} ${noun}.` : `Showing all ${cap.total} ${noun}.`}
      <button type="button" onClick={cap.capped ? cap.showAll : cap.showFewer} className={secondaryButtonClass}>
        {cap.capped ? `Show all ${cap.total} ${noun}` : `Show the first ${RESULT_ROWS_SHOWN}`}
      </button>
    </p>
  );
}
