// Switching a system between metric and imperial: lengths m ↔ ft, sizes mm² ↔ AWG/kcmil.
import { ALL_SIZES, METRES_PER_FOOT, normalizeSize, sizeInfo, type SizeInfo } from "../../../../shared/engine/conductors";
import type { SystemInput } from "../../../../shared/engine/schema";

type Units = "metric" | "imperial";

const familyOf = (units: Units): SizeInfo["family"] => (units === "metric" ? "metric" : "awg");

/** The sizes of one family, smallest first. */
const BY_AREA: Record<SizeInfo["family"], readonly SizeInfo[]> = {
  metric: ALL_SIZES.map((s) => sizeInfo(s)!).filter((s) => s.family === "metric").sort((a, b) => a.areaMm2 - b.areaMm2),
  awg: ALL_SIZES.map((s) => sizeInfo(s)!).filter((s) => s.family === "awg").sort((a, b) => a.areaMm2 - b.areaMm2),
};

/** The smallest size of `to`'s family whose cross-section is at least the given size's, so a
 *  converted run never gets a thinner conductor. A size with nothing as large in the other family
 *  (500 kcmil is 253 mm², the metric table stops at 240 mm²) and text that is not a size stay as
 *  they are: the engine reads either family in either system. */
export function convertSize(size: string, from: Units, to: Units): string {
  const label = sizeInfo(size) ? size : normalizeSize(size, from);
  const info = label ? sizeInfo(label) : undefined;
  if (!info) return size;
  const family = familyOf(to);
  if (info.family === family) return info.label;
  // A relative tolerance so equal areas computed through circular mils still count as equal.
  const match = BY_AREA[family].find((s) => s.areaMm2 >= info.areaMm2 * (1 - 1e-9));
  return match ? match.label : size;
}

/** Lengths to 0.1 m or 0.1 ft: finer than a cable is cut, coarse enough that a round trip
 *  (8 m → 26.2 ft → 8 m) comes back to what was typed. */
const roundLength = (n: number) => Math.round(n * 10) / 10;

function convertLength(length: number | string, factor: number): number | string {
  if (typeof length === "number") return roundLength(length * factor);
  const text = length.trim();
  // A bare number in text is in the system's units; text with a unit ("130 ft") says its own unit.
  if (/^[+-]?\d+(\.\d+)?$/.test(text)) return roundLength(Number(text) * factor);
  return length;
}

/** The document in the other units: every run's length converted (m ↔ ft, to 0.1) and every size
 *  (and return size) moved to the nearest equal-or-larger size of the other family by area. */
export function convertUnits(doc: SystemInput, to: Units): SystemInput {
  if (doc.units === to) return doc;
  const from = doc.units;
  const factor = to === "metric" ? METRES_PER_FOOT : 1 / METRES_PER_FOOT;
  return {
    ...doc,
    units: to,
    runs: doc.runs.map((run) => {
      const next = { ...run, length: convertLength(run.length, factor), size: convertSize(run.size, from, to) };
      if (run.returnSize !== undefined) next.returnSize = convertSize(run.returnSize, from, to);
      return next;
    }),
  };
}
