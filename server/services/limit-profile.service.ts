import type { DataSource, EntityManager } from "typeorm";
import type { z } from "zod";
import type { LimitProfile as EngineLimitProfile } from "../../shared/engine/schema.js";
import type { CreateLimitProfileInput, LimitProfileListQuery, UpdateLimitProfileInput } from "../../shared/schemas/jobs.js";
import { LimitProfile, System } from "../db/entities/index.js";
import { AppError } from "../errors.js";
import { likePattern, pageAndSort, type Page } from "./paging.js";
import { companyScope } from "./tenancy.js";

/**
 * The profiles every company starts with. The first two cite a published figure and are read-only;
 * the third is the company's own to edit. Percentages are of nominal voltage.
 */
export const DEFAULT_LIMIT_PROFILES = [
  {
    name: "General — 3 % branch, 5 % total",
    branchPercent: 3,
    totalPercent: 5,
    criticalPercent: 3,
    nearFraction: 0.8,
    builtIn: true,
    notes:
      "NFPA 70 (NEC) 210.19(A) Informational Note No. 4 and 215.2(A) Informational Note No. 2: size conductors for at most 3 % drop in a branch circuit or feeder and 5 % feeder plus branch. A recommendation for reasonable efficiency, not a requirement (informational notes are not enforceable, NEC 90.5(C)).",
  },
  {
    name: "Marine DC — 3 % critical, 10 % other",
    branchPercent: 10,
    totalPercent: 10,
    criticalPercent: 3,
    nearFraction: 0.8,
    builtIn: true,
    notes:
      "ABYC E-11 (AC and DC Electrical Systems on Boats): at most 3 % for panelboard main feeders, bilge blowers, electronics, navigation lights and other critical circuits; at most 10 % for other lighting and non-critical circuits. Mark critical loads as critical.",
  },
  {
    name: "Company custom",
    branchPercent: 3,
    totalPercent: 5,
    criticalPercent: 3,
    nearFraction: 0.8,
    builtIn: false,
    notes: "Your own limits: edit them to match a client's specification or the locally adopted code.",
  },
] as const;

/** Adds the default profiles a company does not have yet (by name). Runs at sign-up and in the seed. */
export async function ensureDefaultLimitProfiles(manager: EntityManager, companyId: string): Promise<void> {
  await manager
    .createQueryBuilder()
    .insert()
    .into(LimitProfile)
    .values(DEFAULT_LIMIT_PROFILES.map((p) => ({ ...p, companyId })))
    .orIgnore()
    .execute();
}

/** The engine's form of a stored profile. */
export function engineProfile(profile: LimitProfile): EngineLimitProfile {
  return {
    name: profile.name,
    branchPercent: profile.branchPercent,
    totalPercent: profile.totalPercent,
    criticalPercent: profile.criticalPercent,
    nearFraction: profile.nearFraction,
  };
}

export type LimitProfileWithUse = LimitProfile & { systemCount: number };

export async function listLimitProfiles(db: DataSource, companyId: string, query: z.output<typeof LimitProfileListQuery>): Promise<Page<LimitProfileWithUse>> {
  const base = db.getRepository(LimitProfile).createQueryBuilder("p").where("p.company_id = :companyId", { companyId });
  if (query.search) base.andWhere("p.name ILIKE :search", { search: likePattern(query.search) });
  const [rows, total] = await pageAndSort(base, query, { name: "LOWER(p.name)", updatedAt: "p.updated_at" }, "p.id").getManyAndCount();
  return { items: await withUse(db, companyId, rows), total, page: query.page, pageSize: query.pageSize };
}

async function withUse(db: DataSource | EntityManager, companyId: string, rows: LimitProfile[]): Promise<LimitProfileWithUse[]> {
  if (rows.length === 0) return [];
  const counts: Array<{ id: string; n: string }> = await db.query(
    `SELECT limit_profile_id AS id, count(*) AS n FROM system WHERE company_id = $1 AND limit_profile_id = ANY($2) GROUP BY limit_profile_id`,
    [companyId, rows.map((r) => r.id)],
  );
  const byId = new Map(counts.map((c) => [c.id, Number(c.n)]));
  return rows.map((r) => Object.assign(r, { systemCount: byId.get(r.id) ?? 0 }));
}

export async function getLimitProfile(db: DataSource, companyId: string, id: string): Promise<LimitProfileWithUse> {
  const row = await companyScope(db.manager, companyId).mustFind(LimitProfile, { id }, "Limit profile");
  return (await withUse(db, companyId, [row]))[0];
}

async function refuseDuplicateName(manager: EntityManager, companyId: string, name: string, exceptId?: string) {
  // Names are unique per company ignoring case; the company row's lock makes two creates take turns.
  await manager.query(`SELECT id FROM company WHERE id = $1 FOR UPDATE`, [companyId]);
  const same = await manager
    .getRepository(LimitProfile)
    .createQueryBuilder("p")
    .where("p.company_id = :companyId AND lower(p.name) = lower(:name)", { companyId, name })
    .getOne();
  if (same && same.id !== exceptId) throw new AppError("conflict", `A limit profile named "${name}" already exists`, { field: "name" });
}

export async function createLimitProfile(db: DataSource, companyId: string, input: z.output<typeof CreateLimitProfileInput>): Promise<LimitProfileWithUse> {
  return db.transaction(async (tx) => {
    await refuseDuplicateName(tx, companyId, input.name);
    const row = await tx.save(tx.create(LimitProfile, { ...input, notes: input.notes ?? null, companyId, builtIn: false }));
    return Object.assign(row, { systemCount: 0 });
  });
}

export async function updateLimitProfile(db: DataSource, companyId: string, id: string, patch: z.output<typeof UpdateLimitProfileInput>): Promise<LimitProfileWithUse> {
  const row = await db.transaction(async (tx) => {
    const profile = await companyScope(tx, companyId).mustFind(LimitProfile, { id }, "Limit profile", true);
    if (profile.builtIn) throw new AppError("conflict", "Built-in limit profiles cite a published figure and cannot be changed; duplicate it to make your own");
    if (patch.name !== undefined) await refuseDuplicateName(tx, companyId, patch.name, id);
    tx.merge(LimitProfile, profile, patch);
    return tx.save(profile);
  });
  return (await withUse(db, companyId, [row]))[0];
}

export async function deleteLimitProfile(db: DataSource, companyId: string, id: string): Promise<void> {
  await db.transaction(async (tx) => {
    const scope = companyScope(tx, companyId);
    const profile = await scope.mustFind(LimitProfile, { id }, "Limit profile", true);
    if (profile.builtIn) throw new AppError("conflict", "Built-in limit profiles cannot be deleted");
    const used = await scope.count(System, { limitProfileId: id });
    if (used > 0) throw new AppError("conflict", `This limit profile is used by ${used} system${used === 1 ? "" : "s"}; choose another profile for them first`);
    await scope.delete(LimitProfile, { id });
  });
}
