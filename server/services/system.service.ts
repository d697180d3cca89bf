import { readFileSync } from "node:fs";
import type { DataSource, EntityManager } from "typeorm";
import type { z } from "zod";
import { autosize, type AutosizeResult } from "../../shared/engine/autosize.js";
import { resolveLengths } from "../../shared/engine/lengths.js";
import { API_WORK_LIMITS, SYSTEM_FORMAT, systemSchema, type SystemInput } from "../../shared/engine/schema.js";
import { CAUTIONS } from "../../shared/engine/cautions.js";
import { formatPath, solveSystem, type SolveResult } from "../../shared/engine/system.js";
import type { CreateSystemInput, SaveSystemInput, SystemSummary } from "../../shared/schemas/jobs.js";
import { Company, Job, LimitProfile, PriceItem, System, User } from "../db/entities/index.js";
import { METRES_PER_FOOT } from "../../shared/engine/conductors.js";
import { currencyDigits } from "../../shared/money.js";
import { AppError } from "../errors.js";
import { engineProfile } from "./limit-profile.service.js";
import { companyScope } from "./tenancy.js";

/** A new system's starting network: one bus bar and a battery bank at the nominal voltage. */
export function starterDocument(name: string, nominalVoltage: number, units: "metric" | "imperial"): SystemInput {
  return {
    format: SYSTEM_FORMAT,
    name,
    units,
    nominalVoltage,
    points: [{ id: "bus", name: "Battery bus bar" }],
    sources: [{ id: "bank", name: "Battery bank", type: "battery", point: "bus", voltage: nominalVoltage, internalResistanceOhm: 0 }],
    runs: [],
    loads: [],
  };
}

/**
 * Checks a network document against the shared schema and returns it with text lengths ("130 ft")
 * converted to numbers in the system's units. Errors name the field as `document.runs[2].size`.
 */
export async function validDocument(input: unknown): Promise<SystemInput> {
  const resolved = await resolveLengths(input);
  if (!resolved.ok) {
    const fields = Object.fromEntries(resolved.errors.map((e) => [`document.${e.path}`, e.message.replace(/^[^:]*: /, "")]));
    const [first] = resolved.errors;
    throw new AppError("invalid_input", `document.${first.message}`, { fields });
  }
  const parsed = systemSchema.safeParse(resolved.value);
  if (!parsed.success) {
    const fields: Record<string, string> = {};
    for (const issue of parsed.error.issues.slice(0, 50)) {
      const keys = issue.code === "unrecognized_keys" ? issue.keys.map((k) => [...issue.path, k]) : [issue.path];
      for (const path of keys) {
        const name = path.length ? `document.${formatPath(path)}` : "document";
        fields[name] ??= issue.code === "unrecognized_keys" ? `unknown field "${String(path.at(-1))}"` : issue.message;
      }
    }
    const [first] = Object.entries(fields);
    throw new AppError("invalid_input", `${first[0]}: ${first[1]}`, { fields });
  }
  return resolved.value as SystemInput;
}

/** The limit profile a system is checked against: its own, or the document's, or the engine's default. */
async function withProfile(manager: EntityManager, companyId: string, limitProfileId: string | null, document: unknown): Promise<unknown> {
  if (!limitProfileId || !document || typeof document !== "object" || Array.isArray(document)) return document;
  const profile = await companyScope(manager, companyId).findOne(LimitProfile, { id: limitProfileId });
  return profile ? { ...(document as object), limitProfile: engineProfile(profile) } : document;
}

/** Solves a document with the system's limit profile. Text lengths are converted first. The solve
 *  runs on the request's thread, so it gets the API's work budget (API_WORK_LIMITS): a network
 *  that would take longer is answered with TOO_LARGE in a second or two instead of holding the
 *  server (a collapsing 60 × 60 grid took 14 s, a densely meshed 1,000-point network 19 s). */
export async function solveDocument(manager: EntityManager, companyId: string, limitProfileId: string | null, document: unknown): Promise<SolveResult> {
  const resolved = await resolveLengths(document);
  if (!resolved.ok) {
    return { ok: false, cautions: CAUTIONS, errors: resolved.errors.map((e) => ({ code: "INVALID_FIELD" as const, path: e.path, message: e.message })) };
  }
  return solveSystem(await withProfile(manager, companyId, limitProfileId, resolved.value), API_WORK_LIMITS);
}

