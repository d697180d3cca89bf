import { Link } from "react-router-dom";
import { JobLimits } from "../../../../shared/schemas/jobs";
import { EmptyState } from "../../../components/ui/empty-state";
import { controlClass, FormAlert } from "../../../components/ui/form";
import { RunIcon } from "../../../components/ui/icons";
import { paths } from "../../../config/paths";
import { cn } from "../../../utils/cn";
import { formatDate } from "../../../utils/format-date";
import { DEFAULT_JOB_SORT, JOB_SORT_FIELDS, useJobs, type JobListParams } from "../api/get-jobs";
import { sortValues, useListParams } from "../hooks/use-list-params";
import { isJobStatus, JOB_STATUS_LABELS, JOB_STATUSES, JobStatusBadge } from "./job-status";
import { Pager, PlainHeader, SearchInput, SortHeader, staleClass } from "../../../components/ui/list-controls";
import { LoadStatusLabel } from "../../../components/ui/load-status";
import { LoadFailed } from "../../../components/ui/load-failed";

const cellClass = "px-3 py-2 align-middle";
const SORTS = sortValues(JOB_SORT_FIELDS);
const UUID = /^[0-9a-f]{8}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{12}$/i;

/** The filters of the jobs list, read from the address: ?search=&status=&clientId=&sort=&page=. */
export function useJobListParams() {
  const list = useListParams({ sorts: SORTS, defaultSort: DEFAULT_JOB_SORT });
  const rawStatus = list.params.get("status");
  const status = isJobStatus(rawStatus) ? rawStatus : undefined;
  const rawClient = list.params.get("clientId");
  const clientId = rawClient && UUID.test(rawClient) ? rawClient : undefined;
  const query: JobListParams = {
    page: list.page,
    pageSize: JobLimits.pageSizeDefault,
    sort: list.sort,
    ...(list.search ? { search: list.search } : {}),
    ...(status ? { status } : {}),
    ...(clientId ? { clientId } : {}),
  };
  return { ...list, status, clientId, query };
}

