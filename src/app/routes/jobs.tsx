import { EmptyState } from "../../components/ui/empty-state";
import { RunIcon } from "../../components/ui/icons";
import { PageHeader } from "../../components/ui/page-header";

export default function JobsScreen() {
  return (
    <>
      <PageHeader title="Jobs" description="Each job is one client's site: its DC systems, estimate and quotes." />
      <EmptyState title="No jobs yet" icon={<RunIcon />}>
        A job holds the systems you lay out for a site — a battery bank, the cable runs and the loads — with the voltage at every load
        checked in every case. Jobs you create will be listed here, newest first.
      </EmptyState>
    </>
  );
}
