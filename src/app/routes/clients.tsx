import { EmptyState } from "../../components/ui/empty-state";
import { PeopleIcon } from "../../components/ui/icons";
import { PageHeader } from "../../components/ui/page-header";

export default function ClientsScreen() {
  return (
    <>
      <PageHeader title="Clients" description="The people and firms you quote for." />
      <EmptyState title="No clients yet" icon={<PeopleIcon />}>
        Clients get their quotes by e-mail and accept them online; they never need an account. Each client's contact details, billing
        address and jobs will be kept here.
      </EmptyState>
    </>
  );
}
