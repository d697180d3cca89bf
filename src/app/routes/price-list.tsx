import { roleCan } from "../../../shared/permissions";
import { PageHeader } from "../../components/ui/page-header";
import { useSignedInSession } from "../../features/auth/hooks/session-context";
import { PriceList } from "../../features/price-list/components/price-list-table";

export default function PriceListScreen() {
  const session = useSignedInSession();
  return (
    <>
      <PageHeader title="Price list" description="Your costs and sell prices: every estimate is priced from here." />
      <PriceList canWrite={roleCan(session.role, "prices:write")} />
    </>
  );
}
