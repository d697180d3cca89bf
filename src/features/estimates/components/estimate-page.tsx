import { EmptyState } from "../../../components/ui/empty-state";
import { FormAlert, primaryButtonClass } from "../../../components/ui/form";
import { TagIcon } from "../../../components/ui/icons";
import { LoadFailed } from "../../../components/ui/load-failed";
import { useGenerateEstimate } from "../api/generate-estimate";
import { useEstimate } from "../api/get-estimate";
import { EstimateEditor } from "./estimate-editor";
import { EstimateHeader } from "./estimate-header";

function LoadingEstimate() {
  return (
    <div aria-busy="true" className="space-y-3">
      <p className="text-sm text-ink-500">Loading the estimate…</p>
      <div aria-hidden="true" className="space-y-2">
        <div className="h-8 w-1/3 animate-pulse rounded bg-ink-100" />
        <div className="h-48 animate-pulse rounded-lg bg-ink-100" />
      </div>
    </div>
  );
}

/** No estimate yet (204): what it is and, for writers, "Build from the layout". */
function NoEstimate({ jobId, canWrite }: { jobId: string; canWrite: boolean }) {
  const generate = useGenerateEstimate();
  return (
    <>
      <EstimateHeader jobId={jobId} />
      <EmptyState
        title="No estimate yet"
        icon={<TagIcon />}
        action={
          canWrite ? (
            <div className="space-y-3">
              <FormAlert message={generate.error ? `The estimate was not built. ${generate.error.message}` : null} className="text-left" />
              <button type="button" onClick={() => generate.mutate(jobId)} disabled={generate.isPending} className={primaryButtonClass}>
                {generate.isPending ? "Building…" : "Build from the layout"}
              </button>
            </div>
          ) : null
        }
      >
        {canWrite
          ? "The estimate is built from the job's saved systems: cable by size and material, terminations, fuses and holders, and labour, each priced from your price list. You can then add lines of your own and adjust quantities and markups."
          : "Nobody has built an estimate for this job yet. Owners and Estimators build it from the job's systems."}
      </EmptyState>
    </>
  );
}

/** The Estimate screen of a job: loading, none yet, failed, or the estimate itself. */
export function EstimatePage({ jobId, canWrite, canAddPrices }: { jobId: string; canWrite: boolean; canAddPrices: boolean }) {
  const { data, error, isPending, isFetching, refetch } = useEstimate(jobId);
  if (isPending) return <LoadingEstimate />;
  if (error) {
    return (
      <>
        <EstimateHeader jobId={jobId} />
        <LoadFailed className="mt-6 max-w-xl" message={`The estimate could not be loaded. ${error.message}`} retrying={isFetching} onRetry={() => void refetch()} />
      </>
    );
  }
  if (data === null) return <NoEstimate jobId={jobId} canWrite={canWrite} />;
  return <EstimateEditor key={data.id} jobId={jobId} estimate={data} canWrite={canWrite} canAddPrices={canAddPrices} />;
}
