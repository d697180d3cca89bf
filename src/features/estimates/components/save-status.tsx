import { secondaryButtonClass } from "../../../components/ui/form";
import type { SaveState } from "../hooks/use-estimate-draft";

const WORDS: Record<Exclude<SaveState, "failed" | "conflict">, string> = {
  saved: "All changes saved",
  pending: "Unsaved changes",
  saving: "Saving…",
};

/** Where the estimator's changes are: saved, waiting, on their way, or not saved (with Try again). */
export function SaveStatus({ state, error, onRetry }: { state: SaveState; error: string | null; onRetry: () => void }) {
  if (state === "conflict") return null;
  if (state === "failed") {
    return (
      <div role="alert" className="flex flex-wrap items-center gap-2 text-sm font-medium text-over-700">
        <span aria-hidden="true">✕</span>
        <span>Changes not saved. {error}</span>
        <button type="button" onClick={onRetry} className={secondaryButtonClass}>
          Try again
        </button>
      </div>
    );
  }
  return (
    <p role="status" aria-label={WORDS[state]} className="flex items-center gap-1.5 text-sm text-ink-500">
      {state === "saved" ? (
        <span aria-hidden="true" className="text-within-700">
          ✓
        </span>
      ) : (
        <span aria-hidden="true" className={state === "saving" ? "animate-pulse text-copper-600" : "text-copper-600"}>
          ●
        </span>
      )}
      {WORDS[state]}
    </p>
  );
}
