// Every client route, with a typed way to build its link.
export const paths = {
  dashboard: { path: "/", getHref: () => "/" },
  jobs: { path: "/jobs", getHref: () => "/jobs" },
  clients: { path: "/clients", getHref: () => "/clients" },
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
} as const;
