import path from "node:path";
import { fileTypeFromBuffer } from "file-type";
import type { DataSource } from "typeorm";
import type { z } from "zod";
import { JobLimits, type AttachmentListQuery } from "../../shared/schemas/jobs.js";
import { Attachment, Job } from "../db/entities/index.js";
import { AppError } from "../errors.js";
import { checkImage, imageTypeOf, PHOTO_IMAGES } from "../images.js";
import { likePattern, pageAndSort, type Page } from "./paging.js";
import { companyScope } from "./tenancy.js";

type Accepted = "image/jpeg" | "image/png" | "application/pdf";
const ACCEPTED = new Set<string>(["image/jpeg", "image/png", "application/pdf"]);
/** The extensions a stored name may end in, by type; the first is added when the name has none of them. */
const EXTENSIONS: Record<Accepted, string[]> = { "application/pdf": [".pdf"], "image/png": [".png"], "image/jpeg": [".jpg", ".jpeg", ".jpe", ".jfif"] };

// Characters that change how a name is shown rather than what it says: the bidirectional controls
// (U+202E "RIGHT-TO-LEFT OVERRIDE" makes "photo\u202Egnp.exe" read as "photoexe.png"), the
// Arabic letter mark and the byte-order mark.
const INVISIBLE = /[\u061c\u200e\u200f\u202a-\u202e\u2066-\u2069\ufeff]/g;

/**
 * The name to keep: no folders, no control or direction-changing characters, at most 255
 * characters, never empty, and ending in an extension of the type the bytes are — so a download
 * never opens as something else (a PNG named "plan.html" or "run.bat" is kept as "plan.html.png").
 */
