import { fileTypeFromBuffer } from "file-type";
import type { DataSource } from "typeorm";
import type { z } from "zod";
import type { UpdateEstimatingSettingsInput } from "../../shared/schemas/estimates.js";
import { Company } from "../db/entities/index.js";
import { AppError } from "../errors.js";

export async function getEstimatingSettings(db: DataSource, companyId: string): Promise<{ company: Company; hasLogo: boolean }> {
  const company = await db.manager.findOneByOrFail(Company, { id: companyId });
  return { company, hasLogo: company.logoMediaType !== null };
}

export async function updateEstimatingSettings(db: DataSource, companyId: string, patch: z.output<typeof UpdateEstimatingSettingsInput>) {
  await db.transaction(async (tx) => {
    await tx.query(`SELECT id FROM company WHERE id = $1 FOR UPDATE`, [companyId]);
    const values = Object.fromEntries(Object.entries(patch).filter(([, v]) => v !== undefined));
    if (Object.keys(values).length) await tx.update(Company, { id: companyId }, values);
  });
  return getEstimatingSettings(db, companyId);
}

/** Stores the logo printed on quotes; the type comes from the bytes, not the name or the browser. */
export async function saveLogo(db: DataSource, companyId: string, bytes: Buffer) {
  const type = await fileTypeFromBuffer(bytes);
  if (!type || (type.mime !== "image/png" && type.mime !== "image/jpeg")) {
    throw new AppError("unsupported_media_type", "file: the logo must be a PNG or JPEG image", { field: "file" });
  }
  await db.manager.update(Company, { id: companyId }, { logo: bytes, logoMediaType: type.mime });
  return getEstimatingSettings(db, companyId);
}

export async function readLogo(db: DataSource, companyId: string): Promise<{ content: Buffer; mediaType: string }> {
  const row = await db.getRepository(Company).createQueryBuilder("c").addSelect("c.logo").where("c.id = :id", { id: companyId }).getOne();
  if (!row?.logo || !row.logoMediaType) throw new AppError("not_found", "The company has no logo");
  return { content: row.logo, mediaType: row.logoMediaType };
}

export async function deleteLogo(db: DataSource, companyId: string): Promise<void> {
  await db.manager.update(Company, { id: companyId }, { logo: null, logoMediaType: null });
}
