import { useCallback, useEffect, useRef, useState } from "react";
import type { Estimate } from "../../../../shared/schemas/estimates";
import { ApiError } from "../../../lib/api-client";
import { useSaveEstimate } from "../api/save-estimate";
import { adoptServerIds, draftFromEstimate, toSaveInput, type EstimateDraft } from "../lib/draft";

/**
 * saved: the working copy is what the server has; pending: edits wait for a pause before they are
 * sent; saving: a PUT is on its way; failed: the last PUT failed (edits kept, "Try again");
 * conflict: someone else saved in between (409): nothing more is sent until the estimate is reloaded.
 */
export type SaveState = "saved" | "pending" | "saving" | "failed" | "conflict";

/** Edits made within this long of each other go in one save. */
export const SAVE_DELAY_MS = 400;

interface Book {
  draft: EstimateDraft;
  /** The version the next PUT is based on. */
  version: number;
  /** Edits made, and how many of them the server has. */
  edits: number;
  saved: number;
  inFlight: boolean;
  conflict: boolean;
  timer: ReturnType<typeof setTimeout> | undefined;
}

/**
 * The estimator's working copy and its saving: every edit changes the copy at once and is saved
 * with the version it started from after a short pause; one PUT at a time, edits made meanwhile
 * follow in the next one.
 */
export function useEstimateDraft(jobId: string, estimate: Estimate, delayMs = SAVE_DELAY_MS) {
  const save = useSaveEstimate();
  const [draft, setDraft] = useState(() => draftFromEstimate(estimate));
  const [state, setState] = useState<SaveState>("saved");
  const [error, setError] = useState<string | null>(null);
  const book = useRef<Book>({ draft, version: estimate.version, edits: 0, saved: 0, inFlight: false, conflict: false, timer: undefined });
  const mutate = useRef(save.mutateAsync);
  const flushRef = useRef<() => Promise<void>>(async () => {});

  useEffect(() => {
    mutate.current = save.mutateAsync;
  });

  const flush = useCallback(async () => {
    const b = book.current;
    clearTimeout(b.timer);
    b.timer = undefined;
    if (b.inFlight || b.conflict || b.saved === b.edits) return;
    const sentEdits = b.edits;
    const sent = b.draft;
    b.inFlight = true;
    setState("saving");
    setError(null);
    try {
      const saved = await mutate.current({ jobId, body: toSaveInput(sent, b.version) });
      b.inFlight = false;
      b.version = saved.version;
      b.saved = sentEdits;
      if (b.edits === sentEdits) {
        b.draft = draftFromEstimate(saved);
        setDraft(b.draft);
        setState("saved");
      } else {
        b.draft = adoptServerIds(b.draft, sent, saved);
        setDraft(b.draft);
        setState("pending");
        void flushRef.current();
      }
    } catch (err) {
      b.inFlight = false;
      if (err instanceof ApiError && err.status === 409) {
        b.conflict = true;
        setState("conflict");
      } else {
        setState("failed");
        setError(err instanceof Error ? err.message : "The changes could not be saved.");
      }
    }
  }, [jobId]);

  useEffect(() => {
    flushRef.current = flush;
  }, [flush]);

  /** Changes the working copy now and saves it after a pause. */
  const edit = useCallback(
    (change: (draft: EstimateDraft) => EstimateDraft) => {
      const b = book.current;
      if (b.conflict) return;
      const next = change(b.draft);
      if (next === b.draft) return;
      b.draft = next;
      b.edits += 1;
      setDraft(b.draft);
      if (!b.inFlight) setState("pending");
      clearTimeout(b.timer);
      b.timer = setTimeout(() => void flushRef.current(), delayMs);
    },
    [delayMs],
  );

  /** Drops the working copy for the server's estimate (after a rebuild or a reload). */
  const reset = useCallback((next: Estimate) => {
    const b = book.current;
    clearTimeout(b.timer);
    Object.assign(b, { draft: draftFromEstimate(next), version: next.version, edits: 0, saved: 0, inFlight: false, conflict: false, timer: undefined });
    setDraft(b.draft);
    setState("saved");
    setError(null);
  }, []);

  // A newer estimate from the server (a rebuild, a refetch) replaces a working copy that has nothing unsaved.
  useEffect(() => {
    const b = book.current;
    if (!b.inFlight && !b.conflict && b.edits === b.saved && estimate.version !== b.version) reset(estimate);
  }, [estimate, reset]);

  // Leaving the screen during the pause still saves; leaving the page warns while anything is unsaved.
  useEffect(() => {
    const b = book.current;
    return () => {
      if (b.timer !== undefined) void flushRef.current();
    };
  }, []);
  const unsaved = state === "pending" || state === "saving" || state === "failed";
  useEffect(() => {
    if (!unsaved) return;
    const warn = (event: BeforeUnloadEvent) => event.preventDefault();
    window.addEventListener("beforeunload", warn);
    return () => window.removeEventListener("beforeunload", warn);
  }, [unsaved]);

  return { draft, state, error, edit, reset, retry: flush };
}
