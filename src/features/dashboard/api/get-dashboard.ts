import { queryOptions, useQuery } from "@tanstack/react-query";
import { DashboardSchema } from "../../../../shared/schemas/estimates";
import { apiRequest } from "../../../lib/api-client";

export const getDashboard = (signal?: AbortSignal) => apiRequest("/dashboard", DashboardSchema, { signal });

export const dashboardKey = ["dashboard"] as const;

// staleTime 0: clients open, accept and pay quotes from their own browsers; fetch again each time the dashboard opens.
export const dashboardQueryOptions = () => queryOptions({ queryKey: dashboardKey, queryFn: ({ signal }) => getDashboard(signal), staleTime: 0 });

export const useDashboard = () => useQuery(dashboardQueryOptions());
