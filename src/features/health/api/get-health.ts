import { queryOptions, useQuery } from "@tanstack/react-query";
import { HealthStatus } from "../../../../shared/schemas/health";
import { apiRequest } from "../../../lib/api-client";

// 503 still carries a HealthStatus body (db "down"), so it is an answer, not an error.
export const getHealth = () => apiRequest("/health", HealthStatus, { acceptStatuses: [503] });

export const healthQueryOptions = () =>
  queryOptions({ queryKey: ["health"], queryFn: getHealth, refetchInterval: 30_000, staleTime: 10_000 });

export const useHealth = () => useQuery(healthQueryOptions());
