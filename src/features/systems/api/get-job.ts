import { queryOptions, useQuery } from "@tanstack/react-query";
import { JobDetailSchema } from "../../../../shared/schemas/jobs";
import { apiRequest } from "../../../lib/api-client";

// The System editor needs only the job's title (for the way back); the detail is what the API has.
export const getJob = (jobId: string) => apiRequest(`/jobs/${encodeURIComponent(jobId)}`, JobDetailSchema);

export const jobQueryOptions = (jobId: string) => queryOptions({ queryKey: ["jobs", jobId], queryFn: () => getJob(jobId) });

export const useJob = (jobId: string) => useQuery(jobQueryOptions(jobId));
