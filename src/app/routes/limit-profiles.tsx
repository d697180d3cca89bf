import { Link } from "react-router-dom";
import { roleCan } from "../../../shared/permissions";
import { PageHeader } from "../../components/ui/page-header";
import { paths } from "../../config/paths";
import { useSignedInSession } from "../../features/auth/hooks/session-context";
import { LimitProfileTable } from "../../features/limit-profiles/components/limit-profile-table";

export default function LimitProfilesScreen() {
  const session = useSignedInSession();
  return (
    <>
      <Link to={paths.settings.getHref()} className="text-sm text-ink-500 hover:text-ink-900">
        <span aria-hidden="true">←</span> Settings
      </Link>
      <div className="mt-2">
        <PageHeader title="Limit profiles" description="The voltage-drop limits each system's loads are checked against, as a share of the nominal voltage." />
      </div>
      <LimitProfileTable canWrite={roleCan(session.role, "limits:write")} />
    </>
  );
}
