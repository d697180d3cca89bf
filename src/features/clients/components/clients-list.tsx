import { RowActions } from "../../../components/ui/row-actions";
import { useState } from "react";
import { Link } from "react-router-dom";
import { JobLimits, type Client } from "../../../../shared/schemas/jobs";
import { ConfirmDialog } from "../../../components/ui/confirm-dialog";
import { EmptyState } from "../../../components/ui/empty-state";
import { FormAlert, primaryButtonClass } from "../../../components/ui/form";
import { PeopleIcon } from "../../../components/ui/icons";
import { paths } from "../../../config/paths";
import { ApiError } from "../../../lib/api-client";
import { cn } from "../../../utils/cn";
import { formatDate } from "../../../utils/format-date";
import { Dialog } from "../../../components/ui/dialog";
import { Pager, PlainHeader, SearchInput, SortHeader, staleClass } from "../../../components/ui/list-controls";
import { sortValues, useListParams } from "../../jobs/hooks/use-list-params";
import { useDeleteClient } from "../api/delete-client";
import { CLIENT_SORT_FIELDS, DEFAULT_CLIENT_SORT, useClients } from "../api/get-clients";
import { ClientForm } from "./client-form";
import { LoadFailed } from "../../../components/ui/load-failed";

const cellClass = "px-3 py-2 align-middle";
const SORTS = sortValues(CLIENT_SORT_FIELDS);

type Editing = { mode: "new" } | { mode: "edit"; client: Client } | null;

