import type { ReactNode } from "react";

interface EmptyStateProps {
  title: string;
  children: ReactNode;
  /** Optional next step (a link or button). */
  action?: ReactNode;
  icon?: ReactNode;
}

/** What a page shows before it has anything: what belongs here and how it gets here. */
export function EmptyState({ title, children, action, icon }: EmptyStateProps) {
  return (
    <section className="mx-auto mt-10 max-w-xl rounded-xl border border-dashed border-ink-200 bg-white px-8 py-10 text-center">
      {icon ? (
        <div aria-hidden="true" className="mx-auto mb-4 flex h-12 w-12 items-center justify-center rounded-full bg-copper-50 text-copper-600">
          {icon}
        </div>
      ) : null}
      <h2 className="text-base font-semibold text-ink-900">{title}</h2>
      <div className="mt-2 text-sm leading-6 text-ink-600">{children}</div>
      {action ? <div className="mt-5">{action}</div> : null}
    </section>
  );
}
