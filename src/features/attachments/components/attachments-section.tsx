import { useRef, useState, type DragEvent } from "react";
import type { Attachment } from "../../../../shared/schemas/jobs";
import { ConfirmDialog } from "../../../components/ui/confirm-dialog";
import { dangerButtonClass, FormAlert, secondaryButtonClass } from "../../../components/ui/form";
import { ApiError } from "../../../lib/api-client";
import { cn } from "../../../utils/cn";
import { formatDate } from "../../../utils/format-date";
import { useDeleteAttachment } from "../api/delete-attachment";
import { useUploadAttachment } from "../api/upload-attachment";
import { ATTACHMENT_ACCEPT, downloadHref, fileProblem, formatBytes } from "../utils/check-file";

interface Upload {
  key: number;
  file: File;
  /** 0 … 1 of the request sent. */
  progress: number;
  state: "uploading" | "failed";
  error?: string;
  cancel?: () => void;
}

function DocumentIcon() {
  return (
    <svg viewBox="0 0 24 24" width="36" height="36" fill="none" stroke="currentColor" strokeWidth={1.5} strokeLinecap="round" strokeLinejoin="round" aria-hidden="true">
      <path d="M6 2.5h8l4.5 4.5v14.5H6z" />
      <path d="M14 2.5V7h4.5M9 12h6M9 15h6M9 18h4" />
    </svg>
  );
}

function UploadRow({ upload, onDismiss }: { upload: Upload; onDismiss: () => void }) {
  const percent = Math.round(upload.progress * 100);
  return (
    <li className="flex flex-wrap items-center gap-x-3 gap-y-1 px-3 py-2 text-sm">
      <span className="min-w-0 flex-1 truncate font-medium text-ink-900">{upload.file.name}</span>
      <span className="tabular-nums text-ink-500">{formatBytes(upload.file.size)}</span>
      {upload.state === "uploading" ? (
        <>
          <progress aria-label={`Uploading ${upload.file.name}`} max={100} value={percent} className="h-2 w-32 accent-copper-500" />
          <span className="w-10 text-right tabular-nums text-ink-600">{percent} %</span>
          {upload.cancel ? (
            <button type="button" onClick={upload.cancel} aria-label={`Cancel uploading ${upload.file.name}`} className={secondaryButtonClass}>
              Cancel
            </button>
          ) : null}
        </>
      ) : (
        <>
          <p role="alert" className="flex w-full gap-1 text-xs font-medium text-over-700 sm:order-last">
            <span aria-hidden="true">✕</span>
            <span>
              {upload.file.name} was not added. {upload.error}
            </span>
          </p>
          <button type="button" onClick={onDismiss} aria-label={`Dismiss ${upload.file.name}`} className={secondaryButtonClass}>
            Dismiss
          </button>
        </>
      )}
    </li>
  );
}

function AttachmentCard({ attachment, canWrite, onDelete }: { attachment: Attachment; canWrite: boolean; onDelete: () => void }) {
  const nameId = `attachment-${attachment.id}`;
  const isImage = attachment.mediaType !== "application/pdf";
  return (
    <li className="flex flex-col overflow-hidden rounded-lg border border-ink-100 bg-white">
      <a href={attachment.url} target="_blank" rel="noreferrer" aria-label={`Open ${attachment.fileName}`} className="block bg-ink-50">
        {isImage ? (
          <img src={attachment.url} alt={attachment.fileName} loading="lazy" className="h-36 w-full object-cover" />
        ) : (
          <div className="flex h-36 w-full flex-col items-center justify-center gap-1 text-ink-500">
            <DocumentIcon />
            <span className="text-xs font-semibold uppercase tracking-wide">PDF</span>
          </div>
        )}
      </a>
      <div className="flex flex-1 flex-col gap-1 p-3 text-sm">
        <p id={nameId} className="break-words font-medium text-ink-900">
          {attachment.fileName}
        </p>
        <p className="text-xs text-ink-500">
          <span className="tabular-nums">{formatBytes(attachment.sizeBytes)}</span> · {formatDate(attachment.createdAt)}
          {attachment.uploadedBy ? ` · ${attachment.uploadedBy.name}` : ""}
        </p>
        <div className="mt-auto flex flex-wrap gap-2 pt-2">
          <a href={downloadHref(attachment.url)} download={attachment.fileName} aria-describedby={nameId} className={secondaryButtonClass}>
            Download
          </a>
          {canWrite ? (
            <button type="button" onClick={onDelete} aria-describedby={nameId} className={dangerButtonClass}>
              Delete
            </button>
          ) : null}
        </div>
      </div>
    </li>
  );
}

interface AttachmentsSectionProps {
  jobId: string;
  /** Newest first, as the job page has them. */
  attachments: Attachment[];
  /** May add and delete (Owner, Estimator). */
  canWrite: boolean;
}

