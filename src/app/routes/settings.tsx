import { useQueryClient } from "@tanstack/react-query";
import { roleCan } from "../../../shared/permissions";
import { PageHeader } from "../../components/ui/page-header";
import { sessionQueryOptions } from "../../features/auth/api/get-session";
import { useSignedInSession } from "../../features/auth/hooks/session-context";
import { CompanySettingsPanel } from "../../features/company/components/company-settings-panel";

export default function SettingsScreen() {
  const session = useSignedInSession();
  const queryClient = useQueryClient();
  return (
    <>
      <PageHeader title="Settings" description="Company details and the money defaults every estimate starts from." />
      <CompanySettingsPanel
        canEdit={roleCan(session.role, "company:write")}
        // The side rail shows the company's name from the session.
        onSaved={() => void queryClient.invalidateQueries({ queryKey: sessionQueryOptions().queryKey })}
      />
    </>
  );
}
