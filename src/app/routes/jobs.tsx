import { useState } from "react";
import { useNavigate } from "react-router-dom";
import { roleCan } from "../../../shared/permissions";
import { primaryButtonClass } from "../../components/ui/form";
import { PageHeader } from "../../components/ui/page-header";
import { paths } from "../../config/paths";
import { useSignedInSession } from "../../features/auth/hooks/session-context";
import { Dialog } from "../../components/ui/dialog";
import { JobForm } from "../../features/jobs/components/job-form";
import { JobsList } from "../../features/jobs/components/jobs-list";

export default function JobsScreen() {
  const session = useSignedInSession();
  const navigate = useNavigate();
  const canWrite = roleCan(session.role, "jobs:write");
  const [creating, setCreating] = useState(false);
  const openNew = canWrite ? () => setCreating(true) : undefined;
  return (
    <>
      <PageHeader
        title="Jobs"
        description="Each job is one client's site: its DC systems, estimate and quotes."
        actions={
          openNew ? (
            <button type="button" onClick={openNew} className={primaryButtonClass}>
              New job
            </button>
          ) : null
        }
      />
      <JobsList canCreate={canWrite} />
      {creating ? (
        <Dialog size="md" closeButton title="New job" onClose={() => setCreating(false)}>
          <JobForm onCreated={(job) => navigate(paths.job.getHref(job.id))} onCancel={() => setCreating(false)} />
        </Dialog>
      ) : null}
    </>
  );
}
