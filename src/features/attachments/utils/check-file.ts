import { JobLimits } from "../../../../shared/schemas/jobs";

export const ATTACHMENT_TYPES = ["image/jpeg", "image/png", "application/pdf"] as const;
export const ATTACHMENT_ACCEPT = ATTACHMENT_TYPES.join(",");

export const TOO_LARGE_MESSAGE = "This file is larger than 10 MB, the most one attachment can be.";
export const WRONG_TYPE_MESSAGE = "This file type cannot be attached: only JPEG, PNG or PDF files.";

/**
 * Why a file would be refused, before it is sent (null when it may go). The server checks
 * the content itself and has the last word: a file whose type the browser does not know is sent.
 */
export function fileProblem(file: Pick<File, "size" | "type">): string | null {
  if (file.size > JobLimits.attachmentMaxBytes) return TOO_LARGE_MESSAGE;
  if (file.type && !(ATTACHMENT_TYPES as readonly string[]).includes(file.type)) return WRONG_TYPE_MESSAGE;
  return null;
}

/** 2 048 → "2 KB", 3 407 872 → "3.3 MB" (1 KB = 1 024 bytes, as the 10 MB limit). */
export function formatBytes(bytes: number): string {
  if (bytes < 1024) return `${bytes} B`;
  if (bytes < 1024 * 1024) return `${Math.max(1, Math.round(bytes / 1024))} KB`;
  const mb = bytes / (1024 * 1024);
  return `${mb < 10 ? mb.toFixed(1) : Math.round(mb)} MB`;
}

/** The attachment's address with ?download=1 (a save-as rather than the browser's viewer). */
export function downloadHref(url: string): string {
  return `${url}${url.includes("?") ? "&" : "?"}download=1`;
}
