import { useQueryClient } from "@tanstack/react-query";
import { roleCan } from "../../../shared/permissions";
import { PageHeader } from "../../components/ui/page-header";
import { sessionQueryOptions } from "../../features/auth/api/get-session";
import { useSignedInSession } from "../../features/auth/hooks/session-context";
import { InviteForm } from "../../features/team/components/invite-form";
import { MemberTable } from "../../features/team/components/member-table";
import { PendingInvitations } from "../../features/team/components/pending-invitations";

export default function TeamScreen() {
  const session = useSignedInSession();
  const queryClient = useQueryClient();
  const canManage = roleCan(session.role, "members:write");
  const canInvite = roleCan(session.role, "invitations:write");
  // Changing one's own role or leaving changes the session (role, company).
  const refreshSession = () => void queryClient.invalidateQueries({ queryKey: sessionQueryOptions().queryKey });

  return (
    <>
      <PageHeader title="Team" description={`The people who work in ${session.company.name} on Runwright, and what each may do.`} />
      <MemberTable key={session.company.id} currentUserId={session.user.id} companyName={session.company.name} canManage={canManage} onSelfChanged={refreshSession} />
      {canInvite ? (
        <div className="mt-8 grid gap-6 lg:grid-cols-2">
          <InviteForm />
          {roleCan(session.role, "invitations:read") ? <PendingInvitations /> : null}
        </div>
      ) : (
        <p className="mt-6 text-sm text-ink-500">Only the company's Owner can invite people, change roles or remove members.</p>
      )}
    </>
  );
}
