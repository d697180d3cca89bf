import type { ReactNode } from "react";

/** The one h1 of a page in the auth layout, with an optional line under it. */
export function AuthTitle({ children, lead }: { children: ReactNode; lead?: ReactNode }) {
  return (
    <div className="mb-6">
      <h1 className="text-xl font-semibold tracking-tight text-ink-900">{children}</h1>
      {lead ? <p className="mt-1 text-sm text-ink-500">{lead}</p> : null}
    </div>
  );
}