/** The summary stored at each save, for the job's list of systems and the jobs list. */
export function summarise(result: SolveResult): SystemSummary["lastSolve"] {
  if (!result.ok) return null;
  const count = (s: string) => result.loads.filter((l) => l.status === s).length;
  const over = count("over");
  const near = count("near");
  const within = count("within");
  const worst = result.loads.reduce<number | null>((m, l) => (m === null || l.dropPercent > m ? l.dropPercent : m), null);
  return {
    worstStatus: over ? "over" : near ? "near" : within ? "within" : null,
    worstDropPercent: worst === null ? null : Math.round(worst * 1000) / 1000,
    over,
    near,
    within,
    errors: result.findings.filter((f) => f.severity === "error").length,
  };
}

async function ensureProfile(manager: EntityManager, companyId: string, limitProfileId: string | null | undefined) {
  // Locked, so deleting the profile waits for this save (and then refuses: a system uses it).
  if (limitProfileId) await companyScope(manager, companyId).mustFind(LimitProfile, { id: limitProfileId }, "Limit profile", true);
}

async function defaultProfileId(manager: EntityManager, companyId: string): Promise<string | null> {
  const first = await companyScope(manager, companyId).find(LimitProfile, { where: { builtIn: true }, order: { createdAt: "ASC", name: "ASC" }, take: 1 });
  return first[0]?.id ?? null;
}

export async function createSystem(db: DataSource, companyId: string, userId: string, jobId: string, input: z.output<typeof CreateSystemInput>): Promise<System> {
  const document = input.document === undefined ? starterDocument(input.name, input.nominalVoltage, input.units) : await validDocument(input.document);
  return db.transaction(async (tx) => {
    const scope = companyScope(tx, companyId);
    await scope.mustFind(Job, { id: jobId }, "Job", true);
    await ensureProfile(tx, companyId, input.limitProfileId);
    const limitProfileId = input.limitProfileId === undefined ? await defaultProfileId(tx, companyId) : input.limitProfileId;
    const result = await solveDocument(tx, companyId, limitProfileId, document);
    const system = await tx.save(
      tx.create(System, {
        companyId,
        jobId,
        name: input.name,
        nominalVoltage: document.nominalVoltage,
        units: document.units,
        limitProfileId,
        document: document as unknown as Record<string, unknown>,
        lastSolve: summarise(result),
        updatedById: userId,
      }),
    );
    await tx.update(Job, { id: jobId }, { updatedAt: new Date() });
    return system;
  });
}

export async function getSystem(manager: EntityManager, companyId: string, id: string): Promise<System> {
  const system = await companyScope(manager, companyId).mustFind(System, { id }, "System");
  system.updatedBy = system.updatedById ? await manager.findOneBy(User, { id: system.updatedById }) : null;
  return system;
}

/** The 409 a save gets when someone else saved since `version` was read. */
function staleVersion(current: System): AppError {
  return new AppError("conflict", "This system was changed by someone else since you opened it; reload it or overwrite with yours", {
    currentVersion: current.version,
    updatedAt: current.updatedAt.toISOString(),
    updatedBy: current.updatedBy?.name ?? null,
  });
}

/** Saves the network with optimistic locking: the row is locked, its version compared, then bumped. */
export async function saveSystem(db: DataSource, companyId: string, userId: string, id: string, input: z.output<typeof SaveSystemInput>): Promise<System> {
  const document = await validDocument(input.document);
  await db.transaction(async (tx) => {
    const scope = companyScope(tx, companyId);
    const current = await scope.mustFind(System, { id }, "System", true);
    if (current.version !== input.version) {
      current.updatedBy = current.updatedById ? await tx.findOneBy(User, { id: current.updatedById }) : null;
      throw staleVersion(current);
    }
    if (input.limitProfileId !== undefined) await ensureProfile(tx, companyId, input.limitProfileId);
    const limitProfileId = input.limitProfileId === undefined ? current.limitProfileId : input.limitProfileId;
    const result = await solveDocument(tx, companyId, limitProfileId, document);
    // An update query rather than save(): save() skips a row whose fields did not change, and every
    // save must move the version on (the query builder adds version + 1 and updated_at itself).
    const updated = await tx
      .createQueryBuilder()
      .update(System)
      .set({
        name: input.name ?? current.name,
        limitProfileId,
        // jsonb values: TypeORM's deep-partial type does not describe them.
        document: document as never,
        nominalVoltage: document.nominalVoltage,
        units: document.units,
        lastSolve: summarise(result) as never,
        updatedById: userId,
      })
      .where("id = :id AND company_id = :companyId AND version = :version", { id, companyId, version: input.version })
      .execute();
    if (updated.affected !== 1) throw new AppError("conflict", "This system was changed by someone else since you opened it; reload it");
    await tx.update(Job, { id: current.jobId }, { updatedAt: new Date() });
  });
  return getSystem(db.manager, companyId, id);
}

