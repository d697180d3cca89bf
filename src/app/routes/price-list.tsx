import { EmptyState } from "../../components/ui/empty-state";
import { TagIcon } from "../../components/ui/icons";
import { PageHeader } from "../../components/ui/page-header";

export default function PriceListScreen() {
  return (
    <>
      <PageHeader title="Price list" description="Your costs and sell prices: every estimate is priced from here." />
      <EmptyState title="Your price list is empty" icon={<TagIcon />}>
        Cable by size and material, fuses and holders, lugs and terminations, devices and labour rates belong here. Auto-sizing only
        proposes cable sizes that have a price, so the quote never carries a silent zero.
      </EmptyState>
    </>
  );
}
