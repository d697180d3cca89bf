import { queryOptions, useQuery } from "@tanstack/react-query";
import { JobLimits, LimitProfilePage } from "../../../../shared/schemas/jobs";
import { apiRequest } from "../../../lib/api-client";

/** The first page of the company's limit profiles by name: enough for the editor's picker (companies keep a handful). */
export const LIMIT_PROFILES_PATH = `/limit-profiles?sort=name&pageSize=${JobLimits.pageSizeMax}`;

export const getLimitProfiles = () => apiRequest(LIMIT_PROFILES_PATH, LimitProfilePage);

export const limitProfilesQueryOptions = () => queryOptions({ queryKey: ["limit-profiles", "picker"], queryFn: getLimitProfiles });

export const useLimitProfiles = () => useQuery(limitProfilesQueryOptions());
