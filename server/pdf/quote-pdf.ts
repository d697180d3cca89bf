// The quote as the client receives it: letterhead, client and site, scope, priced lines by
// category, totals with the deposit due, the voltage-drop check of every system, the cautions,
// the terms and the link to accept online.
//
// The client sees sell amounts only: a line's cost, unit cost and markup never reach this file's
// output, nor do the totals' cost and margin.
import { CAUTIONS } from "../../shared/engine/cautions.js";
import { formatMoney } from "../../shared/money.js";
import { CATEGORY_LABELS, PRICE_CATEGORIES, type PricedLine, type QuoteSnapshot, type SnapshotSystem } from "../../shared/schemas/estimates.js";
import { FONT } from "./fonts.js";
import {
  addPageFooters,
  bulletList,
  cautionsBox,
  COPPER,
  COPPER_TINT,
  contentBox,
  createPdf,
  drawLetterhead,
  drawTable,
  ensureSpace,
  formatDate,
  formatFixed,
  formatNumber,
  infoColumns,
  INK,
  lengthUnit,
  materialLabel,
  MUTED,
  paragraph,
  pointNamer,
  sectionHeading,
  sizeLabel,
  STATUS_STYLE,
  subheading,
  TYPE,
  type TableRow,
} from "./pdf-document.js";

type Doc = PDFKit.PDFDocument;

export interface QuotePdfOptions {
  /** "Q-2026-0042 R2" */
  label: string;
  /** The client's link to the quote page, or null when the quote has no live link. */
  acceptUrl: string | null;
}

export async function renderQuotePdf(snapshot: QuoteSnapshot, options: QuotePdfOptions): Promise<Buffer> {
  const { doc, bytes } = createPdf({ title: `Quote ${options.label}`, subject: snapshot.job.title, author: snapshot.company.name });

  drawLetterhead(doc, {
    company: snapshot.company,
    title: "Quote",
    facts: [options.label, `Issued ${formatDate(snapshot.issuedAt)}`, `Valid until ${formatDate(snapshot.validUntil)}`],
  });
  const { client, job } = snapshot;
  infoColumns(doc, [
    { heading: "Prepared for", lines: [client.name, client.email, client.phone, client.billingAddress] },
    { heading: "Site", lines: [job.title, job.siteAddress] },
  ]);

  if (snapshot.scope.length > 0) {
    sectionHeading(doc, "Scope of work");
    bulletList(doc, snapshot.scope);
  }

  drawLines(doc, snapshot.lines, snapshot.currency);
  drawTotals(doc, snapshot);

  sectionHeading(doc, "Voltage drop check");
  paragraph(
    doc,
    "For each load: the lowest voltage it receives over the operating cases checked, the drop from the source as a percentage of the nominal voltage, and the limit it is held to.",
    { size: TYPE.small, color: MUTED, gap: 6 },
  );
  if (snapshot.systems.length === 0) paragraph(doc, "This quote covers no wiring systems.");
  for (const system of snapshot.systems) drawSystem(doc, system);

  doc.moveDown(0.6);
  // Safety text is never optional: an older snapshot without cautions still prints today's.
  cautionsBox(doc, snapshot.cautions.length > 0 ? snapshot.cautions : CAUTIONS);

  if (snapshot.terms.trim()) {
    sectionHeading(doc, "Terms", 40);
    for (const para of snapshot.terms.split(/\n{2,}/)) paragraph(doc, para.trim(), { size: TYPE.small, gap: 5 });
  }

  if (options.acceptUrl) drawAcceptLink(doc, options.acceptUrl);

  addPageFooters(doc, `${snapshot.company.name}  ·  Quote ${options.label}  ·  ${snapshot.job.title}`);
  doc.end();
  return bytes;
}

// ---------------------------------------------------------------- priced lines and totals

const UNIT_WORDS: Record<PricedLine["unit"], [string, string]> = { m: ["m", "m"], ft: ["ft", "ft"], each: ["each", "each"], hour: ["hour", "hours"] };

