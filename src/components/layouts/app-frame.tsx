import type { ComponentType, SVGProps } from "react";
import { NavLink, Outlet, useNavigation } from "react-router-dom";
import logo from "../../../assets/logo.svg";
import { paths } from "../../config/paths";
import { AccountPanel } from "../../features/auth/components/account-panel";
import { HealthIndicator } from "../../features/health/components/health-indicator";
import { cn } from "../../utils/cn";
import { BadgeIcon, GaugeIcon, PeopleIcon, RunIcon, SlidersIcon, TagIcon } from "../ui/icons";

const NAV: Array<{ to: string; label: string; icon: ComponentType<SVGProps<SVGSVGElement>> }> = [
  { to: paths.dashboard.getHref(), label: "Dashboard", icon: GaugeIcon },
  { to: paths.jobs.getHref(), label: "Jobs", icon: RunIcon },
  { to: paths.clients.getHref(), label: "Clients", icon: PeopleIcon },
  { to: paths.priceList.getHref(), label: "Price list", icon: TagIcon },
  { to: paths.team.getHref(), label: "Team", icon: BadgeIcon },
  { to: paths.settings.getHref(), label: "Settings", icon: SlidersIcon },
];

/** Page chrome: the navigation rail with the signed-in account, the screen, and the footer with the server's health. */
export function AppFrame() {
  const navigation = useNavigation();
  return (
    <div className="flex min-h-screen flex-col md:flex-row">
      <a href="#main" className="sr-only focus:not-sr-only focus:absolute focus:left-2 focus:top-2 focus:z-10 focus:rounded focus:bg-white focus:px-3 focus:py-2">
        Skip to content
      </a>
      <aside className="flex flex-col bg-ink-900 text-ink-100 md:w-56 md:shrink-0">
        <div className="flex items-center gap-2 px-4 py-4">
          <img src={logo} alt="" width={28} height={28} />
          <span className="text-lg font-semibold tracking-tight text-white">Runwright</span>
        </div>
        <nav aria-label="Main" className="overflow-x-auto">
          <ul className="flex gap-1 px-2 pb-2 md:flex-col md:pb-4">
            {NAV.map(({ to, label, icon: NavIcon }) => (
              <li key={to}>
                <NavLink
                  to={to}
                  end={to === "/"}
                  className={({ isActive }) =>
                    cn(
                      "flex items-center gap-2 whitespace-nowrap rounded-md border-l-2 px-3 py-2 text-sm font-medium",
                      isActive ? "border-copper-400 bg-ink-800 text-white" : "border-transparent text-ink-300 hover:bg-ink-800 hover:text-white",
                    )
                  }
                >
                  <NavIcon />
                  {label}
                </NavLink>
              </li>
            ))}
          </ul>
        </nav>
        <div className="md:mt-auto">
          <AccountPanel />
        </div>
      </aside>
      <div className="flex min-w-0 flex-1 flex-col">
        {navigation.state === "loading" ? <div role="progressbar" aria-label="Loading page" className="h-0.5 w-full animate-pulse bg-copper-400" /> : null}
        <main id="main" className="flex-1 px-4 py-6 md:px-8">
          <Outlet />
        </main>
        <footer className="flex flex-wrap items-center justify-between gap-2 border-t border-ink-100 px-4 py-3 md:px-8">
          <HealthIndicator />
          <p className="text-xs text-ink-400">Design aid only: the locally adopted electrical code and a licensed professional have the final word.</p>
        </footer>
      </div>
    </div>
  );
}
