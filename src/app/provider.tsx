import { QueryClientProvider, type QueryClient } from "@tanstack/react-query";
import { Component, Suspense, useState, type ReactNode } from "react";
import { createQueryClient } from "../lib/query-client";

class ErrorBoundary extends Component<{ children: ReactNode }, { failed: boolean }> {
  state = { failed: false };
  static getDerivedStateFromError() {
    return { failed: true };
  }
  render() {
    if (!this.state.failed) return this.props.children;
    return (
      <div role="alert" className="mx-auto mt-24 max-w-md rounded-lg border border-over-100 bg-white p-6 text-center">
        <h1 className="text-lg font-semibold text-ink-900">Something went wrong</h1>
        <p className="mt-2 text-sm text-ink-600">The page hit an unexpected error. Reload to try again; your saved work is on the server.</p>
        <button type="button" className="mt-4 rounded-md bg-ink-900 px-4 py-2 text-sm font-medium text-white" onClick={() => location.reload()}>
          Reload
        </button>
      </div>
    );
  }
}

export function AppProvider({ children, queryClient }: { children: ReactNode; queryClient?: QueryClient }) {
  const [client] = useState(() => queryClient ?? createQueryClient());
  return (
    <ErrorBoundary>
      <QueryClientProvider client={client}>
        <Suspense fallback={<p className="p-8 text-sm text-ink-500">Loading…</p>}>{children}</Suspense>
      </QueryClientProvider>
    </ErrorBoundary>
  );
}
