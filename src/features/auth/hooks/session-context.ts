import { createContext, useContext } from "react";
import type { Session } from "../../../../shared/schemas/auth";

export type SignedInSession = Extract<Session, { signedIn: true }>;

/** Filled by RequireSession with the signed-in session; everything under it may read it. */
export const SessionContext = createContext<SignedInSession | null>(null);

/** The signed-in session; only for components rendered under RequireSession. */
export function useSignedInSession(): SignedInSession {
  const session = useContext(SessionContext);
  if (!session) throw new Error("useSignedInSession is used outside RequireSession");
  return session;
}
