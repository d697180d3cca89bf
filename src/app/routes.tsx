import type { RouteObject } from "react-router-dom";
import { AppFrame } from "../components/layouts/app-frame";
import { AuthLayout } from "../components/layouts/auth-layout";
import { paths } from "../config/paths";
import { RedirectIfSignedIn } from "../features/auth/components/redirect-if-signed-in";
import { RequireSession } from "../features/auth/components/require-session";

// Screens load on first visit; each module's default export is the screen.
const lazyScreen = (load: () => Promise<{ default: React.ComponentType }>) => async () => ({ Component: (await load()).default });

// Shown while the first screen's code loads.
const firstLoad = <p className="p-8 text-sm text-ink-500">Loading…</p>;

export const routes: RouteObject[] = [
  {
    // Everything in the app frame needs a signed-in user, the 404 page included.
    element: <RequireSession />,
    hydrateFallbackElement: firstLoad,
    children: [
      {
        element: <AppFrame />,
        children: [
          { path: paths.dashboard.path, lazy: lazyScreen(() => import("./routes/dashboard")) },
          { path: paths.jobs.path, lazy: lazyScreen(() => import("./routes/jobs")) },
          { path: paths.job.path, lazy: lazyScreen(() => import("./routes/job")) },
          { path: paths.system.path, lazy: lazyScreen(() => import("./routes/system")) },
          { path: paths.estimate.path, lazy: lazyScreen(() => import("./routes/estimate")) },
          { path: paths.quote.path, lazy: lazyScreen(() => import("./routes/quote")) },
          { path: paths.clients.path, lazy: lazyScreen(() => import("./routes/clients")) },
          { path: paths.priceList.path, lazy: lazyScreen(() => import("./routes/price-list")) },
          { path: paths.team.path, lazy: lazyScreen(() => import("./routes/team")) },
          { path: paths.settings.path, lazy: lazyScreen(() => import("./routes/settings")) },
          { path: paths.limitProfiles.path, lazy: lazyScreen(() => import("./routes/limit-profiles")) },
          { path: "*", lazy: lazyScreen(() => import("./routes/not-found")) },
        ],
      },
    ],
  },
  {
    // The client's quote page: no session, the company's branding, no app frame.
    path: paths.quoteLink.path,
    hydrateFallbackElement: firstLoad,
    lazy: lazyScreen(() => import("./routes/quote-link")),
  },
  {
    // Public pages: no session needed.
    element: <AuthLayout />,
    hydrateFallbackElement: firstLoad,
    children: [
      {
        element: <RedirectIfSignedIn />,
        children: [
          { path: paths.signIn.path, lazy: lazyScreen(() => import("./routes/sign-in")) },
          { path: paths.signUp.path, lazy: lazyScreen(() => import("./routes/sign-up")) },
        ],
      },
      { path: paths.forgotPassword.path, lazy: lazyScreen(() => import("./routes/forgot-password")) },
      { path: paths.resetPassword.path, lazy: lazyScreen(() => import("./routes/reset-password")) },
      { path: paths.join.path, lazy: lazyScreen(() => import("./routes/join")) },
    ],
  },
];