export function safeFileName(original: string | undefined, mediaType: string): string {
  // Browsers send the base name, but a hand-made request can send "../../etc/passwd" or "C:\x\y".
  const base = path.posix.basename((original ?? "").replace(/\\/g, "/"));
  let name = base
    .replace(INVISIBLE, "")
    .replace(/[\u0000-\u001f\u007f-\u009f"<>|:*?]/g, "_")
    .replace(/^\.+/, "")
    .trim();
  const extensions = EXTENSIONS[mediaType as Accepted] ?? [];
  const extension = extensions[0] ?? "";
  if (name === "") name = `attachment${extension}`;
  else if (!extensions.some((e) => name.toLowerCase().endsWith(e))) name = `${name}${extension}`;
  // Cut by code points, so an emoji or an accented letter is never split in half.
  const points = Array.from(name);
  if (points.length > JobLimits.fileNameMax) name = points.slice(0, JobLimits.fileNameMax - extension.length).join("") + extension;
  return name;
}

// Compressed containers are named from their first bytes and never handed to a type sniffer:
// file-type opens ZIP entries and gzip streams to tell what is inside (a bomb would be inflated).
const CONTAINERS: Array<[number[], string]> = [
  [[0x50, 0x4b, 0x03, 0x04], "application/zip"],
  [[0x50, 0x4b, 0x05, 0x06], "application/zip"],
  [[0x50, 0x4b, 0x07, 0x08], "application/zip"],
  [[0x1f, 0x8b], "application/gzip"],
];

/** What a refused file is, for the message: from its first 4 KB only, never decompressing it. */
async function nameOfRefused(bytes: Buffer): Promise<string | null> {
  const container = CONTAINERS.find(([magic]) => magic.every((b, i) => bytes[i] === b));
  if (container) return container[1];
  return (await fileTypeFromBuffer(bytes.subarray(0, 4100)))?.mime ?? null;
}

/**
 * The media type from the file's own bytes (its signature); the name and the browser's claim are
 * not trusted. Only a file that starts like a JPEG, PNG or PDF is looked at further; an image whose
 * header claims absurd dimensions is refused (browsers decode the thumbnails).
 */
export async function detectMediaType(bytes: Buffer): Promise<Accepted> {
  const starts = imageTypeOf(bytes) ?? (bytes.subarray(0, 5).toString("latin1") === "%PDF-" ? "application/pdf" : null);
  const type = starts ? await fileTypeFromBuffer(bytes) : null;
  if (!type || !ACCEPTED.has(type.mime)) {
    const what = type?.mime ?? (await nameOfRefused(bytes));
    throw new AppError("unsupported_media_type", `file: only JPEG, PNG or PDF files can be attached${what ? ` (this file is ${what})` : ""}`, { field: "file" });
  }
  if (type.mime !== "application/pdf") checkImage(bytes, PHOTO_IMAGES);
  return type.mime as Accepted;
}

export async function addAttachment(db: DataSource, companyId: string, userId: string, jobId: string, file: { buffer: Buffer; originalname?: string } | undefined): Promise<Attachment> {
  // An unknown job is a 404 whatever was sent.
  await companyScope(db.manager, companyId).mustFind(Job, { id: jobId }, "Job");
  if (!file) throw new AppError("invalid_input", 'file: choose a file to upload (multipart field "file")', { field: "file" });
  if (file.buffer.length === 0) throw new AppError("invalid_input", "file: the file is empty", { field: "file" });
  const mediaType = await detectMediaType(file.buffer);
  const id = await db.transaction(async (tx) => {
    await companyScope(tx, companyId).mustFind(Job, { id: jobId }, "Job", true);
    const saved = await tx.save(
      tx.create(Attachment, {
        companyId,
        jobId,
        fileName: safeFileName(file.originalname, mediaType),
        mediaType,
        sizeBytes: file.buffer.length,
        content: file.buffer,
        uploadedById: userId,
      }),
    );
    await tx.update(Job, { id: jobId }, { updatedAt: new Date() });
    return saved.id;
  });
  return getAttachment(db, companyId, id);
}

export async function getAttachment(db: DataSource, companyId: string, id: string): Promise<Attachment> {
  await companyScope(db.manager, companyId).mustFind(Attachment, { id }, "Attachment");
  return (await db.getRepository(Attachment).findOne({ where: { id, companyId }, relations: { uploadedBy: true } }))!;
}

export async function listAttachments(db: DataSource, companyId: string, jobId: string, query: z.output<typeof AttachmentListQuery>): Promise<Page<Attachment>> {
  await companyScope(db.manager, companyId).mustFind(Job, { id: jobId }, "Job");
  const qb = db
    .getRepository(Attachment)
    .createQueryBuilder("a")
    .leftJoinAndSelect("a.uploadedBy", "u")
    .where("a.company_id = :companyId AND a.job_id = :jobId", { companyId, jobId });
  if (query.search) qb.andWhere("a.file_name ILIKE :search", { search: likePattern(query.search) });
  const [items, total] = await pageAndSort(qb, query, { fileName: "LOWER(a.file_name)", createdAt: "a.created_at", sizeBytes: "a.size_bytes" }, "a.id").getManyAndCount();
  return { items, total, page: query.page, pageSize: query.pageSize };
}

/** The stored bytes with the name and type to send them under. */
export async function readAttachment(db: DataSource, companyId: string, id: string): Promise<Attachment> {
  const row = await db
    .getRepository(Attachment)
    .createQueryBuilder("a")
    .addSelect("a.content")
    .where("a.id = :id AND a.company_id = :companyId", { id, companyId })
    .getOne();
  if (!row) throw new AppError("not_found", "Attachment not found");
  return row;
}

export async function deleteAttachment(db: DataSource, companyId: string, id: string): Promise<void> {
  await db.transaction(async (tx) => {
    const scope = companyScope(tx, companyId);
    const row = await scope.mustFind(Attachment, { id }, "Attachment", true);
    await scope.delete(Attachment, { id });
    await tx.update(Job, { id: row.jobId }, { updatedAt: new Date() });
  });
}
