import { useId } from "react";
import { ROLE_LABELS } from "../../../../shared/schemas/team";
import { useSignOut } from "../api/sign-out";
import { useSwitchCompany } from "../api/switch-company";
import { useSignedInSession } from "../hooks/session-context";

/** The side rail's account block: who is signed in, in which company and as what; switch company; sign out. */
export function AccountPanel() {
  const session = useSignedInSession();
  const signOut = useSignOut();
  const switchCompany = useSwitchCompany();
  const companySelectId = `company-${useId().replace(/[^a-zA-Z0-9_-]/g, "")}`;
  const error = signOut.error ?? switchCompany.error;
  const several = session.memberships.length > 1;

  return (
    <section aria-label="Account" className="space-y-2 border-t border-ink-800 px-4 py-4 text-sm">
      <p className="truncate font-medium text-white">
        {session.user.name}
      </p>
      {several ? (
        <div className="space-y-1">
          <label htmlFor={companySelectId} className="block text-xs text-ink-300">
            Company
          </label>
          <select
            id={companySelectId}
            value={session.company.id}
            disabled={switchCompany.isPending}
            onChange={(event) => switchCompany.mutate(event.target.value)}
            className="block w-full rounded-md border border-ink-700 bg-ink-800 px-2 py-1.5 text-sm text-white disabled:text-ink-400"
          >
            {session.memberships.map((m) => (
              <option key={m.company.id} value={m.company.id}>
                {m.company.name}
              </option>
            ))}
          </select>
        </div>
      ) : (
        <p className="truncate text-ink-200">{session.company.name}</p>
      )}
      <p className="text-xs text-ink-300">
        <span className="sr-only">Your role: </span>
        {ROLE_LABELS[session.role]}
      </p>
      {error ? (
        <p role="alert" className="text-xs text-over-100">
          <span aria-hidden="true">✕ </span>
          {error.message}
        </p>
      ) : null}
      <button
        type="button"
        disabled={signOut.isPending}
        onClick={() => signOut.mutate()}
        className="rounded-md border border-ink-700 px-3 py-1.5 text-sm font-medium text-ink-100 hover:bg-ink-800 hover:text-white disabled:text-ink-400"
      >
        {signOut.isPending ? "Sign out…" : "Sign out"}
      </button>
    </section>
  );
}
