import { Link, useLocation } from "react-router-dom";
import { EmptyState } from "../../components/ui/empty-state";
import { CompassIcon } from "../../components/ui/icons";
import { paths } from "../../config/paths";

export default function NotFoundScreen() {
  const { pathname } = useLocation();
  return (
    <EmptyState
      title="Page not found"
      icon={<CompassIcon />}
      action={
        <Link to={paths.dashboard.getHref()} className="rounded-md bg-ink-900 px-4 py-2 text-sm font-medium text-white hover:bg-ink-800">
          Go to the dashboard
        </Link>
      }
    >
      There is no page at <code className="rounded bg-ink-50 px-1">{pathname}</code>. It may have moved, or the link was mistyped.
    </EmptyState>
  );
}