function quantityText(line: PricedLine): string {
  const [one, many] = UNIT_WORDS[line.unit];
  return `${formatNumber(line.quantity, 3)} ${line.quantity === 1 ? one : many}`;
}

function drawLines(doc: Doc, lines: readonly PricedLine[], currency: string): void {
  const heading = "Priced items";
  if (lines.length === 0) {
    sectionHeading(doc, heading);
    paragraph(doc, "No priced items.", { color: MUTED });
    return;
  }
  const rows: TableRow[] = [];
  for (const category of PRICE_CATEGORIES) {
    const group = lines.filter((l) => l.category === category);
    if (group.length === 0) continue;
    rows.push({ kind: "group", cells: [CATEGORY_LABELS[category]] });
    for (const line of group) {
      rows.push({ cells: [{ text: line.description, note: line.detail || undefined }, line.sku ?? "—", quantityText(line), formatMoney(line.sellMinor, currency)] });
    }
    const sum = group.reduce((s, l) => s + l.sellMinor, 0);
    rows.push({ kind: "sum", cells: [`${CATEGORY_LABELS[category]} subtotal`, "", "", formatMoney(sum, currency)] });
  }
  drawTable(
    doc,
    [
      { header: "Item", width: 50 },
      { header: "SKU", width: 17 },
      { header: "Quantity", width: 15, align: "right" },
      { header: "Amount", width: 18, align: "right" },
    ],
    rows,
    { lead: (keepWith) => sectionHeading(doc, heading, keepWith) },
  );
}

function percentText(percent: number): string {
  return `${formatNumber(percent, 3)} %`;
}

function drawTotals(doc: Doc, snapshot: QuoteSnapshot): void {
  const { totals, currency } = snapshot;
  const money = (minor: number) => formatMoney(minor, currency);
  const rows: Array<{ label: string; value: string; strong?: boolean; tint?: boolean }> = [{ label: "Subtotal", value: money(totals.subtotalMinor) }];
  if (totals.discountMinor > 0) rows.push({ label: "Discount", value: `− ${money(totals.discountMinor)}` });
  rows.push({ label: `Tax (${percentText(totals.taxRatePercent)})`, value: money(totals.taxMinor) });
  rows.push({ label: "Total", value: money(totals.totalMinor), strong: true });
  // A quote without a deposit (fixed at 0) does not ask for one.
  if (totals.depositMinor > 0) rows.push({ label: "Deposit due on acceptance", value: money(totals.depositMinor), strong: true, tint: true });

  const box = contentBox(doc);
  const width = 300;
  const valueWidth = 110;
  const x = box.right - width;
  const rowHeight = 17;
  ensureSpace(doc, rows.length * rowHeight + 24);
  doc.y += 4;
  for (const row of rows) {
    const y = doc.y;
    if (row.tint) doc.rect(x, y, width, rowHeight).fillColor(COPPER_TINT).fill();
    if (row.label === "Total") doc.moveTo(x, y).lineTo(box.right, y).lineWidth(1).strokeColor(COPPER).stroke();
    doc.font(row.strong ? FONT.bold : FONT.regular).fontSize(row.strong ? 10 : TYPE.body).fillColor(INK);
    doc.text(row.label, x + 6, y + 4, { width: width - valueWidth - 12, lineBreak: false });
    doc.text(row.value, x + width - valueWidth - 6, y + 4, { width: valueWidth, align: "right", lineBreak: false });
    doc.y = y + rowHeight;
  }
  doc.font(FONT.regular).fontSize(TYPE.note).fillColor(MUTED).text(`Amounts in ${currency}.`, x, doc.y + 3, { width: width - 6, align: "right" });
  doc.x = box.left;
  doc.y += 6;
  doc.fillColor(INK);
}

// ---------------------------------------------------------------- voltage drop

