import { useState } from "react";
import { DEFAULT_LIMIT_PROFILE } from "../../../../shared/engine/schema";
import type { LimitProfileRecord } from "../../../../shared/schemas/jobs";
import { ConfirmDialog } from "../../../components/ui/confirm-dialog";
import { dangerButtonClass, FormAlert, primaryButtonClass, secondaryButtonClass } from "../../../components/ui/form";
import { ApiError } from "../../../lib/api-client";
import { cn } from "../../../utils/cn";
import { Dialog } from "../../../components/ui/dialog";
import { Pager, PlainHeader, staleClass } from "../../../components/ui/list-controls";
import { useDeleteLimitProfile } from "../api/delete-limit-profile";
import { ALL_LIMIT_PROFILES, useLimitProfiles } from "../api/get-limit-profiles";
import { LimitProfileFormPanel, type LimitProfileFormMode } from "./limit-profile-form";
import { LoadFailed } from "../../../components/ui/load-failed";

const cellClass = "px-3 py-2 align-top";
const percent = (value: number) => `${Number(value.toFixed(3))} %`;

/** The company's limit profiles; the Owner adds, duplicates, edits and deletes (built-in ones only duplicate). */
export function LimitProfileTable({ canWrite }: { canWrite: boolean }) {
  const [page, setPage] = useState(1);
  const { data, error, isPending, isFetching, isPlaceholderData, refetch } = useLimitProfiles({ ...ALL_LIMIT_PROFILES, page });
  const remove = useDeleteLimitProfile();
  const [form, setForm] = useState<LimitProfileFormMode | null>(null);
  const [deleting, setDeleting] = useState<LimitProfileRecord | null>(null);
  const [alert, setAlert] = useState<string | null>(null);

  const open = (target: LimitProfileFormMode) => {
    setAlert(null);
    setForm(target);
  };

  const confirmDelete = () => {
    if (!deleting) return;
    const target = deleting;
    setAlert(null);
    remove.mutate(target.id, {
      onSuccess: () => setDeleting(null),
      onError: (failure) => {
        setDeleting(null);
        setAlert(failure instanceof ApiError && failure.status === 409 ? `${target.name} was not deleted: ${failure.message}` : failure.message);
      },
    });
  };

  let body;
  if (isPending) body = <p className="text-sm text-ink-500">Loading limit profiles…</p>;
  else if (error && !data) {
    body = (
      <LoadFailed message={`The limit profiles could not be loaded. ${error.message}`} retrying={isFetching} onRetry={() => void refetch()} />
    );
  } else if (data && data.items.length === 0) {
    body = (
      <p className="rounded-lg border border-dashed border-ink-200 bg-white px-4 py-8 text-center text-sm text-ink-600">
        No limit profiles yet. Systems are checked against the default ({DEFAULT_LIMIT_PROFILE.branchPercent} % branch, {DEFAULT_LIMIT_PROFILE.totalPercent} % total,{" "}
        {DEFAULT_LIMIT_PROFILE.criticalPercent} % critical) until one is chosen.
      </p>
    );
  } else if (data) {
    body = (
      <div className="space-y-3">
        <div className="overflow-x-auto rounded-lg border border-ink-100 bg-white">
          <table aria-busy={isPlaceholderData || undefined} className={cn("min-w-full text-left text-sm", isPlaceholderData && staleClass)}>
            <caption className="sr-only">Limit profiles</caption>
            <thead className="border-b border-ink-100 bg-ink-50 text-xs font-semibold text-ink-500">
              <tr>
                <PlainHeader>Name</PlainHeader>
                <PlainHeader className="text-right">Branch</PlainHeader>
                <PlainHeader className="text-right">Total</PlainHeader>
                <PlainHeader className="text-right">Critical</PlainHeader>
                <PlainHeader className="text-right">Near limit from</PlainHeader>
                <PlainHeader>Notes or source</PlainHeader>
                <PlainHeader className="text-right">Systems</PlainHeader>
                {canWrite ? (
                  <th scope="col" className={cellClass}>
                    <span className="sr-only">Actions</span>
                  </th>
                ) : null}
              </tr>
            </thead>
            <tbody className="divide-y divide-ink-100">
              {data.items.map((profile) => (
                <tr key={profile.id}>
                  <th scope="row" id={`profile-${profile.id}`} className={`${cellClass} min-w-48 font-medium text-ink-900`}>
                    {profile.name}
                    {profile.builtIn ? (
                      <span className="ml-2 inline-flex rounded-full border border-ink-200 bg-ink-50 px-2 py-0.5 text-xs font-medium text-ink-600">Built-in</span>
                    ) : null}
                  </th>
                  <td className={`${cellClass} text-right tabular-nums`}>{percent(profile.branchPercent)}</td>
                  <td className={`${cellClass} text-right tabular-nums`}>{percent(profile.totalPercent)}</td>
                  <td className={`${cellClass} text-right tabular-nums`}>{percent(profile.criticalPercent)}</td>
                  <td className={`${cellClass} whitespace-nowrap text-right tabular-nums`}>{percent(profile.nearFraction * 100)} of the limit</td>
                  <td className={`${cellClass} min-w-64 max-w-md whitespace-pre-line text-ink-700`}>{profile.notes ?? <span className="text-ink-400">—</span>}</td>
                  <td className={`${cellClass} text-right tabular-nums`}>{profile.systemCount}</td>
                  {canWrite ? (
                    <td className={`${cellClass} whitespace-nowrap text-right`}>
                      <div className="flex justify-end gap-2">
                        <button type="button" aria-describedby={`profile-${profile.id}`} onClick={() => open({ mode: "duplicate", from: profile })} className={secondaryButtonClass}>
                          Duplicate
                        </button>
                        {profile.builtIn ? null : (
                          <>
                            <button type="button" aria-describedby={`profile-${profile.id}`} onClick={() => open({ mode: "edit", profile })} className={secondaryButtonClass}>
                              Edit
                            </button>
                            <button
                              type="button"
                              aria-describedby={`profile-${profile.id}`}
                              onClick={() => {
                                setAlert(null);
                                setDeleting(profile);
                              }}
                              className={dangerButtonClass}
                            >
                              Delete
                            </button>
                          </>
                        )}
                      </div>
                    </td>
                  ) : null}
                </tr>
              ))}
            </tbody>
          </table>
        </div>
        {data.total > data.pageSize ? (
          <Pager page={page} pageSize={data.pageSize} total={data.total} noun={["profile", "profiles"]} busy={isPlaceholderData} onPage={setPage} />
        ) : null}
      </div>
    );
  }

  return (
    <div className="mt-6 space-y-4">
      <div className="flex flex-wrap items-center justify-between gap-3">
        <p className="max-w-2xl text-sm text-ink-600">
          {canWrite
            ? "Built-in profiles follow a published recommendation and cannot be changed: duplicate one to make your own."
            : "Only the company's Owner can add or change limit profiles; you can read them here."}
        </p>
        {canWrite ? (
          <button type="button" onClick={() => open({ mode: "new" })} className={primaryButtonClass}>
            New limit profile
          </button>
        ) : null}
      </div>
      <FormAlert message={alert} />
      {body}
      {form ? (
        <Dialog
          title={form.mode === "edit" ? `Edit ${form.profile.name}` : form.mode === "duplicate" ? `Duplicate ${form.from.name}` : "New limit profile"}
          size="lg"
          closeButton
          onClose={() => setForm(null)}
        >
          <LimitProfileFormPanel target={form} onSaved={() => setForm(null)} onCancel={() => setForm(null)} />
        </Dialog>
      ) : null}
      {deleting ? (
        <ConfirmDialog title={`Delete ${deleting.name}?`} confirmLabel="Delete profile" pending={remove.isPending} onConfirm={confirmDelete} onCancel={() => setDeleting(null)}>
          {deleting.systemCount > 0
            ? `${deleting.systemCount} ${deleting.systemCount === 1 ? "system uses" : "systems use"} this profile; a profile in use cannot be deleted.`
            : "No system uses this profile. This cannot be undone."}
        </ConfirmDialog>
      ) : null}
    </div>
  );
}
