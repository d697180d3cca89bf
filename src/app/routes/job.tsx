import { useParams } from "react-router-dom";
import { roleCan } from "../../../shared/permissions";
import { useSignedInSession } from "../../features/auth/hooks/session-context";
import { JobNotFound, JobPage } from "../../features/jobs/components/job-page";

export default function JobScreen() {
  const { jobId } = useParams();
  const session = useSignedInSession();
  if (!jobId) return <JobNotFound />;
  return <JobPage key={jobId} jobId={jobId} canWrite={roleCan(session.role, "jobs:write")} />;
}
