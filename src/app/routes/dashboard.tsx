import { EmptyState } from "../../components/ui/empty-state";
import { GaugeIcon } from "../../components/ui/icons";
import { PageHeader } from "../../components/ui/page-header";

export default function DashboardScreen() {
  return (
    <>
      <PageHeader title="Dashboard" description="What needs your attention today." />
      <EmptyState title="Nothing to follow up yet" icon={<GaugeIcon />}>
        Quotes waiting for an answer, deposits that have arrived and systems with a load over its drop limit will gather here as
        soon as you start pricing jobs.
      </EmptyState>
    </>
  );
}
