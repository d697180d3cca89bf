import { useMutation, useQueryClient } from "@tanstack/react-query";
import { EstimateLimits, EstimatingSettingsSchema, type EstimatingSettings } from "../../../../shared/schemas/estimates";
import { apiUpload } from "../../../lib/api-client";
import { estimatingSettingsQueryOptions } from "./get-estimating-settings";

/** The logo as the browser loads it; `version` changes after an upload so the new image is fetched, not the cached one. */
export const logoHref = (version: string | number) => `/api/company/logo?v=${encodeURIComponent(String(version))}`;

export const LOGO_TYPES = ["image/png", "image/jpeg"] as const;
export const LOGO_TOO_LARGE_MESSAGE = `This image is larger than ${EstimateLimits.logoMaxBytes / 1024} KB, the most a logo can be.`;
export const LOGO_WRONG_TYPE_MESSAGE = "A logo must be a PNG or JPEG image.";

/** Why a logo would be refused before it is sent (null when it may go). The server checks the content and has the last word. */
export function logoProblem(file: Pick<File, "size" | "type">): string | null {
  if (file.type && !(LOGO_TYPES as readonly string[]).includes(file.type)) return LOGO_WRONG_TYPE_MESSAGE;
  if (file.size > EstimateLimits.logoMaxBytes) return LOGO_TOO_LARGE_MESSAGE;
  return null;
}

/** Words for a refusal whose body was not ours (a proxy's 413 page, say). */
const STATUS_MESSAGES: Record<number, string> = { 413: LOGO_TOO_LARGE_MESSAGE, 415: LOGO_WRONG_TYPE_MESSAGE };

/** POST /api/company/logo, multipart field "file" (Owner only). */
export async function uploadLogo(file: File): Promise<EstimatingSettings> {
  const form = new FormData();
  form.append("file", file, file.name);
  return apiUpload("/company/logo", form, EstimatingSettingsSchema, STATUS_MESSAGES);
}

export function useUploadLogo() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: uploadLogo,
    onSuccess: (settings) => queryClient.setQueryData(estimatingSettingsQueryOptions().queryKey, settings),
  });
}
