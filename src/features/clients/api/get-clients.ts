import { keepPreviousData, queryOptions, useQuery } from "@tanstack/react-query";
import { ClientPage } from "../../../../shared/schemas/jobs";
import { apiRequest } from "../../../lib/api-client";

export const CLIENT_SORT_FIELDS = ["name", "createdAt", "updatedAt"] as const;
export const DEFAULT_CLIENT_SORT = "name";

export interface ClientListParams {
  page: number;
  pageSize: number;
  sort: string;
  search?: string;
}

/** Always in this order: page, pageSize, sort, then search when set. */
export function clientListQueryString({ page, pageSize, sort, search }: ClientListParams): string {
  const query = new URLSearchParams({ page: String(page), pageSize: String(pageSize), sort });
  if (search) query.set("search", search);
  return query.toString();
}

export const getClients = (params: ClientListParams, signal?: AbortSignal) => apiRequest(`/clients?${clientListQueryString(params)}`, ClientPage, { signal });

/** The prefix of every client list's key. */
export const clientListsKey = ["clients", "list"] as const;

export const clientsQueryOptions = (params: ClientListParams) =>
  queryOptions({
    queryKey: [...clientListsKey, params],
    queryFn: ({ signal }) => getClients(params, signal),
    placeholderData: keepPreviousData,
  });

export const useClients = (params: ClientListParams) => useQuery(clientsQueryOptions(params));

/** The clients a job form offers: the first 100 by name (the most one page holds). */
export const CLIENT_CHOICES: ClientListParams = { page: 1, pageSize: 100, sort: "name" };
