import type { DataSource } from "typeorm";
import type { z } from "zod";
import type { CreateJobInput, JobListQuery, UpdateJobInput } from "../../shared/schemas/jobs.js";
import { Attachment, Client, Job, System } from "../db/entities/index.js";
import { likePattern, type Page } from "./paging.js";
import { companyScope } from "./tenancy.js";

export interface JobRow {
  job: Job;
  clientName: string;
  systemCount: number;
  worstStatus: "within" | "near" | "over" | null;
}

// The worst load status over a job's systems, from the summary stored at each save.
const WORST = `(SELECT CASE max(CASE s.last_solve ->> 'worstStatus' WHEN 'over' THEN 3 WHEN 'near' THEN 2 WHEN 'within' THEN 1 END)
  WHEN 3 THEN 'over' WHEN 2 THEN 'near' WHEN 1 THEN 'within' END FROM system s WHERE s.job_id = j.id)`;
const SYSTEM_COUNT = `(SELECT count(*) FROM system s WHERE s.job_id = j.id)`;

const SORT_COLUMNS: Record<string, string> = {
  title: "LOWER(j.title)",
  status: "j.status",
  createdAt: "j.created_at",
  updatedAt: "j.updated_at",
  client: "LOWER(c.name)",
};

function jobQuery(db: DataSource, companyId: string) {
  return db
    .getRepository(Job)
    .createQueryBuilder("j")
    .innerJoin(Client, "c", "c.id = j.client_id")
    .addSelect("c.name", "client_name")
    .addSelect(SYSTEM_COUNT, "system_count")
    .addSelect(WORST, "worst_status")
    .where("j.company_id = :companyId", { companyId });
}

export async function listJobs(db: DataSource, companyId: string, query: z.output<typeof JobListQuery>): Promise<Page<JobRow>> {
  const qb = jobQuery(db, companyId);
  if (query.search) {
    qb.andWhere("(j.title ILIKE :search OR j.site_address ILIKE :search OR c.name ILIKE :search)", { search: likePattern(query.search) });
  }
  if (query.status) qb.andWhere("j.status = :status", { status: query.status });
  if (query.clientId) qb.andWhere("j.client_id = :clientId", { clientId: query.clientId });
  const total = await qb.getCount();
  const descending = query.sort.startsWith("-");
  const column = SORT_COLUMNS[descending ? query.sort.slice(1) : query.sort];
  const { entities, raw } = await qb
    .orderBy(column, descending ? "DESC" : "ASC")
    .addOrderBy("j.id", "ASC")
    .offset((query.page - 1) * query.pageSize)
    .limit(query.pageSize)
    .getRawAndEntities();
  const items = entities.map((job, i) => ({
    job,
    clientName: raw[i].client_name as string,
    systemCount: Number(raw[i].system_count),
    worstStatus: (raw[i].worst_status ?? null) as JobRow["worstStatus"],
  }));
  return { items, total, page: query.page, pageSize: query.pageSize };
}

export async function getJobRow(db: DataSource, companyId: string, id: string): Promise<JobRow> {
  await companyScope(db.manager, companyId).mustFind(Job, { id }, "Job");
  const { entities, raw } = await jobQuery(db, companyId).andWhere("j.id = :id", { id }).leftJoinAndSelect("j.createdBy", "u").getRawAndEntities();
  return { job: entities[0], clientName: raw[0].client_name, systemCount: Number(raw[0].system_count), worstStatus: raw[0].worst_status ?? null };
}

export async function getJobDetail(db: DataSource, companyId: string, id: string) {
  const row = await getJobRow(db, companyId, id);
  const scope = companyScope(db.manager, companyId);
  const systems = await scope.find(System, { where: { jobId: id }, order: { createdAt: "ASC", id: "ASC" } });
  const attachments = await scope.find(Attachment, { where: { jobId: id }, order: { createdAt: "DESC", id: "ASC" }, relations: { uploadedBy: true } });
  return { ...row, systems, attachments };
}

export async function createJob(db: DataSource, companyId: string, userId: string, input: z.output<typeof CreateJobInput>): Promise<string> {
  return db.transaction(async (tx) => {
    // The client must be this company's; another company's is "not found".
    // Locked, so a delete of the client waits for this job (and then refuses: the client has a job).
    await companyScope(tx, companyId).mustFind(Client, { id: input.clientId }, "Client", true);
    const job = await tx.save(
      tx.create(Job, {
        companyId,
        clientId: input.clientId,
        title: input.title,
        siteAddress: input.siteAddress ?? null,
        status: input.status,
        notes: input.notes ?? null,
        createdById: userId,
      }),
    );
    return job.id;
  });
}

export async function updateJob(db: DataSource, companyId: string, id: string, patch: z.output<typeof UpdateJobInput>): Promise<void> {
  await db.transaction(async (tx) => {
    const scope = companyScope(tx, companyId);
    const job = await scope.mustFind(Job, { id }, "Job", true);
    if (patch.clientId !== undefined) await scope.mustFind(Client, { id: patch.clientId }, "Client", true);
    tx.merge(Job, job, patch);
    await tx.save(job);
  });
}

export async function deleteJob(db: DataSource, companyId: string, id: string): Promise<void> {
  await db.transaction(async (tx) => {
    const scope = companyScope(tx, companyId);
    await scope.mustFind(Job, { id }, "Job", true);
    // Systems and attachments go with it (ON DELETE CASCADE).
    await scope.delete(Job, { id });
  });
}
