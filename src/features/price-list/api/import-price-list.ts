import { useMutation, useQueryClient } from "@tanstack/react-query";
import { PriceImportPreview } from "../../../../shared/schemas/estimates";
import { apiUpload } from "../../../lib/api-client";
import { priceListQueryOptions } from "./get-price-list";

/** The list as CSV (a plain download link: the browser sends the session cookie). Money in major units ("12.50"). */
export const PRICE_LIST_EXPORT_HREF = "/api/price-list/export.csv";

const importHref = (apply: boolean) => `/api/price-list/import.csv${apply ? "?apply=1" : ""}`;

/**
 * Sends the CSV as multipart (field "file"). Without `apply` the server only says what the file
 * would add and change; with it the server writes every row or none. Multipart, so not through
 * apiRequest (which sends JSON); the CSRF header goes on it all the same. Bad rows reject with
 * an ApiError whose details.rows lists them (read them with csvRowErrors()).
 */
export async function importPriceList({ file, apply }: { file: File; apply: boolean }): Promise<PriceImportPreview> {
  const form = new FormData();
  form.append("file", file, file.name);
  return apiUpload(importHref(apply).replace(/^\/api/, ""), form, PriceImportPreview);
}

/** importPriceList; once an import is applied the list is read again. */
export function useImportPriceList() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: importPriceList,
    onSuccess: (result) => {
      if (result.applied) return queryClient.invalidateQueries({ queryKey: priceListQueryOptions().queryKey });
    },
  });
}
