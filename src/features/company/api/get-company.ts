import { queryOptions, useQuery } from "@tanstack/react-query";
import { CompanySettingsSchema } from "../../../../shared/schemas/company";
import { apiRequest } from "../../../lib/api-client";

export const getCompany = () => apiRequest("/company", CompanySettingsSchema);

export const companyQueryOptions = () => queryOptions({ queryKey: ["company"], queryFn: getCompany });

export const useCompany = () => useQuery(companyQueryOptions());