/** The jobs table with its search, status filter, sortable headers and pages; every filter lives in the address. */
/** canCreate: the page offers "New job" (the empty state then points at it). */
export function JobsList({ canCreate = false }: { canCreate?: boolean }) {
  const { page, sort, search, status, clientId, query, update } = useJobListParams();
  const { data, error, isPending, isFetching, isPlaceholderData, refetch } = useJobs(query);
  const filtered = Boolean(search || status || clientId);
  const clientName = clientId ? data?.items.find((j) => j.client.id === clientId)?.client.name : undefined;

  let body;
  if (isPending) {
    body = <p className="text-sm text-ink-500">Loading jobs…</p>;
  } else if (error && !data) {
    body = (
      <LoadFailed message={`The jobs could not be loaded. ${error.message}`} retrying={isFetching} onRetry={() => void refetch()} />
    );
  } else if (data && data.total === 0 && !filtered) {
    body = (
      <EmptyState title="No jobs yet" icon={<RunIcon />}>
        A job holds the systems you lay out for a site — a battery bank, the cable runs and the loads — with the voltage at every load checked in
        every case. {canCreate ? "Start one with New job. " : ""}Jobs are listed here, the most recently changed first.
      </EmptyState>
    );
  } else if (data && data.items.length === 0) {
    body = (
      <div className="rounded-lg border border-dashed border-ink-200 bg-white px-4 py-8 text-center text-sm text-ink-600">
        {data.total === 0 ? (
          <p>
            No jobs match these filters.{" "}
            <button type="button" onClick={() => update({ search: null, status: null, clientId: null })} className="font-medium text-copper-700 underline underline-offset-2">
              Clear the filters
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
    const onSort = (next: string) => update({ sort: next });
    body = (
      <div className="space-y-3">
        {error ? <FormAlert message={`The list could not be refreshed. ${error.message}`} /> : null}
        <div className="overflow-x-auto rounded-lg border border-ink-100 bg-white">
          <table aria-busy={isPlaceholderData || undefined} className={cn("min-w-full text-left text-sm", isPlaceholderData && staleClass)}>
            <caption className="sr-only">Jobs</caption>
            <thead className="border-b border-ink-100 bg-ink-50 text-xs font-semibold text-ink-500">
              <tr>
                <SortHeader label="Title" field="title" sort={sort} onSort={onSort} />
                <SortHeader label="Client" field="client" sort={sort} onSort={onSort} />
                <PlainHeader>Site</PlainHeader>
                <SortHeader label="Status" field="status" sort={sort} onSort={onSort} />
                <PlainHeader className="text-right">Systems</PlainHeader>
                <PlainHeader>Load check</PlainHeader>
                <SortHeader label="Updated" field="updatedAt" sort={sort} firstDirection="desc" onSort={onSort} />
              </tr>
            </thead>
            <tbody className="divide-y divide-ink-100">
              {data.items.map((job) => (
                <tr key={job.id} className="hover:bg-ink-50/60">
                  <th scope="row" className={`${cellClass} min-w-48 font-medium`}>
                    <Link to={paths.job.getHref(job.id)} className="text-ink-900 underline-offset-2 hover:text-copper-700 hover:underline">
                      {job.title}
                    </Link>
                  </th>
                  <td className={`${cellClass} whitespace-nowrap text-ink-700`}>{job.client.name}</td>
                  <td className={`${cellClass} max-w-64 truncate text-ink-700`} title={job.siteAddress ?? undefined}>
                    {job.siteAddress ?? <span className="text-ink-400">—</span>}
                  </td>
                  <td className={cellClass}>
                    <JobStatusBadge status={job.status} />
                  </td>
                  <td className={`${cellClass} text-right tabular-nums text-ink-700`}>{job.systemCount}</td>
                  <td className={cellClass}>
                    <LoadStatusLabel status={job.worstStatus} emptyText={job.systemCount === 0 ? "No systems" : "Not solved"} />
                  </td>
                  <td className={`${cellClass} whitespace-nowrap text-ink-700`}>{formatDate(job.updatedAt)}</td>
                </tr>
              ))}
            </tbody>
          </table>
        </div>
        <Pager page={page} pageSize={data.pageSize} total={data.total} noun={["job", "jobs"]} busy={isPlaceholderData} onPage={(p) => update({ page: p })} />
      </div>
    );
  }

  return (
    <div className="mt-6 space-y-4">
      <div className="flex flex-wrap items-end gap-3">
        <SearchInput
          label="Search jobs"
          placeholder="Search by title, client or site"
          value={search}
          maxLength={JobLimits.searchMax}
          onSearch={(text) => update({ search: text }, { replace: true })}
          className="w-full sm:w-80"
        />
        <div className="flex items-center gap-2">
          <label htmlFor="jobs-status-filter" className="text-sm font-medium text-ink-800">
            Status
          </label>
          <select id="jobs-status-filter" value={status ?? ""} onChange={(event) => update({ status: event.target.value })} className={cn(controlClass, "w-auto")}>
            <option value="">All statuses</option>
            {JOB_STATUSES.map((s) => (
              <option key={s} value={s}>
                {JOB_STATUS_LABELS[s]}
              </option>
            ))}
          </select>
        </div>
        {clientId ? (
          <p className="flex items-center gap-2 rounded-full border border-copper-200 bg-copper-50 py-1 pr-1 pl-3 text-sm text-copper-800">
            {clientName ? `Client: ${clientName}` : "One client's jobs"}
            <button type="button" onClick={() => update({ clientId: null })} className="rounded-full px-2 py-0.5 text-xs font-medium hover:bg-copper-100">
              Show every client
            </button>
          </p>
        ) : null}
      </div>
      {body}
    </div>
  );
}
