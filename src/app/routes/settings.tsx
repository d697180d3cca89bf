import { useQueryClient } from "@tanstack/react-query";
import { Link } from "react-router-dom";
import { roleCan } from "../../../shared/permissions";
import { PageHeader } from "../../components/ui/page-header";
import { paths } from "../../config/paths";
import { sessionQueryOptions } from "../../features/auth/api/get-session";
import { useSignedInSession } from "../../features/auth/hooks/session-context";
import { CompanySettingsPanel } from "../../features/company/components/company-settings-panel";
import { EstimatingSettingsSection } from "../../features/company/components/estimating-settings-form";

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
      <EstimatingSettingsSection canEdit={roleCan(session.role, "company:write")} />
      <section aria-labelledby="limits-heading" className="mt-6 max-w-3xl rounded-lg border border-ink-100 bg-white p-4 sm:p-6">
        <h2 id="limits-heading" className="text-base font-semibold text-ink-900">
          Voltage-drop limits
        </h2>
        <p className="mt-1 text-sm text-ink-600">
          Each system's loads are checked against a limit profile: a branch, a total and a critical-load limit.{" "}
          <Link to={paths.limitProfiles.getHref()} className="font-medium text-copper-700 underline underline-offset-2 hover:text-copper-800">
            Limit profiles
          </Link>
        </p>
      </section>
    </>
  );
}
