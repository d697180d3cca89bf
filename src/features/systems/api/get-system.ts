import { queryOptions, useQuery } from "@tanstack/react-query";
import { SystemRecordSchema } from "../../../../shared/schemas/jobs";
import { apiRequest } from "../../../lib/api-client";

export const getSystem = (systemId: string) => apiRequest(`/systems/${encodeURIComponent(systemId)}`, SystemRecordSchema);

export const systemQueryOptions = (systemId: string) => queryOptions({ queryKey: ["systems", systemId], queryFn: () => getSystem(systemId) });

export const useSystem = (systemId: string) => useQuery(systemQueryOptions(systemId));
