import path from "node:path";
import { fileTypeFromBuffer } from "file-type";
import type { DataSource } from "typeorm";
import type { z } from "zod";
import { JobLimits, type AttachmentListQuery } from "../../shared/schemas/jobs.js";
import { Attachment, Job } from "../db/entities/index.js";
import { AppError } from "../errors.js";
import { likePattern, pageAndSort, type Page } from "./paging.js";
import { companyScope } from "./tenancy.js";

const ACCEPTED = new Set(["image/jpeg", "image/png", "application/pdf"]);

/** The name to keep: no folders, no control characters, at most 255 characters, never empty. */
export function safeFileName(original: string | undefined, mediaType: string): string {
  // Browsers send the base name, but a hand-made request can send "../../etc/passwd" or "C:\x\y".
  const base = path.posix.basename((original ?? "").replace(/\\/g, "/"));
  let name = base.replace(/[\u0000-\u001f\u007f"<>|:*?]/g, "_").replace(/^\.+/, "").trim();
  const extension = mediaType === "application/pdf" ? ".pdf" : mediaType === "image/png" ? ".png" : ".jpg";
  if (name === "") name = `attachment${extension}`;
  // Cut by code points, so an emoji or an accented letter is never split in half.
  const points = Array.from(name);
  if (points.length > JobLimits.fileNameMax) name = points.slice(0, JobLimits.fileNameMax - extension.length).join("") + extension;
  return name;
}

/** The media type from the file's own bytes (its signature); the name and the browser's claim are not trusted. */
export async function detectMediaType(bytes: Buffer): Promise<"image/jpeg" | "image/png" | "application/pdf"> {
  const type = await fileTypeFromBuffer(bytes);
  if (!type || !ACCEPTED.has(type.mime)) {
    throw new AppError("unsupported_media_type", `file: only JPEG, PNG or PDF files can be attached${type ? ` (this file is ${type.mime})` : ""}`, { field: "file" });
  }
  return type.mime as "image/jpeg" | "image/png" | "application/pdf";
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
