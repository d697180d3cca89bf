// The estimator's working copy of an estimate: what PUT /api/jobs/:jobId/estimate saves. Edits
// land here first; the lines and totals are priced from it with the same pure code the server
// uses, so they follow each change before the save answers.
import { priceEstimate, type PricedEstimate } from "../../../../shared/estimate/pricing";
import type { DepositMode, Estimate, LineOverride, ManualLine, SaveEstimateInput, SuppliedLoad } from "../../../../shared/schemas/estimates";
import type { z } from "zod";

export interface EstimateDraft {
  markupPercent: number;
  discountMinor: number;
  taxRatePercent: number;
  depositMode: z.infer<typeof DepositMode>;
  depositPercent: number;
  depositFixedMinor: number;
  /** Lines not yet saved have an id starting with NEW_LINE. */
  manual: ManualLine[];
  overrides: Record<string, LineOverride>;
  supplied: SuppliedLoad[];
}

/** The id prefix of a manual line the server has not given an id yet. */
export const NEW_LINE = "new:";

export const isNewLine = (id: string) => id.startsWith(NEW_LINE);

export function draftFromEstimate(estimate: Estimate): EstimateDraft {
  const s = estimate.settings;
  return {
    markupPercent: s.markupPercent,
    discountMinor: s.discountMinor,
    taxRatePercent: s.taxRatePercent,
    depositMode: s.depositMode,
    depositPercent: s.depositPercent,
    depositFixedMinor: s.depositFixedMinor,
    manual: estimate.manual,
    overrides: estimate.overrides,
    supplied: estimate.supplied,
  };
}

/** The PUT body: the whole working copy with the version it was based on. */
export function toSaveInput(draft: EstimateDraft, version: number): SaveEstimateInput {
  return {
    version,
    markupPercent: draft.markupPercent,
    discountMinor: draft.discountMinor,
    taxRatePercent: draft.taxRatePercent,
    depositMode: draft.depositMode,
    depositPercent: draft.depositPercent,
    depositFixedMinor: draft.depositFixedMinor,
    manual: draft.manual.map((line) => ({
      ...(isNewLine(line.id) ? {} : { id: line.id }),
      category: line.category,
      description: line.description,
      quantity: line.quantity,
      unit: line.unit,
      unitCostMinor: line.unitCostMinor,
      markupPercent: line.markupPercent,
    })),
    overrides: draft.overrides,
    supplied: draft.supplied,
  };
}

/**
 * After a save that did not include the latest edits: the lines that were new in what was sent
 * take the ids the server gave them (it answers the manual lines in the order they were sent).
 */
export function adoptServerIds(current: EstimateDraft, sent: EstimateDraft, saved: Estimate): EstimateDraft {
  if (sent.manual.length !== saved.manual.length) return current;
  const ids = new Map<string, string>();
  sent.manual.forEach((line, i) => {
    if (isNewLine(line.id)) ids.set(line.id, saved.manual[i].id);
  });
  if (ids.size === 0) return current;
  return { ...current, manual: current.manual.map((line) => (ids.has(line.id) ? { ...line, id: ids.get(line.id) as string } : line)) };
}

/** Lines, totals and findings of the working copy, priced like the server prices them. */
export function priceDraft(estimate: Estimate, draft: EstimateDraft): PricedEstimate {
  return priceEstimate({
    generated: estimate.generated,
    manual: draft.manual,
    overrides: draft.overrides,
    settings: {
      ...estimate.settings,
      markupPercent: draft.markupPercent,
      discountMinor: draft.discountMinor,
      taxRatePercent: draft.taxRatePercent,
      depositMode: draft.depositMode,
      depositPercent: draft.depositPercent,
      depositFixedMinor: draft.depositFixedMinor,
    },
  });
}

/** An override with one field set or cleared; an empty override is removed. */
export function withOverride(overrides: Record<string, LineOverride>, key: string, field: keyof LineOverride, value: number | null): Record<string, LineOverride> {
  const next = { ...(overrides[key] ?? {}) };
  if (value === null) delete next[field];
  else next[field] = value;
  const all = { ...overrides };
  if (Object.keys(next).length === 0) delete all[key];
  else all[key] = next;
  return all;
}
