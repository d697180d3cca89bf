import type { DataSource, EntityManager } from "typeorm";
import type { z } from "zod";
import type { ClientListQuery, CreateClientInput, UpdateClientInput } from "../../shared/schemas/jobs.js";
import { Client, Job } from "../db/entities/index.js";
import { AppError } from "../errors.js";
import { likePattern, pageAndSort, type Page } from "./paging.js";
import { companyScope } from "./tenancy.js";

export type ClientWithJobs = Client & { jobCount: number };

async function withJobCounts(manager: EntityManager, companyId: string, rows: Client[]): Promise<ClientWithJobs[]> {
  if (rows.length === 0) return [];
  const counts: Array<{ id: string; n: string }> = await manager.query(
    `SELECT client_id AS id, count(*) AS n FROM job WHERE company_id = $1 AND client_id = ANY($2) GROUP BY client_id`,
    [companyId, rows.map((r) => r.id)],
  );
  const byId = new Map(counts.map((c) => [c.id, Number(c.n)]));
  return rows.map((r) => Object.assign(r, { jobCount: byId.get(r.id) ?? 0 }));
}

export async function listClients(db: DataSource, companyId: string, query: z.output<typeof ClientListQuery>): Promise<Page<ClientWithJobs>> {
  const qb = db.getRepository(Client).createQueryBuilder("c").where("c.company_id = :companyId", { companyId });
  if (query.search) {
    qb.andWhere("(c.name ILIKE :search OR c.email ILIKE :search OR c.phone ILIKE :search)", { search: likePattern(query.search) });
  }
  const [rows, total] = await pageAndSort(qb, query, { name: "LOWER(c.name)", createdAt: "c.created_at", updatedAt: "c.updated_at" }, "c.id").getManyAndCount();
  return { items: await withJobCounts(db.manager, companyId, rows), total, page: query.page, pageSize: query.pageSize };
}

export async function getClient(db: DataSource, companyId: string, id: string): Promise<ClientWithJobs> {
  const row = await companyScope(db.manager, companyId).mustFind(Client, { id }, "Client");
  return (await withJobCounts(db.manager, companyId, [row]))[0];
}

export async function createClient(db: DataSource, companyId: string, input: z.output<typeof CreateClientInput>): Promise<ClientWithJobs> {
  const row = await db.getRepository(Client).save({
    companyId,
    name: input.name,
    email: input.email ?? null,
    phone: input.phone ?? null,
    billingAddress: input.billingAddress ?? null,
    notes: input.notes ?? null,
  });
  return Object.assign(row as Client, { jobCount: 0 });
}

export async function updateClient(db: DataSource, companyId: string, id: string, patch: z.output<typeof UpdateClientInput>): Promise<ClientWithJobs> {
  const row = await db.transaction(async (tx) => {
    const client = await companyScope(tx, companyId).mustFind(Client, { id }, "Client", true);
    tx.merge(Client, client, patch);
    return tx.save(client);
  });
  return (await withJobCounts(db.manager, companyId, [row]))[0];
}

export async function deleteClient(db: DataSource, companyId: string, id: string): Promise<void> {
  await db.transaction(async (tx) => {
    const scope = companyScope(tx, companyId);
    await scope.mustFind(Client, { id }, "Client", true);
    const jobs = await scope.count(Job, { clientId: id });
    if (jobs > 0) throw new AppError("conflict", `This client has ${jobs} job${jobs === 1 ? "" : "s"}; delete or move them first`);
    await scope.delete(Client, { id });
  });
}