function drawSystem(doc: Doc, system: SnapshotSystem): void {
  const p = system.limitProfile;
  const unit = lengthUnit(system.units);
  const counts = (["within", "near", "over"] as const).map((s) => `${system.loads.filter((l) => l.status === s).length} ${STATUS_STYLE[s].words.toLowerCase()}`);
  // The system's heading is drawn by the first table, so that it never ends a page alone.
  let headed = false;
  const heading = (keepWith: number) => {
    if (headed) return;
    headed = true;
    subheading(
      doc,
      system.name,
      `${formatNumber(system.nominalVoltage)} V nominal  ·  lengths in ${unit}  ·  limit profile: ${p.name} (branch ${percentText(p.branchPercent)}, total ${percentText(p.totalPercent)}, critical loads ${percentText(p.criticalPercent)})` +
        (system.loads.length > 0 ? `  ·  ${system.loads.length} load${system.loads.length === 1 ? "" : "s"}: ${counts.join(", ")}` : ""),
      keepWith,
    );
  };
  if (!system.solved) {
    heading(40);
    paragraph(doc, "This system could not be checked when the quote was made, so it has no voltage-drop figures.", { color: STATUS_STYLE.over.color, bold: true });
    return;
  }

  if (system.loads.length > 0) {
    drawTable(
      doc,
      [
        { header: "Load", width: 27 },
        { header: "Worst case", width: 22 },
        { header: "Voltage", width: 11, align: "right" },
        { header: "Drop", width: 10, align: "right" },
        { header: "Limit", width: 10, align: "right" },
        { header: "Status", width: 20 },
      ],
      system.loads.map((l) => ({
        cells: [
          l.name,
          l.worstCase,
          `${formatFixed(l.voltage, 2)} V`,
          `${formatFixed(l.dropPercent, 2)} %`,
          percentText(l.limitPercent),
          { text: STATUS_STYLE[l.status].words, status: l.status, bold: true, color: STATUS_STYLE[l.status].color },
        ],
      })),
      { lead: heading },
    );
  } else {
    heading(40);
    paragraph(doc, "No loads.", { color: MUTED });
  }

  if (system.runs.length > 0) {
    const name = pointNamer(system.points);
    drawTable(
      doc,
      [
        { header: "Run", width: 40 },
        { header: "Size", width: 20 },
        { header: "Material", width: 13 },
        { header: `One-way length (${unit})`, width: 14, align: "right" },
        { header: "Max current", width: 13, align: "right" },
      ],
      system.runs.map((r) => ({
        cells: [
          r.name || `${name(r.from)} → ${name(r.to)}`,
          runSizeText(r),
          materialLabel(r.material),
          `${formatNumber(r.length, 2)} ${unit}`,
          r.maxCurrentA === null ? "—" : `${formatFixed(r.maxCurrentA, 1)} A`,
        ],
      })),
    );
  }
}

function runSizeText(run: SnapshotSystem["runs"][number]): string {
  const size = run.parallel > 1 ? `${run.parallel} × ${sizeLabel(run.size)}` : sizeLabel(run.size);
  return run.returnSize && run.returnSize !== run.size ? `${size}, return ${sizeLabel(run.returnSize)}` : size;
}

// ---------------------------------------------------------------- accept link

function drawAcceptLink(doc: Doc, url: string): void {
  const box = contentBox(doc);
  doc.font(FONT.bold).fontSize(10);
  ensureSpace(doc, doc.heightOfString(`Accept this quote online: ${url}`, { width: box.width - 20 }) + 30);
  doc.moveDown(0.8);
  const top = doc.y;
  doc.fillColor(INK).text("Accept this quote online: ", box.left + 10, top + 9, { width: box.width - 20, continued: true });
  doc.font(FONT.regular).fillColor(COPPER).text(url, { link: url, underline: true });
  const bottom = doc.y + 7;
  doc.rect(box.left, top, box.width, bottom - top).lineWidth(0.75).strokeColor(COPPER).stroke();
  doc.x = box.left;
  doc.y = bottom + 6;
  doc.fillColor(INK).strokeColor(INK);
}
