import type { RouteObject } from "react-router-dom";
import { AppFrame } from "../components/layouts/app-frame";
import { paths } from "../config/paths";

// Screens load on first visit; each module's default export is the screen.
const lazyScreen = (load: () => Promise<{ default: React.ComponentType }>) => async () => ({ Component: (await load()).default });

export const routes: RouteObject[] = [
  {
    element: <AppFrame />,
    children: [
      { path: paths.dashboard.path, lazy: lazyScreen(() => import("./routes/dashboard")) },
      { path: paths.jobs.path, lazy: lazyScreen(() => import("./routes/jobs")) },
      { path: paths.clients.path, lazy: lazyScreen(() => import("./routes/clients")) },
      { path: paths.priceList.path, lazy: lazyScreen(() => import("./routes/price-list")) },
      { path: paths.settings.path, lazy: lazyScreen(() => import("./routes/settings")) },
      { path: "*", lazy: lazyScreen(() => import("./routes/not-found")) },
    ],
  },
];
