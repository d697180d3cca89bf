import { EmptyState } from "../../components/ui/empty-state";
import { SlidersIcon } from "../../components/ui/icons";
import { PageHeader } from "../../components/ui/page-header";

export default function SettingsScreen() {
  return (
    <>
      <PageHeader title="Settings" description="Company details, money defaults and drop-limit profiles." />
      <EmptyState title="No company settings to show" icon={<SlidersIcon />}>
        Your company's name, logo, licence number, currency, tax rate, default markup, labour rate, deposit and limit profiles are
        set here by the company's Owner after signing in.
      </EmptyState>
    </>
  );
}
