import type { DataSource, EntityManager } from "typeorm";
import { buildBillOfMaterials, diffGenerated, priceEstimate } from "../../shared/estimate/index.js";
import type { Estimate as EstimateView, EstimateFinding, SaveEstimateInput } from "../../shared/schemas/estimates.js";
import type { z } from "zod";
import { Company, Estimate, Job, PriceItem, System } from "../db/entities/index.js";
import { AppError } from "../errors.js";
import { companyScope } from "./tenancy.js";
import { randomUUID } from "node:crypto";
import type { SaveEstimateInput as SaveEstimateSchema } from "../../shared/schemas/estimates.js";

type SaveInput = z.output<typeof SaveEstimateSchema>;
export type { SaveEstimateInput };

export async function jobSystems(manager: EntityManager, companyId: string, jobId: string): Promise<System[]> {
  return companyScope(manager, companyId).find(System, { where: { jobId }, order: { createdAt: "ASC", name: "ASC" } });
}

/** The estimate with its lines priced and totalled now, and the findings that need attention. */
export async function presentEstimate(manager: EntityManager, companyId: string, estimate: Estimate): Promise<EstimateView> {
  const company = await manager.findOneByOrFail(Company, { id: companyId });
  const systems = await jobSystems(manager, companyId, estimate.jobId);
  const settings = {
    markupPercent: estimate.markupPercent,
    discountMinor: estimate.discountMinor,
    taxRatePercent: estimate.taxRatePercent,
    depositMode: estimate.depositMode,
    depositPercent: estimate.depositPercent,
    depositFixedMinor: estimate.depositFixedMinor,
    wastePercent: estimate.wastePercent,
  };
  const priced = priceEstimate({ generated: estimate.generated, manual: estimate.manual, overrides: estimate.overrides, settings });
  const layoutFindings: EstimateFinding[] = [];
  for (const s of systems) {
    if (!s.lastSolve) layoutFindings.push({ code: "SYSTEM_NOT_SOLVED", severity: "warning", message: `${s.name}: the layout does not solve yet; the quote's voltage-drop proof needs a solved layout.` });
    else if (s.lastSolve.over > 0) layoutFindings.push({ code: "LOAD_OVER_LIMIT", severity: "warning", message: `${s.name}: ${s.lastSolve.over} load${s.lastSolve.over === 1 ? " is" : "s are"} over the drop limit; auto-size or fix the runs before quoting.` });
  }
  if (systems.some((s) => s.updatedAt > (estimate.generatedAt ?? new Date(0)))) {
    layoutFindings.push({ code: "LAYOUT_CHANGED", severity: "warning", message: "A system was changed after this estimate was built: rebuild from the layout to bring the quantities up to date." });
  }
  const loads = systems.flatMap((s) => {
    const doc = s.document as { loads?: Array<{ id?: unknown; name?: unknown }> };
    return (Array.isArray(doc.loads) ? doc.loads : [])
      .filter((l) => typeof l.id === "string")
      .map((l) => ({ systemId: s.id, systemName: s.name, loadId: l.id as string, name: typeof l.name === "string" && l.name ? l.name : (l.id as string) }));
  });
  return {
    id: estimate.id,
    jobId: estimate.jobId,
    currency: company.currency,
    settings,
    generated: estimate.generated,
    manual: estimate.manual,
    overrides: estimate.overrides,
    supplied: estimate.supplied,
    lines: priced.lines,
    totals: priced.totals,
    findings: [...estimate.bomFindings, ...layoutFindings, ...priced.findings],
    loads,
    generatedAt: estimate.generatedAt?.toISOString() ?? null,
    lastChanges: estimate.lastChanges,
    version: estimate.version,
    updatedAt: estimate.updatedAt.toISOString(),
  };
}

/** The job's estimate, or null when none was built yet (404 for an unknown job). */
export async function findEstimate(manager: EntityManager, companyId: string, jobId: string): Promise<Estimate | null> {
  await companyScope(manager, companyId).mustFind(Job, { id: jobId }, "Job");
  return companyScope(manager, companyId).findOne(Estimate, { jobId });
}

export async function getEstimate(manager: EntityManager, companyId: string, jobId: string): Promise<Estimate> {
  const estimate = await findEstimate(manager, companyId, jobId);
  if (!estimate) throw new AppError("not_found", "This job has no estimate yet: build it from the layout");
  return estimate;
}