export async function deleteSystem(db: DataSource, companyId: string, id: string): Promise<void> {
  await db.transaction(async (tx) => {
    const scope = companyScope(tx, companyId);
    const system = await scope.mustFind(System, { id }, "System", true);
    await scope.delete(System, { id });
    await tx.update(Job, { id: system.jobId }, { updatedAt: new Date() });
  });
}

/** The network a solve or auto-size request works on: the posted one, or the saved one. */
export async function documentFor(db: DataSource, companyId: string, id: string, posted: unknown): Promise<{ system: System; document: unknown }> {
  const system = await companyScope(db.manager, companyId).mustFind(System, { id }, "System");
  return { system, document: posted === undefined ? system.document : posted };
}

// Indicative cable prices per size until the company's price list exists (our own invented figures,
// per metre or per foot of one conductor; shared/engine/examples).
const DEFAULT_COSTS = {
  metric: JSON.parse(readFileSync(new URL("../../shared/engine/examples/costs-metric.json", import.meta.url), "utf8")) as unknown,
  imperial: JSON.parse(readFileSync(new URL("../../shared/engine/examples/costs-imperial.json", import.meta.url), "utf8")) as unknown,
};

export type AutosizeAnswer = AutosizeResult & { costSource?: "price-list" | "default-prices"; costNote?: string };

/**
 * The company's cable prices as the engine's costs (per metre of one conductor, in major units),
 * or null when the price list has no cable. Of several items for one size and material the
 * cheapest per conductor-metre counts, as in the bill of materials.
 */
export async function priceListCosts(manager: EntityManager, companyId: string, units: "metric" | "imperial"): Promise<{ costs: unknown; currency: string } | null> {
  const [items, company] = await Promise.all([
    companyScope(manager, companyId).find(PriceItem, { where: { category: "cable" } }),
    manager.findOneByOrFail(Company, { id: companyId }),
  ]);
  const best = new Map<string, { material: string; size: string; cost: number }>();
  const scale = 10 ** currencyDigits(company.currency);
  for (const item of items) {
    if (!item.cableSize || !item.cableMaterial) continue;
    const perConductorMetre = item.unitCostMinor / scale / (item.conductors ?? 1) / (item.unit === "ft" ? METRES_PER_FOOT : 1);
    const key = `${item.cableMaterial}|${item.cableSize}`;
    const current = best.get(key);
    if (!current || perConductorMetre < current.cost) best.set(key, { material: item.cableMaterial, size: item.cableSize, cost: perConductorMetre });
  }
  if (best.size === 0) return null;
  // A metric layout is proposed mm² sizes and an imperial one AWG and kcmil, when the price list
  // has sizes of that family; otherwise every priced size.
  const all = [...best.values()];
  const family = all.filter((i) => i.size.endsWith("mm2") === (units === "metric"));
  return { costs: { format: "runwright-costs/1", currency: company.currency, per: "m", items: family.length ? family : all }, currency: company.currency };
}

export async function autosizeDocument(db: DataSource, companyId: string, limitProfileId: string | null, document: unknown): Promise<AutosizeAnswer> {
  const resolved = await resolveLengths(document);
  if (!resolved.ok) return { ok: false, errors: resolved.errors.map((e) => ({ code: "INVALID_FIELD" as const, path: e.path, message: e.message })) };
  const withLimits = await withProfile(db.manager, companyId, limitProfileId, resolved.value);
  // Auto-size proposes only sizes the company has priced; with no cable in the price list it
  // falls back to indicative default prices and says so.
  const units = (resolved.value as { units?: unknown })?.units === "imperial" ? "imperial" : "metric";
  const priced = await priceListCosts(db.manager, companyId, units);
  if (priced) {
    const result = autosize(withLimits, priced.costs);
    if (!result.ok) return result;
    return { ...result, costSource: "price-list", costNote: `Cable cost from your price list (${priced.currency}); only sizes with a price are proposed.` };
  }
  const costs = DEFAULT_COSTS[units];
  const result = autosize(withLimits, costs);
  if (!result.ok) return result;
  const { currency, per } = costs as { currency: string; per: string };
  return {
    ...result,
    costSource: "default-prices",
    costNote: `Cable cost from indicative default prices per size (${currency} per ${per === "m" ? "metre" : "foot"} of conductor), until your price list has cable prices.`,
  };
}
