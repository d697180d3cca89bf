import type { DataSource } from "typeorm";
import type { UpdateCompanyInput } from "../../shared/schemas/company.js";
import type { z } from "zod";
import { Company } from "../db/entities/index.js";
import { AppError } from "../errors.js";

export async function getCompany(db: DataSource, companyId: string): Promise<Company> {
  const company = await db.getRepository(Company).findOneBy({ id: companyId });
  if (!company) throw new AppError("not_found", "Company not found");
  return company;
}

/** Applies the given settings to the session's company (the id never comes from the request). */
export async function updateCompany(db: DataSource, companyId: string, patch: z.output<typeof UpdateCompanyInput>): Promise<Company> {
  return db.transaction(async (tx) => {
    const company = await tx.findOne(Company, { where: { id: companyId }, lock: { mode: "pessimistic_write" } });
    if (!company) throw new AppError("not_found", "Company not found");
    tx.merge(Company, company, patch);
    return tx.save(company);
  });
}
