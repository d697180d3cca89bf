import { roleCan } from "../../../shared/permissions";
import { PageHeader } from "../../components/ui/page-header";
import { useSignedInSession } from "../../features/auth/hooks/session-context";
import { ClientsList } from "../../features/clients/components/clients-list";

export default function ClientsScreen() {
  const session = useSignedInSession();
  return (
    <>
      <PageHeader title="Clients" description="The people and firms you quote for." />
      <ClientsList canWrite={roleCan(session.role, "jobs:write")} />
    </>
  );
}
