import type { ReactNode } from "react";

/** The frame of the client's page: no app navigation, a white sheet that prints edge to edge. */
export function QuoteLinkShell({ children, narrow = false }: { children: ReactNode; narrow?: boolean }) {
  return (
    <div className="min-h-screen bg-ink-50 px-3 py-6 sm:px-6 sm:py-10 print:bg-white print:p-0">
      <main
        id="main"
        className={`mx-auto w-full rounded-xl border border-ink-100 bg-white p-5 shadow-sm sm:p-8 print:max-w-none print:rounded-none print:border-0 print:p-0 print:shadow-none ${narrow ? "max-w-lg" : "max-w-4xl"}`}
      >
        {children}
      </main>
    </div>
  );
}
