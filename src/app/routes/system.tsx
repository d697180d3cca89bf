import { Link, useParams } from "react-router-dom";
import { EmptyState } from "../../components/ui/empty-state";
import { secondaryButtonClass } from "../../components/ui/form";
import { paths } from "../../config/paths";
import { ApiError } from "../../lib/api-client";
import { SystemEditor } from "../../features/system-editor/components/system-editor";
import { useSystem } from "../../features/systems/api/get-system";
import { LoadFailed } from "../../components/ui/load-failed";

function LoadingSystem() {
  return (
    <div aria-busy="true" className="space-y-4">
      <p className="text-sm text-ink-500">Loading system…</p>
      <div aria-hidden="true" className="space-y-3">
        <div className="h-8 w-1/3 animate-pulse rounded bg-ink-100" />
        <div className="grid gap-4 xl:grid-cols-[3fr_2fr]">
          <div className="h-64 animate-pulse rounded-lg bg-ink-100" />
          <div className="h-64 animate-pulse rounded-lg bg-ink-100" />
        </div>
      </div>
    </div>
  );
}

/** The System editor (/jobs/:jobId/systems/:systemId): the estimator's main screen. */
export default function SystemScreen() {
  const { jobId = "", systemId = "" } = useParams();
  const system = useSystem(systemId);

  if (system.isPending) return <LoadingSystem />;
  if (system.error) {
    if (system.error instanceof ApiError && system.error.status === 404) {
      return (
        <EmptyState title="System not found" action={<Link to={paths.jobs.getHref()} className={secondaryButtonClass}>Back to Jobs</Link>}>
          This system does not exist or belongs to another company. It may have been deleted with its job.
        </EmptyState>
      );
    }
    return (
      <div className="mx-auto mt-10 max-w-md space-y-3">
        <h1 className="text-lg font-semibold text-ink-900">The system could not be loaded</h1>
        <LoadFailed message={system.error.message} retrying={system.isFetching} onRetry={() => void system.refetch()} />
      </div>
    );
  }
  return <SystemEditor key={system.data.id} jobId={jobId} record={system.data} />;
}
