import { queryOptions, useQuery } from "@tanstack/react-query";
import { DashboardSchema } from "../../../../shared/schemas/estimates";
import { apiRequest } from "../../../lib/api-client";

export const getDashboard = (signal?: AbortSignal) => apiRequest("/dashboard", DashboardSchema, { signal });

export const dashboardKey = ["dashboard"] as const;

export const dashboardQueryOptions = () => queryOptions({ queryKey: dashboardKey, queryFn: ({ signal }) => getDashboard(signal) });

export const useDashboard = () => useQuery(dashboardQueryOptions());