/** "Site photos and plans": a drop zone with per-file progress, and the job's files as thumbnails. */
export function AttachmentsSection({ jobId, attachments, canWrite }: AttachmentsSectionProps) {
  const upload = useUploadAttachment(jobId);
  const remove = useDeleteAttachment(jobId);
  const [uploads, setUploads] = useState<Upload[]>([]);
  const [dragging, setDragging] = useState(false);
  const [deleting, setDeleting] = useState<Attachment | null>(null);
  const [alert, setAlert] = useState<string | null>(null);
  const nextKey = useRef(1);
  const dragDepth = useRef(0);
  const input = useRef<HTMLInputElement>(null);

  const patch = (key: number, change: Partial<Upload>) => setUploads((list) => list.map((u) => (u.key === key ? { ...u, ...change } : u)));
  const drop = (key: number) => setUploads((list) => list.filter((u) => u.key !== key));

  const addFiles = (files: Iterable<File>) => {
    for (const file of files) {
      const key = nextKey.current++;
      const problem = fileProblem(file);
      if (problem) {
        setUploads((list) => [...list, { key, file, progress: 0, state: "failed", error: problem }]);
        continue;
      }
      const controller = new AbortController();
      setUploads((list) => [...list, { key, file, progress: 0, state: "uploading", cancel: () => controller.abort() }]);
      upload({ file, signal: controller.signal, onProgress: (loaded, total) => patch(key, { progress: total > 0 ? loaded / total : 0 }) }).then(
        () => drop(key),
        (error: unknown) => {
          if (error instanceof DOMException && error.name === "AbortError") drop(key);
          else patch(key, { state: "failed", cancel: undefined, error: error instanceof ApiError || error instanceof Error ? error.message : "The upload failed." });
        },
      );
    }
  };

  const onDragEnter = (event: DragEvent) => {
    if (!event.dataTransfer.types.includes("Files")) return;
    event.preventDefault();
    dragDepth.current += 1;
    setDragging(true);
  };
  const onDragLeave = () => {
    dragDepth.current = Math.max(0, dragDepth.current - 1);
    if (dragDepth.current === 0) setDragging(false);
  };
  const onDrop = (event: DragEvent) => {
    event.preventDefault();
    dragDepth.current = 0;
    setDragging(false);
    addFiles(event.dataTransfer.files);
  };

  const confirmDelete = () => {
    if (!deleting) return;
    setAlert(null);
    remove.mutate(deleting.id, {
      onSuccess: () => setDeleting(null),
      onError: (error) => {
        setDeleting(null);
        setAlert(error.message);
      },
    });
  };

  return (
    <section aria-labelledby="attachments-heading" className="space-y-4">
      <div>
        <h2 id="attachments-heading" className="text-base font-semibold text-ink-900">
          Site photos and plans
        </h2>
        <p className="mt-1 text-sm text-ink-500">Photos of the site, panel and cable routes, and drawings: JPEG, PNG or PDF, up to 10 MB each.</p>
      </div>

      {canWrite ? (
        <div
          onDragEnter={onDragEnter}
          onDragOver={(event) => {
            if (event.dataTransfer.types.includes("Files")) event.preventDefault();
          }}
          onDragLeave={onDragLeave}
          onDrop={onDrop}
          data-dragging={dragging || undefined}
          className={cn(
            "flex flex-col items-center justify-center gap-2 rounded-lg border-2 border-dashed px-4 py-6 text-center text-sm transition-colors",
            dragging ? "border-copper-500 bg-copper-50 text-copper-800" : "border-ink-200 bg-white text-ink-600",
          )}
        >
          <svg viewBox="0 0 24 24" width="28" height="28" fill="none" stroke="currentColor" strokeWidth={1.6} strokeLinecap="round" strokeLinejoin="round" aria-hidden="true" className="text-copper-600">
            <path d="M12 16V4M7 9l5-5 5 5M4 16v4h16v-4" />
          </svg>
          <p>
            {dragging ? (
              "Release to add these files"
            ) : (
              <>
                Drop files here or{" "}
                <button type="button" onClick={() => input.current?.click()} className="font-medium text-copper-700 underline underline-offset-2 hover:text-copper-800">
                  choose files
                </button>
              </>
            )}
          </p>
          <label className="sr-only" htmlFor={`attachment-input-${jobId}`}>
            Add files
          </label>
          <input
            ref={input}
            id={`attachment-input-${jobId}`}
            type="file"
            multiple
            accept={ATTACHMENT_ACCEPT}
            className="sr-only"
            onChange={(event) => {
              const files = event.target.files ? [...event.target.files] : [];
              // Cleared so the same file can be chosen again after a failure.
              event.target.value = "";
              addFiles(files);
            }}
          />
        </div>
      ) : null}

      {uploads.length > 0 ? (
        <ul aria-label="Uploads" className="divide-y divide-ink-100 rounded-lg border border-ink-100 bg-white">
          {uploads.map((u) => (
            <UploadRow key={u.key} upload={u} onDismiss={() => drop(u.key)} />
          ))}
        </ul>
      ) : null}

      <FormAlert message={alert} />

      {attachments.length === 0 ? (
        <p className="rounded-lg border border-dashed border-ink-200 bg-white px-4 py-6 text-center text-sm text-ink-500">
          {canWrite ? "No photos or plans yet. Files you add show here for everyone on the job, installers included." : "No photos or plans have been added to this job."}
        </p>
      ) : (
        <ul aria-label="Attachments" className="grid grid-cols-1 gap-3 sm:grid-cols-2 lg:grid-cols-3 xl:grid-cols-4">
          {attachments.map((a) => (
            <AttachmentCard key={a.id} attachment={a} canWrite={canWrite} onDelete={() => setDeleting(a)} />
          ))}
        </ul>
      )}

      {deleting ? (
        <ConfirmDialog title={`Delete ${deleting.fileName}?`} confirmLabel="Delete" pending={remove.isPending} onConfirm={confirmDelete} onCancel={() => setDeleting(null)}>
          The file is removed from this job for everyone. This cannot be undone.
        </ConfirmDialog>
      ) : null}
    </section>
  );
}
