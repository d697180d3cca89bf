import { useState } from "react";
import { ROLE_LABELS, ROLES, type Member, type Role } from "../../../../shared/schemas/team";
import { ConfirmDialog } from "../../../components/ui/confirm-dialog";
import { controlClass, dangerButtonClass, FormAlert } from "../../../components/ui/form";
import { formatDate } from "../../../utils/format-date";
import { useChangeRole } from "../api/change-role";
import { useMembers } from "../api/get-members";
import { useRemoveMember } from "../api/remove-member";
import { LoadFailed } from "../../../components/ui/load-failed";

interface MemberTableProps {
  /** The signed-in user: their row is marked. */
  currentUserId: string;
  companyName: string;
  /** May change roles and remove members (the Owner). */
  canManage: boolean;
  /** Called after the signed-in user changed their own role or removed themselves. */
  onSelfChanged?: () => void;
}

const cellClass = "px-3 py-2 align-middle";

function RoleSelect({ member, onError, onChanged }: { member: Member; onError: (message: string | null) => void; onChanged: () => void }) {
  const change = useChangeRole();
  const shown = change.isPending ? change.variables.role : member.role;
  // An aria-label rather than a hidden <label>: the member's name then appears once in the row's text.
  return (
    <>
      <select
        aria-label={`Role for ${member.name}`}
        value={shown}
        disabled={change.isPending}
        aria-busy={change.isPending}
        onChange={(event) => {
          onError(null);
          change.mutate({ userId: member.userId, role: event.target.value as Role }, { onSuccess: onChanged, onError: (error) => onError(error.message) });
        }}
        className={`${controlClass} w-auto py-1`}
      >
        {ROLES.map((role) => (
          <option key={role} value={role}>
            {ROLE_LABELS[role]}
          </option>
        ))}
      </select>
    </>
  );
}

/** The company's members; for the Owner, each row's role can be changed and the member removed. */
export function MemberTable({ currentUserId, companyName, canManage, onSelfChanged }: MemberTableProps) {
  const { data, error, isPending, refetch, isFetching } = useMembers();
  const remove = useRemoveMember();
  const [alert, setAlert] = useState<string | null>(null);
  const [removing, setRemoving] = useState<Member | null>(null);

  if (isPending) return <p className="mt-6 text-sm text-ink-500">Loading members…</p>;
  if (error) {
    return (
      <LoadFailed className="mt-6" message={error.message} retrying={isFetching} onRetry={() => void refetch()} />
    );
  }

  const confirmRemove = () => {
    if (!removing) return;
    const target = removing;
    setAlert(null);
    remove.mutate(target.userId, {
      onSuccess: () => {
        setRemoving(null);
        if (target.userId === currentUserId) onSelfChanged?.();
      },
      onError: (failure) => {
        setRemoving(null);
        setAlert(failure.message);
      },
    });
  };

  return (
    <div className="mt-6 space-y-3">
      <FormAlert message={alert} />
      <div className="overflow-x-auto rounded-lg border border-ink-100 bg-white">
        <table className="min-w-full text-left text-sm">
          <caption className="px-3 pt-3 pb-2 text-left text-base font-semibold text-ink-900">Members</caption>
          <thead className="border-b border-ink-100 bg-ink-50 text-xs font-semibold uppercase tracking-wide text-ink-500">
            <tr>
              <th scope="col" className={cellClass}>
                Name
              </th>
              <th scope="col" className={cellClass}>
                E-mail
              </th>
              <th scope="col" className={cellClass}>
                Role
              </th>
              <th scope="col" className={cellClass}>
                Last signed in
              </th>
              {canManage ? (
                <th scope="col" className={cellClass}>
                  <span className="sr-only">Actions</span>
                </th>
              ) : null}
            </tr>
          </thead>
          <tbody className="divide-y divide-ink-100">
            {data.members.length === 0 ? (
              <tr>
                <td colSpan={canManage ? 5 : 4} className={`${cellClass} text-ink-500`}>
                  No members yet.
                </td>
              </tr>
            ) : null}
            {data.members.map((member) => {
              const self = member.userId === currentUserId;
              return (
                <tr key={member.userId}>
                  <th scope="row" id={`member-${member.userId}`} className={`${cellClass} font-medium text-ink-900`}>
                    {member.name}
                    {self ? (
                      <>
                        {" "}
                        <span className="font-normal text-ink-500">(you)</span>
                      </>
                    ) : null}
                  </th>
                  <td className={`${cellClass} text-ink-700`}>{member.email}</td>
                  <td className={cellClass}>
                    {canManage ? (
                      <RoleSelect member={member} onError={setAlert} onChanged={() => (self ? onSelfChanged?.() : undefined)} />
                    ) : (
                      ROLE_LABELS[member.role]
                    )}
                  </td>
                  <td className={`${cellClass} text-ink-700`}>{member.lastSignInAt ? formatDate(member.lastSignInAt) : "Never"}</td>
                  {canManage ? (
                    <td className={`${cellClass} text-right`}>
                      <button
                        type="button"
                        aria-describedby={`member-${member.userId}`}
                        onClick={() => {
                          setAlert(null);
                          setRemoving(member);
                        }}
                        className={dangerButtonClass}
                      >
                        Remove
                      </button>
                    </td>
                  ) : null}
                </tr>
              );
            })}
          </tbody>
        </table>
      </div>
      {removing ? (
        <ConfirmDialog
          title={`Remove ${removing.name} from ${companyName}?`}
          confirmLabel="Remove"
          pending={remove.isPending}
          onConfirm={confirmRemove}
          onCancel={() => setRemoving(null)}
        >
          {removing.userId === currentUserId
            ? "You lose access to this company at once. Your account stays, with any other companies you belong to."
            : `${removing.name} loses access to this company at once. Their account stays, and you can invite them again later.`}
        </ConfirmDialog>
      ) : null}
    </div>
  );
}
