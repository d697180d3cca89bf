import { useParams } from "react-router-dom";
import { QuoteLinkPage } from "../../features/quote-link/components/quote-link-page";

/** `/q/:token`: the client's page of a sent quote. Outside the app frame: no account, no session. */
export default function QuoteLinkScreen() {
  const { token = "" } = useParams();
  return <QuoteLinkPage key={token} token={token} />;
}