/** Builds the estimate from the job's saved systems, or rebuilds its generated lines (manual lines, overrides and supplied loads stay). */
export async function generateEstimate(db: DataSource, companyId: string, jobId: string): Promise<Estimate> {
  return db.transaction(async (tx) => {
    const scope = companyScope(tx, companyId);
    await scope.mustFind(Job, { id: jobId }, "Job", true);
    const company = await tx.findOneByOrFail(Company, { id: companyId });
    const existing = await tx.findOne(Estimate, { where: { companyId, jobId }, lock: { mode: "pessimistic_write" } });
    const [systems, items] = await Promise.all([jobSystems(tx, companyId, jobId), scope.find(PriceItem)]);
    const bom = buildBillOfMaterials(
      systems.map((s) => ({ id: s.id, name: s.name, document: s.document })),
      items,
      {
        wastePercent: existing?.wastePercent ?? company.wastePercent,
        labourMinutesPerRun: company.labourMinutesPerRun,
        labourMinutesPerMetre: company.labourMinutesPerMetre,
        labourMinutesPerTermination: company.labourMinutesPerTermination,
        labourRateMinor: company.labourRateMinor,
      },
      existing?.supplied ?? [],
    );
    if (existing) {
      existing.lastChanges = diffGenerated(existing.generated, bom.lines);
      existing.generated = bom.lines;
      existing.bomFindings = bom.findings;
      existing.generatedAt = new Date();
      return tx.save(existing);
    }
    return tx.save(
      tx.create(Estimate, {
        companyId,
        jobId,
        markupPercent: company.defaultMarkupPercent,
        discountMinor: 0,
        taxRatePercent: company.taxRatePercent,
        depositMode: "percent",
        depositPercent: company.depositPercent,
        depositFixedMinor: 0,
        wastePercent: company.wastePercent,
        generated: bom.lines,
        manual: [],
        overrides: {},
        supplied: [],
        bomFindings: bom.findings,
        lastChanges: [],
        generatedAt: new Date(),
      }),
    );
  });
}

/** Saves the estimator's settings, manual lines, overrides and supplied loads, with optimistic locking. */
export async function saveEstimate(db: DataSource, companyId: string, jobId: string, input: SaveInput): Promise<Estimate> {
  return db.transaction(async (tx) => {
    const scope = companyScope(tx, companyId);
    await scope.mustFind(Job, { id: jobId }, "Job");
    const estimate = await tx.findOne(Estimate, { where: { companyId, jobId }, lock: { mode: "pessimistic_write" } });
    if (!estimate) throw new AppError("not_found", "This job has no estimate yet: build it from the layout");
    if (estimate.version !== input.version) {
      throw new AppError("conflict", "The estimate was changed by someone else since you opened it; reload it", { currentVersion: estimate.version });
    }
    if (input.supplied) {
      const ids = [...new Set(input.supplied.map((s) => s.priceItemId))];
      for (const id of ids) await scope.mustFind(PriceItem, { id }, "Price item");
      const systems = new Set((await jobSystems(tx, companyId, jobId)).map((s) => s.id));
      const stray = input.supplied.find((s) => !systems.has(s.systemId));
      if (stray) throw new AppError("not_found", "System not found", { field: "supplied" });
    }
    const { version: _version, manual, supplied, ...settings } = input;
    Object.assign(estimate, Object.fromEntries(Object.entries(settings).filter(([, v]) => v !== undefined)));
    if (manual) estimate.manual = manual.map((m) => ({ ...m, id: m.id ?? randomUUID() }));
    if (supplied) {
      const changed = JSON.stringify(supplied) !== JSON.stringify(estimate.supplied);
      estimate.supplied = supplied;
      if (changed) {
        // Supplied loads become device lines at once: rebuild the device lines only.
        const [systems, items, company] = await Promise.all([jobSystems(tx, companyId, jobId), scope.find(PriceItem), tx.findOneByOrFail(Company, { id: companyId })]);
        const bom = buildBillOfMaterials(systems.map((s) => ({ id: s.id, name: s.name, document: s.document })), items, { wastePercent: estimate.wastePercent, labourMinutesPerRun: company.labourMinutesPerRun, labourMinutesPerMetre: company.labourMinutesPerMetre, labourMinutesPerTermination: company.labourMinutesPerTermination, labourRateMinor: company.labourRateMinor }, supplied);
        const devices = bom.lines.filter((l) => l.key.startsWith("device:"));
        estimate.generated = [...estimate.generated.filter((l) => !l.key.startsWith("device:")), ...devices];
        estimate.bomFindings = [...estimate.bomFindings.filter((f) => !(f.code === "UNKNOWN_SUPPLIED_LOAD" || (f.code === "MISSING_PRICE" && f.need?.category === "device"))), ...bom.findings.filter((f) => f.code === "UNKNOWN_SUPPLIED_LOAD" || (f.code === "MISSING_PRICE" && f.need?.category === "device"))];
      }
    }
    // save() skips an unchanged row, and every save must move the version on.
    estimate.updatedAt = new Date();
    return tx.save(estimate);
  });
}
