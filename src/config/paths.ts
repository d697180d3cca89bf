// Every client route, with a typed way to build its link.
export const paths = {
  dashboard: { path: "/", getHref: () => "/" },
  jobs: { path: "/jobs", getHref: (query?: string) => (query ? `/jobs?${query}` : "/jobs") },
  job: { path: "/jobs/:jobId", getHref: (jobId: string) => `/jobs/${jobId}` },
  system: { path: "/jobs/:jobId/systems/:systemId", getHref: (jobId: string, systemId: string) => `/jobs/${jobId}/systems/${systemId}` },
  estimate: { path: "/jobs/:jobId/estimate", getHref: (jobId: string) => `/jobs/${jobId}/estimate` },
  quote: { path: "/jobs/:jobId/quotes/:quoteId", getHref: (jobId: string, quoteId: string) => `/jobs/${jobId}/quotes/${quoteId}` },
  clients: { path: "/clients", getHref: () => "/clients" },
  limitProfiles: { path: "/settings/limit-profiles", getHref: () => "/settings/limit-profiles" },
  priceList: { path: "/price-list", getHref: () => "/price-list" },
  team: { path: "/team", getHref: () => "/team" },
  settings: { path: "/settings", getHref: () => "/settings" },
  // Public: reachable without a session.
  signIn: { path: "/sign-in", getHref: (next?: string) => (next ? `/sign-in?next=${encodeURIComponent(next)}` : "/sign-in") },
  signUp: { path: "/sign-up", getHref: () => "/sign-up" },
  forgotPassword: { path: "/forgot-password", getHref: () => "/forgot-password" },
  /** Opened from the e-mail as /reset-password#token=… */
  resetPassword: { path: "/reset-password", getHref: () => "/reset-password" },
  /** Opened from the invitation e-mail as /join#token=… */
  join: { path: "/join", getHref: () => "/join" },
  /** The client's page of a sent quote, opened from the e-mail; no account. */
  quoteLink: { path: "/q/:token", getHref: (token: string) => `/q/${token}` },
} as const;
