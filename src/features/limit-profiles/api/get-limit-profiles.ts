import { keepPreviousData, queryOptions, useQuery } from "@tanstack/react-query";
import { LimitProfilePage } from "../../../../shared/schemas/jobs";
import { apiRequest } from "../../../lib/api-client";

export interface LimitProfileListParams {
  page: number;
  pageSize: number;
  /** name | updatedAt, "-" in front for descending. */
  sort: string;
}

/** Always in this order: page, pageSize, sort. */
export const limitProfileListQueryString = ({ page, pageSize, sort }: LimitProfileListParams) =>
  new URLSearchParams({ page: String(page), pageSize: String(pageSize), sort }).toString();

export const getLimitProfiles = (params: LimitProfileListParams, signal?: AbortSignal) =>
  apiRequest(`/limit-profiles?${limitProfileListQueryString(params)}`, LimitProfilePage, { signal });

/** The prefix of every limit profile list's key. */
export const limitProfileListsKey = ["limit-profiles", "list"] as const;

export const limitProfilesQueryOptions = (params: LimitProfileListParams) =>
  queryOptions({
    queryKey: [...limitProfileListsKey, params],
    queryFn: ({ signal }) => getLimitProfiles(params, signal),
    placeholderData: keepPreviousData,
  });

export const useLimitProfiles = (params: LimitProfileListParams) => useQuery(limitProfilesQueryOptions(params));

/** A company has a handful of profiles: one page of 100 by name holds them (the screen and the system form share it). */
export const ALL_LIMIT_PROFILES: LimitProfileListParams = { page: 1, pageSize: 100, sort: "name" };
