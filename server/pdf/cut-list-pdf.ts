// The Installer's cut list for an accepted job: every run with its wire label, ends, size and the
// length to cut per conductor, then how much conductor of each size to take to site.
//
//  length to cut per conductor = one-way length × (1 + waste % / 100), rounded UP to 0.1 m in
//  metric systems or to 1 ft in imperial ones (a short cut is scrap; a long one is trimmed).
//  conductors per run = 2 (positive and return) × parallel sets.
import { CAUTIONS } from "../../shared/engine/cautions.js";
import { roundUpTo } from "../../shared/estimate/index.js";
import type { QuoteSnapshot, SnapshotSystem } from "../../shared/schemas/estimates.js";
import {
  addPageFooters,
  cautionsBox,
  createPdf,
  drawLetterhead,
  drawTable,
  formatNumber,
  infoColumns,
  lengthUnit,
  materialLabel,
  MUTED,
  paragraph,
  pointNamer,
  sectionHeading,
  sizeLabel,
  subheading,
  TYPE,
  type TableRow,
} from "./pdf-document.js";

type Run = SnapshotSystem["runs"][number];

export interface CutListOptions {
  /** The accepted quote's label, "Q-2026-0042 R2". */
  label: string;
}

/** "W1.03": system 1, run 3, in the order the layout lists them (two digits keep lists aligned). */
export function wireLabel(systemIndex: number, runIndex: number): string {
  return `W${systemIndex + 1}.${String(runIndex + 1).padStart(2, "0")}`;
}

/** The rounding step of cut lengths in a system's units. */
function cutStep(units: SnapshotSystem["units"]): number {
  return units === "imperial" ? 1 : 0.1;
}

/** One conductor's length to cut, in the system's units. */
export function cutLength(oneWay: number, wastePercent: number, units: SnapshotSystem["units"]): number {
  return roundUpTo(oneWay * (1 + wastePercent / 100), cutStep(units));
}

function conductorsText(run: Run): string {
  const sets = run.parallel;
  if (run.returnSize && run.returnSize !== run.size) return `${sets} + ${sets} return ${sizeLabel(run.returnSize)}`;
  return sets > 1 ? `${2 * sets} (${sets} sets)` : "2";
}

export async function renderCutListPdf(snapshot: QuoteSnapshot, options: CutListOptions): Promise<Buffer> {
  // Landscape: ten columns, and the names of both ends must be readable at a glance on site.
  const { doc, bytes } = createPdf({ title: `Cut list ${options.label}`, subject: snapshot.job.title, author: snapshot.company.name, landscape: true });

  drawLetterhead(doc, { company: snapshot.company, title: "Cut list", facts: [snapshot.job.title, `Quote ${options.label}`] });
  infoColumns(doc, [
    { heading: "Job", lines: [snapshot.job.title, snapshot.client.name] },
    { heading: "Site", lines: [snapshot.job.siteAddress ?? "No site address given"] },
  ]);
  paragraph(
    doc,
    `Lengths to cut add ${formatNumber(snapshot.wastePercent, 3)} % to the one-way length for terminations and routing, rounded up to the next 0.1 m (1 ft in systems measured in feet). Each run has a positive and a return conductor per parallel set; mark both ends of each with the wire label.`,
    { size: TYPE.small, color: MUTED, gap: 8 },
  );

  // Conductor to take to site, per size, material and unit, in the order first met.
  const totals = new Map<string, { size: string; material: Run["material"]; unit: string; conductors: number; length: number; step: number }>();
  const addTotal = (size: string, material: Run["material"], units: SnapshotSystem["units"], conductors: number, each: number) => {
    const unit = lengthUnit(units);
    const key = `${size}|${material}|${unit}`;
    const t = totals.get(key) ?? { size, material, unit, conductors: 0, length: 0, step: cutStep(units) };
    t.conductors += conductors;
    t.length += conductors * each;
    totals.set(key, t);
  };

  sectionHeading(doc, "Runs");
  if (snapshot.systems.length === 0) paragraph(doc, "This job has no wiring systems.");
  snapshot.systems.forEach((system, s) => {
    const unit = lengthUnit(system.units);
    const name = pointNamer(system.points);
    const heading = (keepWith: number) =>
      subheading(doc, system.name, `${formatNumber(system.nominalVoltage)} V nominal  ·  lengths in ${unit}  ·  ${system.runs.length} run${system.runs.length === 1 ? "" : "s"}`, keepWith);
    if (system.runs.length === 0) {
      heading(30);
      paragraph(doc, "No runs.", { color: MUTED });
      return;
    }
    const rows: TableRow[] = system.runs.map((run, r) => {
      const each = cutLength(run.length, snapshot.wastePercent, system.units);
      addTotal(run.size, run.material, system.units, run.parallel, each);
      addTotal(run.returnSize ?? run.size, run.material, system.units, run.parallel, each);
      return {
        cells: [
          { text: wireLabel(s, r), bold: true },
          name(run.from),
          name(run.to),
          sizeLabel(run.size),
          materialLabel(run.material),
          conductorsText(run),
          `${formatNumber(run.length, 2)} ${unit}`,
          { text: `${formatNumber(each, 1)} ${unit}`, bold: true },
          run.fuseA === null ? "—" : `${formatNumber(run.fuseA, 1)} A`,
          { text: "", tickBox: true },
        ],
      };
    });
    drawTable(
      doc,
      [
        { header: "Wire", width: 6.5 },
        { header: "From", width: 18 },
        { header: "To", width: 18 },
        { header: "Size", width: 8.5 },
        { header: "Material", width: 8 },
        { header: "Conductors", width: 12 },
        { header: "One-way", width: 7.5, align: "right" },
        { header: "Cut each", width: 8, align: "right" },
        { header: "Fuse", width: 6, align: "right" },
        { header: "Done", width: 5 },
      ],
      rows,
      { lead: heading },
    );
  });

  if (totals.size > 0) {
    drawTable(
      doc,
      [
        { header: "Size", width: 25 },
        { header: "Material", width: 25 },
        { header: "Conductors", width: 20, align: "right" },
        { header: "Total length to cut", width: 30, align: "right" },
      ],
      [...totals.values()].map((t) => ({
        cells: [sizeLabel(t.size), materialLabel(t.material), String(t.conductors), `${formatNumber(roundUpTo(t.length, t.step), 1)} ${t.unit}`],
      })),
      { lead: (keepWith) => sectionHeading(doc, "Conductor to take to site", keepWith) },
    );
  }

  cautionsBox(doc, snapshot.cautions.length > 0 ? snapshot.cautions : CAUTIONS);
  addPageFooters(doc, `${snapshot.company.name}  ·  Cut list for quote ${options.label}  ·  ${snapshot.job.title}`);
  doc.end();
  return bytes;
}
