import { keepPreviousData, queryOptions, useQuery } from "@tanstack/react-query";
import { JobLimits, JobPage, type JobStatus } from "../../../../shared/schemas/jobs";
import { apiRequest } from "../../../lib/api-client";

export const JOB_SORT_FIELDS = ["title", "client", "status", "createdAt", "updatedAt"] as const;
export const DEFAULT_JOB_SORT = "-updatedAt";

export interface JobListParams {
  page: number;
  pageSize: number;
  /** A field of JOB_SORT_FIELDS, "-" in front for descending. */
  sort: string;
  search?: string;
  status?: JobStatus;
  clientId?: string;
}

/**
 * The query string, always in this order: page, pageSize, sort, then search, status and
 * clientId when set (e.g. "page=2&pageSize=25&sort=-updatedAt&search=cabin&status=won").
 */
export function jobListQueryString({ page, pageSize, sort, search, status, clientId }: JobListParams): string {
  const query = new URLSearchParams({ page: String(page), pageSize: String(pageSize), sort });
  if (search) query.set("search", search);
  if (status) query.set("status", status);
  if (clientId) query.set("clientId", clientId);
  return query.toString();
}

export const getJobs = (params: JobListParams, signal?: AbortSignal) => apiRequest(`/jobs?${jobListQueryString(params)}`, JobPage, { signal });

/** The prefix of every job list's key: invalidate it after any change to a job. */
export const jobListsKey = ["jobs", "list"] as const;

export const jobsQueryOptions = (params: JobListParams) =>
  queryOptions({
    queryKey: [...jobListsKey, params],
    queryFn: ({ signal }) => getJobs(params, signal),
    // The page on screen stays while the next page or filter loads.
    placeholderData: keepPreviousData,
  });

export const useJobs = (params: JobListParams) => useQuery(jobsQueryOptions(params));

export const defaultJobPageSize = JobLimits.pageSizeDefault;
