import { In, type DataSource } from "typeorm";
import { Job, Quote } from "../db/entities/index.js";
import { AppError } from "../errors.js";
import { renderCutListPdf } from "../pdf/cut-list-pdf.js";
import { quoteLabel } from "./quote.service.js";
import { companyScope } from "./tenancy.js";

/**
 * The Installer cut list of a job: made from the layout frozen in the accepted quote (what the client
 * agreed to), not from later edits.
 */
export async function acceptedQuoteForJob(db: DataSource, companyId: string, jobId: string): Promise<{ quote: Quote; pdf: Buffer }> {
  await companyScope(db.manager, companyId).mustFind(Job, { id: jobId }, "Job");
  const [quote] = await companyScope(db.manager, companyId).find(Quote, {
    where: { jobId, status: In(["accepted", "deposit paid"]) },
    order: { acceptedAt: "DESC" },
    take: 1,
  });
  if (!quote) throw new AppError("conflict", "The cut list is made from an accepted quote; this job has none yet");
  return { quote, pdf: await renderCutListPdf(quote.snapshot, { label: quoteLabel(quote) }) };
}