/** The company's clients: search, sort and pages from the address; writers add, edit and delete. */
export function ClientsList({ canWrite }: { canWrite: boolean }) {
  const { page, sort, search, update } = useListParams({ sorts: SORTS, defaultSort: DEFAULT_CLIENT_SORT });
  const params = { page, pageSize: JobLimits.pageSizeDefault, sort, ...(search ? { search } : {}) };
  const { data, error, isPending, isFetching, isPlaceholderData, refetch } = useClients(params);
  const remove = useDeleteClient();
  const [editing, setEditing] = useState<Editing>(null);
  const [deleting, setDeleting] = useState<Client | null>(null);
  const [alert, setAlert] = useState<string | null>(null);

  const openNew = () => {
    setAlert(null);
    setEditing({ mode: "new" });
  };

  const confirmDelete = () => {
    if (!deleting) return;
    const target = deleting;
    setAlert(null);
    remove.mutate(target.id, {
      onSuccess: () => setDeleting(null),
      onError: (failure) => {
        setDeleting(null);
        setAlert(
          failure instanceof ApiError && failure.status === 409
            ? `${target.name} cannot be deleted: ${failure.message.replace(/\.?$/, ".")} Move its jobs to another client or delete them first.`
            : failure.message,
        );
      },
    });
  };

  const newButton = canWrite ? (
    <button type="button" onClick={openNew} className={primaryButtonClass}>
      New client
    </button>
  ) : null;

  let body;
  if (isPending) {
    body = <p className="text-sm text-ink-500">Loading clients…</p>;
  } else if (error && !data) {
    body = (
      <LoadFailed message={`The clients could not be loaded. ${error.message}`} retrying={isFetching} onRetry={() => void refetch()} />
    );
  } else if (data && data.total === 0 && !search) {
    body = (
      <EmptyState title="No clients yet" icon={<PeopleIcon />} action={newButton}>
        Clients get their quotes by e-mail and accept them online; they never need an account. Each client's contact details, billing address and
        jobs are kept here.
      </EmptyState>
    );
  } else if (data && data.items.length === 0) {
    body = (
      <div className="rounded-lg border border-dashed border-ink-200 bg-white px-4 py-8 text-center text-sm text-ink-600">
        {search ? (
          <p>
            No clients match “{search}”.{" "}
            <button type="button" onClick={() => update({ search: null })} className="font-medium text-copper-700 underline underline-offset-2">
              Clear the search
            </button>
          </p>
        ) : (
          <p>
            There is no page {page}.{" "}
            <button type="button" onClick={() => update({ page: 1 })} className="font-medium text-copper-700 underline underline-offset-2">
              Go to the first page
            </button>
          </p>
        )}
      </div>
    );
  } else if (data) {
    body = (
      <div className="space-y-3">
        {error ? <FormAlert message={`The list could not be refreshed. ${error.message}`} /> : null}
        <div className="overflow-x-auto rounded-lg border border-ink-100 bg-white">
          <table aria-busy={isPlaceholderData || undefined} className={cn("min-w-full text-left text-sm", isPlaceholderData && staleClass)}>
            <caption className="sr-only">Clients</caption>
            <thead className="border-b border-ink-100 bg-ink-50 text-xs font-semibold text-ink-500">
              <tr>
                <SortHeader label="Name" field="name" sort={sort} onSort={(s) => update({ sort: s })} />
                <PlainHeader>E-mail</PlainHeader>
                <PlainHeader>Phone</PlainHeader>
                <PlainHeader className="text-right">Jobs</PlainHeader>
                <SortHeader label="Added" field="createdAt" sort={sort} firstDirection="desc" onSort={(s) => update({ sort: s })} />
                {canWrite ? (
                  <th scope="col" className={cellClass}>
                    <span className="sr-only">Actions</span>
                  </th>
                ) : null}
              </tr>
            </thead>
            <tbody className="divide-y divide-ink-100">
              {data.items.map((client) => (
                <tr key={client.id}>
                  <th scope="row" id={`client-${client.id}`} className={`${cellClass} whitespace-nowrap font-medium text-ink-900`}>
                    {client.name}
                  </th>
                  <td className={`${cellClass} text-ink-700`}>{client.email ? <a href={`mailto:${client.email}`} className="hover:underline">{client.email}</a> : <span className="text-ink-400">—</span>}</td>
                  <td className={`${cellClass} whitespace-nowrap text-ink-700`}>{client.phone ?? <span className="text-ink-400">—</span>}</td>
                  <td className={`${cellClass} text-right tabular-nums`}>
                    {client.jobCount > 0 ? (
                      <Link to={paths.jobs.getHref(new URLSearchParams({ clientId: client.id }).toString())} aria-label={`${client.jobCount} ${client.jobCount === 1 ? "job" : "jobs"} for ${client.name}`} className="font-medium text-copper-700 hover:underline">
                        {client.jobCount}
                      </Link>
                    ) : (
                      <span className="text-ink-500">0</span>
                    )}
                  </td>
                  <td className={`${cellClass} whitespace-nowrap text-ink-700`}>{formatDate(client.createdAt)}</td>
                  {canWrite ? (
                    <td className={`${cellClass} whitespace-nowrap text-right`}>
                      <RowActions
                        describedBy={`client-${client.id}`}
                        onEdit={() => {
                          setAlert(null);
                          setEditing({ mode: "edit", client });
                        }}
                        onDelete={() => {
                          setAlert(null);
                          setDeleting(client);
                        }}
                      />
                    </td>
                  ) : null}
                </tr>
              ))}
            </tbody>
          </table>
        </div>
        <Pager page={page} pageSize={data.pageSize} total={data.total} noun={["client", "clients"]} busy={isPlaceholderData} onPage={(p) => update({ page: p })} />
      </div>
    );
  }

  const hasAny = Boolean(search) || (data?.total ?? 0) > 0;

  return (
    <div className="mt-6 space-y-4">
      <div className="flex flex-wrap items-center justify-between gap-3">
        {hasAny ? (
          <SearchInput
            label="Search clients"
            placeholder="Search by name, e-mail or phone"
            value={search}
            maxLength={JobLimits.searchMax}
            onSearch={(text) => update({ search: text }, { replace: true })}
            className="w-full sm:w-80"
          />
        ) : (
          <span />
        )}
        {hasAny ? newButton : null}
      </div>
      <FormAlert message={alert} />
      {body}

      {editing ? (
        <Dialog size="lg" closeButton title={editing.mode === "new" ? "New client" : `Edit ${editing.client.name}`} onClose={() => setEditing(null)}>
          <ClientForm client={editing.mode === "edit" ? editing.client : undefined} onSaved={() => setEditing(null)} onCancel={() => setEditing(null)} />
        </Dialog>
      ) : null}
      {deleting ? (
        <ConfirmDialog title={`Delete ${deleting.name}?`} confirmLabel="Delete client" pending={remove.isPending} onConfirm={confirmDelete} onCancel={() => setDeleting(null)}>
          {deleting.jobCount > 0
            ? `${deleting.name} has ${deleting.jobCount} ${deleting.jobCount === 1 ? "job" : "jobs"}. A client with jobs cannot be deleted: move or delete the jobs first.`
            : `${deleting.name}'s contact details are removed. This cannot be undone.`}
        </ConfirmDialog>
      ) : null}
    </div>
  );
}
