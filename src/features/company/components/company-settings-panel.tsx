import type { CompanySettings } from "../../../../shared/schemas/company";
import { FormAlert, secondaryButtonClass } from "../../../components/ui/form";
import { useCompany } from "../api/get-company";
import { CompanySettingsForm } from "./company-settings-form";

/** Loads the company's settings and shows them in the form (editable for the Owner). */
export function CompanySettingsPanel({ canEdit, onSaved }: { canEdit: boolean; onSaved?: (company: CompanySettings) => void }) {
  const { data, error, isPending, isFetching, refetch } = useCompany();
  if (isPending) return <p className="mt-6 text-sm text-ink-500">Loading settings…</p>;
  if (error) {
    return (
      <div className="mt-6 max-w-xl space-y-3">
        <FormAlert message={error.message} />
        <button type="button" disabled={isFetching} onClick={() => void refetch()} className={secondaryButtonClass}>
          {isFetching ? "Trying again…" : "Try again"}
        </button>
      </div>
    );
  }
  return <CompanySettingsForm key={data.id} company={data} canEdit={canEdit} onSaved={onSaved} />;
}
