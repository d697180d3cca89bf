import { useParams } from "react-router-dom";
import { roleCan } from "../../../shared/permissions";
import { useSignedInSession } from "../../features/auth/hooks/session-context";
import { QuoteNotFound, QuotePage } from "../../features/quotes/components/quote-page";

/** One quote revision (/jobs/:jobId/quotes/:quoteId): what was frozen, where it went, what the client did and paid. */
export default function QuoteScreen() {
  const { jobId, quoteId } = useParams();
  const session = useSignedInSession();
  if (!jobId || !quoteId) return <QuoteNotFound jobId={jobId} />;
  return <QuotePage key={quoteId} jobId={jobId} quoteId={quoteId} canWrite={roleCan(session.role, "quotes:write")} canRefund={roleCan(session.role, "payments:refund")} />;
}
