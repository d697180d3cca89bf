import { useMutation, useQueryClient } from "@tanstack/react-query";
import { CompanySettingsSchema, type UpdateCompanyInput } from "../../../../shared/schemas/company";
import { apiRequest } from "../../../lib/api-client";
import { companyQueryOptions } from "./get-company";

// Owner only. Any subset of the settings; the answer is the whole record.
export const updateCompany = (patch: UpdateCompanyInput) => apiRequest("/company", CompanySettingsSchema, { method: "PATCH", body: patch });

export function useUpdateCompany() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: updateCompany,
    onSuccess: (company) => queryClient.setQueryData(companyQueryOptions().queryKey, company),
  });
}
