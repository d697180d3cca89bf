import { useParams } from "react-router-dom";
import { roleCan } from "../../../shared/permissions";
import { useSignedInSession } from "../../features/auth/hooks/session-context";
import { EstimatePage } from "../../features/estimates/components/estimate-page";
import { JobNotFound } from "../../features/jobs/components/job-page";

/** The Estimate of a job (/jobs/:jobId/estimate): the bill of materials priced, adjusted and turned into quotes. */
export default function EstimateScreen() {
  const { jobId } = useParams();
  const session = useSignedInSession();
  if (!jobId) return <JobNotFound />;
  return <EstimatePage key={jobId} jobId={jobId} canWrite={roleCan(session.role, "quotes:write")} canAddPrices={roleCan(session.role, "prices:write")} />;
}
