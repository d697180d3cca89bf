import { useState } from "react";
import { ROLE_LABELS, type Invitation } from "../../../../shared/schemas/team";
import { FormAlert, secondaryButtonClass } from "../../../components/ui/form";
import { formatDate } from "../../../utils/format-date";
import { useInvitations } from "../api/get-invitations";
import { useWithdrawInvitation } from "../api/withdraw-invitation";

function InvitationItem({ invitation, onError }: { invitation: Invitation; onError: (message: string | null) => void }) {
  const withdraw = useWithdrawInvitation();
  const emailId = `invitation-${invitation.id}`;
  return (
    <li className="flex flex-wrap items-center justify-between gap-3 px-3 py-2">
      <div className="min-w-0">
        <p id={emailId} className="truncate font-medium text-ink-900">
          {invitation.email}
        </p>
        <p className="text-xs text-ink-500">
          {ROLE_LABELS[invitation.role]} · Expires {formatDate(invitation.expiresAt)}
          {invitation.invitedBy ? ` · Invited by ${invitation.invitedBy}` : ""}
        </p>
      </div>
      <button
        type="button"
        aria-describedby={emailId}
        disabled={withdraw.isPending}
        onClick={() => {
          onError(null);
          withdraw.mutate(invitation.id, { onError: (error) => onError(error.message) });
        }}
        className={secondaryButtonClass}
      >
        {withdraw.isPending ? "Withdraw…" : "Withdraw"}
      </button>
    </li>
  );
}

/** Invitations sent but not yet accepted; each can be withdrawn, which makes its link stop working. */
export function PendingInvitations() {
  const { data, error, isPending } = useInvitations();
  const [alert, setAlert] = useState<string | null>(null);
  return (
    <section aria-labelledby="pending-heading" className="rounded-lg border border-ink-100 bg-white p-4">
      <h2 id="pending-heading" className="text-base font-semibold text-ink-900">
        Pending invitations
      </h2>
      <div className="mt-3 space-y-3 text-sm">
        <FormAlert message={alert ?? error?.message} />
        {isPending ? <p className="text-ink-500">Loading invitations…</p> : null}
        {data && data.invitations.length === 0 ? (
          <p className="text-ink-500">No invitations are waiting for an answer. People you invite show here until they join.</p>
        ) : null}
        {data && data.invitations.length > 0 ? (
          <ul className="divide-y divide-ink-100 rounded-md border border-ink-100">
            {data.invitations.map((invitation) => (
              <InvitationItem key={invitation.id} invitation={invitation} onError={setAlert} />
            ))}
          </ul>
        ) : null}
      </div>
    </section>
  );
}
