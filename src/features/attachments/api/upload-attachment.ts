import { useQueryClient } from "@tanstack/react-query";
import { useCallback } from "react";
import { CSRF_HEADER } from "../../../../shared/http";
import { ApiErrorBody } from "../../../../shared/schemas/error";
import { AttachmentSchema, type Attachment } from "../../../../shared/schemas/jobs";
import { ApiError } from "../../../lib/api-client";
import { jobQueryOptions } from "../../jobs/api/get-job";
import { jobListsKey } from "../../jobs/api/get-jobs";
import { TOO_LARGE_MESSAGE, WRONG_TYPE_MESSAGE } from "../utils/check-file";

export interface UploadAttachmentOptions {
  jobId: string;
  file: File;
  /** Bytes sent so far of the whole request (the file plus a little multipart framing). */
  onProgress?: (loaded: number, total: number) => void;
  signal?: AbortSignal;
}

/** Words for a refusal whose body was not ours (a proxy's 413 page, say). */
const STATUS_MESSAGES: Record<number, string> = { 413: TOO_LARGE_MESSAGE, 415: WRONG_TYPE_MESSAGE };

/**
 * Sends one file as multipart/form-data (field "file") to POST /api/jobs/:jobId/attachments.
 * XMLHttpRequest rather than fetch: only it reports upload progress. Rejects with an ApiError
 * carrying the server's code and message (413 payload_too_large, 415 unsupported_media_type),
 * or a DOMException "AbortError" when the signal aborts.
 */
export function uploadAttachment({ jobId, file, onProgress, signal }: UploadAttachmentOptions): Promise<Attachment> {
  return new Promise((resolve, reject) => {
    if (signal?.aborted) {
      reject(new DOMException("The upload was cancelled.", "AbortError"));
      return;
    }
    const xhr = new XMLHttpRequest();
    xhr.open("POST", `/api/jobs/${encodeURIComponent(jobId)}/attachments`);
    xhr.withCredentials = true;
    xhr.responseType = "text";
    xhr.setRequestHeader(CSRF_HEADER, "1");
    xhr.setRequestHeader("Accept", "application/json");

    const onAbort = () => xhr.abort();
    signal?.addEventListener("abort", onAbort, { once: true });
    const done = () => signal?.removeEventListener("abort", onAbort);

    xhr.upload.addEventListener("progress", (event) => {
      if (event.lengthComputable) onProgress?.(event.loaded, event.total);
    });
    xhr.addEventListener("load", () => {
      done();
      let payload: unknown;
      try {
        payload = xhr.responseText ? JSON.parse(xhr.responseText) : undefined;
      } catch {
        payload = undefined;
      }
      if (xhr.status >= 200 && xhr.status < 300) {
        const parsed = AttachmentSchema.safeParse(payload);
        if (parsed.success) resolve(parsed.data);
        else reject(new ApiError(xhr.status, "unexpected_response", "The server's answer was not understood."));
        return;
      }
      const error = ApiErrorBody.safeParse(payload);
      if (error.success) {
        const { code, message, details } = error.data.error;
        reject(new ApiError(xhr.status, code, message, details));
      } else {
        reject(new ApiError(xhr.status, "unexpected_response", STATUS_MESSAGES[xhr.status] ?? `The server answered ${xhr.status}.`));
      }
    });
    xhr.addEventListener("error", () => {
      done();
      reject(new ApiError(0, "network_error", "The server could not be reached. Check the connection and try again."));
    });
    xhr.addEventListener("abort", () => {
      done();
      reject(new DOMException("The upload was cancelled.", "AbortError"));
    });

    const body = new FormData();
    body.append("file", file, file.name);
    xhr.send(body);
  });
}

/** uploadAttachment, then the job page (its attachment list) and the job lists are refreshed. */
export function useUploadAttachment(jobId: string) {
  const queryClient = useQueryClient();
  return useCallback(
    async (options: Omit<UploadAttachmentOptions, "jobId">) => {
      const attachment = await uploadAttachment({ ...options, jobId });
      void queryClient.invalidateQueries({ queryKey: jobListsKey });
      // Resolves once the job page has its new list, so the file moves from "uploading" straight into the grid.
      await queryClient.invalidateQueries({ queryKey: jobQueryOptions(jobId).queryKey });
      return attachment;
    },
    [queryClient, jobId],
  );
}
