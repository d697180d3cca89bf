import { queryOptions, useQuery } from "@tanstack/react-query";
import { EstimatingSettingsSchema } from "../../../../shared/schemas/estimates";
import { apiRequest } from "../../../lib/api-client";

export const getEstimatingSettings = (signal?: AbortSignal) => apiRequest("/company/estimating", EstimatingSettingsSchema, { signal });

export const estimatingSettingsQueryOptions = () =>
  queryOptions({ queryKey: ["company", "estimating"], queryFn: ({ signal }) => getEstimatingSettings(signal) });

export const useEstimatingSettings = () => useQuery(estimatingSettingsQueryOptions());
