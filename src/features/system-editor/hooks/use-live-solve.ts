import { useEffect, useRef, useState } from "react";
import type { SystemInput } from "../../../../shared/engine/schema";
import type { SolveFailure, SolveSuccess } from "../../../../shared/engine/system";
import { useSolveSystem } from "../../systems/api/solve-system";

/** How long the document must rest before it is solved (ms). */
export const SOLVE_DEBOUNCE_MS = 300;

export interface LiveSolve {
  /** The last answer that solved (kept while the layout does not solve). */
  lastGood: SolveSuccess | null;
  /** The latest answer when it could not be solved; null when the latest solved. */
  failure: SolveFailure | null;
  /** The request failed (network, server): the message. */
  requestError: string | null;
  /** The shown answer is not for the document as it is now (a solve is waiting or running). */
  stale: boolean;
  /** The document the latest answer belongs to. */
  answeredDoc: SystemInput | null;
  /** The document lastGood was solved from (names and rows of the results come from it). */
  lastGoodDoc: SystemInput | null;
  retry(): void;
}

/**
 * Solves the document on the server after every change: the first time at once, then once the
 * document has rested SOLVE_DEBOUNCE_MS. Only the latest request's answer is shown; an earlier one
 * arriving late is dropped (and its request aborted). Editing never waits for this.
 */
export function useLiveSolve(systemId: string, doc: SystemInput): LiveSolve {
  const solve = useSolveSystem();
  const { mutateAsync } = solve;
  const latest = useRef(0);
  const inFlight = useRef<AbortController | null>(null);
  const sentOnce = useRef(false);
  const [attempt, setAttempt] = useState(0);
  const [state, setState] = useState<Omit<LiveSolve, "stale" | "retry">>({ lastGood: null, lastGoodDoc: null, failure: null, requestError: null, answeredDoc: null });

  useEffect(() => {
    // The first solve goes at once (set when sent, so a StrictMode re-run of the effect does not delay it).
    const wait = sentOnce.current ? SOLVE_DEBOUNCE_MS : 0;
    const timer = setTimeout(() => {
      sentOnce.current = true;
      inFlight.current?.abort();
      const controller = new AbortController();
      inFlight.current = controller;
      const mine = ++latest.current;
      mutateAsync({ systemId, document: doc, signal: controller.signal }).then(
        (answer) => {
          if (mine !== latest.current) return;
          setState((s) => (answer.ok ? { lastGood: answer, lastGoodDoc: doc, failure: null, requestError: null, answeredDoc: doc } : { ...s, failure: answer, requestError: null, answeredDoc: doc }));
        },
        (error: unknown) => {
          if (mine !== latest.current || controller.signal.aborted) return;
          setState((s) => ({ ...s, requestError: error instanceof Error ? error.message : "The layout could not be solved.", answeredDoc: doc }));
        },
      );
    }, wait);
    return () => clearTimeout(timer);
  }, [systemId, doc, mutateAsync, attempt]);

  useEffect(() => () => inFlight.current?.abort(), []);

  return {
    ...state,
    stale: state.answeredDoc !== doc,
    retry: () => {
      setState((s) => ({ ...s, requestError: null, answeredDoc: null }));
      setAttempt((n) => n + 1);
    },
  };
}
