import { useLocation } from "react-router-dom";
import { linkTokenSchema } from "../../../shared/schemas/auth";
import { AuthTitle } from "../../components/ui/auth-title";
import { FormAlert } from "../../components/ui/form";
import { JoinInvitation } from "../../features/auth/components/join-invitation";
import { readLinkToken } from "../../features/auth/utils/link-token";

const MISSING = "This page needs the link from your invitation e-mail, and this address has no token. Open the link from the e-mail again.";

export default function JoinScreen() {
  const token = readLinkToken(useLocation().hash);
  const checked = token === null ? null : linkTokenSchema.safeParse(token);
  if (token === null || !checked?.success) {
    return (
      <>
        <AuthTitle>Your invitation</AuthTitle>
        <FormAlert message={checked && !checked.success ? (checked.error.issues[0]?.message ?? MISSING) : MISSING} />
      </>
    );
  }
  return <JoinInvitation key={checked.data} token={checked.data} />;
}
