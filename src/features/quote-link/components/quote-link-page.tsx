import { LoadFailed } from "../../../components/ui/load-failed";
import { closedLinkOf, usePublicQuote } from "../api/get-public-quote";
import { ClosedLinkPage } from "./closed-link";
import { QuoteDocument } from "./quote-document";
import { QuoteLinkShell } from "./quote-link-shell";

/** The client's page behind an e-mailed link: the quote, why the link no longer opens it, or a retry. */
export function QuoteLinkPage({ token }: { token: string }) {
  const { data: quote, error, isPending, isRefetching, refetch } = usePublicQuote(token);

  if (isPending) {
    return (
      <QuoteLinkShell narrow>
        <p role="status" className="text-sm text-ink-500">
          Loading your quote…
        </p>
      </QuoteLinkShell>
    );
  }
  if (error) {
    const closed = closedLinkOf(error);
    if (closed) return <ClosedLinkPage closed={closed} />;
  }
  // A failed refetch (while a payment is being confirmed, say) keeps the quote already on screen.
  if (!quote) {
    return (
      <QuoteLinkShell narrow>
        <h1 className="mb-4 text-xl font-semibold tracking-tight text-ink-900">Your quote</h1>
        <LoadFailed message={`The quote could not be opened. ${error?.message ?? ""}`} retrying={isRefetching} onRetry={() => void refetch()} />
      </QuoteLinkShell>
    );
  }
  return (
    <QuoteLinkShell>
      <QuoteDocument token={token} quote={quote} />
    </QuoteLinkShell>
  );
}
