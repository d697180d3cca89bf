// Every client route, with a typed way to build its link.
export const paths = {
  dashboard: { path: "/", getHref: () => "/" },
  jobs: { path: "/jobs", getHref: () => "/jobs" },
  clients: { path: "/clients", getHref: () => "/clients" },
  priceList: { path: "/price-list", getHref: () => "/price-list" },
  settings: { path: "/settings", getHref: () => "/settings" },
} as const;
