import type { CompanySettings } from "../../../../shared/schemas/company";
import { useCompany } from "../api/get-company";
import { CompanySettingsForm } from "./company-settings-form";
import { LoadFailed } from "../../../components/ui/load-failed";

/** Loads the company's settings and shows them in the form (editable for the Owner). */
export function CompanySettingsPanel({ canEdit, onSaved }: { canEdit: boolean; onSaved?: (company: CompanySettings) => void }) {
  const { data, error, isPending, isFetching, refetch } = useCompany();
  if (isPending) return <p className="mt-6 text-sm text-ink-500">Loading settings…</p>;
  if (error) {
    return (
      <LoadFailed className="mt-6 max-w-xl" message={error.message} retrying={isFetching} onRetry={() => void refetch()} />
    );
  }
  return <CompanySettingsForm key={data.id} company={data} canEdit={canEdit} onSaved={onSaved} />;
}
