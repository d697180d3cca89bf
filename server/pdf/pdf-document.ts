// What the quote and the cut list share: the page, the palette, the letterhead, tables that break
// across pages with their header row repeated, the framed cautions, and "Page N of M" footers.
//
// pdfkit draws at absolute positions and adds a page on its own when text runs past the bottom
// margin. Tables and boxes therefore measure first and break the page themselves, so that no row
// or frame is ever split by pdfkit in the middle of drawing it.
import PDFDocument from "pdfkit";
import type { QuoteSnapshot } from "../../shared/schemas/estimates.js";
import { checkImage, LOGO_IMAGES } from "../images.js";
import { FONT, registerFonts } from "./fonts.js";

type Doc = PDFKit.PDFDocument;

// ---------------------------------------------------------------- palette and type

/** Deep slate ink for text and rules, copper for the accent (DESIGN.md §6). */
export const INK = "#1f2b37";
export const MUTED = "#5b6877";
export const RULE = "#cdd4dc";
export const SHADE = "#eef1f4";
export const COPPER = "#b86632";
export const COPPER_TINT = "#f8ede5";

export type LimitStatus = "within" | "near" | "over";

/** Colour is never the only signal: each status also has its words and its own marker shape. */
export const STATUS_STYLE: Record<LimitStatus, { words: string; color: string; shape: "circle" | "triangle" | "square" }> = {
  within: { words: "Within limit", color: "#1c7a70", shape: "circle" },
  // Darker than a signal amber so the words stay readable on white paper.
  near: { words: "Near limit", color: "#a86d0c", shape: "triangle" },
  over: { words: "Over limit", color: "#a8392a", shape: "square" },
};

export const TYPE = { body: 9, small: 8, table: 8.25, note: 7.25, heading: 11.5, subheading: 10 } as const;

const MARGIN = { top: 48, bottom: 58, left: 50, right: 50 };
/** The footer sits inside the bottom margin, this far above the paper's edge. */
const FOOTER_FROM_EDGE = 34;

// ---------------------------------------------------------------- the document and its bytes

export interface PdfHandle {
  doc: Doc;
  /** Resolves with the whole file once `doc.end()` has been called. */
  bytes: Promise<Buffer>;
}

/** An A4 document with our fonts registered, its pages kept in memory for the footers. */
export function createPdf(info: { title: string; subject: string; author: string; landscape?: boolean }): PdfHandle {
  const doc = new PDFDocument({
    size: "A4",
    layout: info.landscape ? "landscape" : "portrait",
    margins: MARGIN,
    bufferPages: true,
    // No default Helvetica: every glyph comes from the embedded TTFs (pdfkit's standard fonts
    // only cover WinAnsi, so Ω or ² would come out wrong).
    font: null as unknown as string,
    info: { Title: info.title, Subject: info.subject, Author: info.author, Creator: "Runwright" },
    pdfVersion: "1.7",
  });
  const chunks: Buffer[] = [];
  const bytes = new Promise<Buffer>((resolve, reject) => {
    doc.on("data", (chunk: Buffer) => chunks.push(chunk));
    doc.on("end", () => resolve(Buffer.concat(chunks)));
    doc.on("error", reject);
  });
  registerFonts(doc);
  doc.fillColor(INK).strokeColor(INK).fontSize(TYPE.body);
  return { doc, bytes };
}

export interface Box {
  left: number;
  right: number;
  width: number;
  top: number;
  bottom: number;
}

export function contentBox(doc: Doc): Box {
  const { width, height, margins } = doc.page;
  return { left: margins.left, right: width - margins.right, width: width - margins.left - margins.right, top: margins.top, bottom: height - margins.bottom };
}

/** Starts a new page when less than `height` is left on this one. */
export function ensureSpace(doc: Doc, height: number): void {
  if (doc.y + height > contentBox(doc).bottom) newPage(doc);
}

export function newPage(doc: Doc): void {
  doc.addPage();
  doc.x = contentBox(doc).left;
}

/** Writes "Page N of M" (and a running title) on every page, once the page count is known. */
export function addPageFooters(doc: Doc, runningTitle: string): void {
  const range = doc.bufferedPageRange();
  const total = range.count;
  for (let i = range.start; i < range.start + total; i++) {
    doc.switchToPage(i);
    const box = contentBox(doc);
    // Inside the bottom margin pdfkit would start another page for the text; lift the margin
    // while writing the footer and put it back after.
    const bottom = doc.page.margins.bottom;
    doc.page.margins.bottom = 0;
    const y = doc.page.height - FOOTER_FROM_EDGE;
    doc.moveTo(box.left, y - 6).lineTo(box.right, y - 6).lineWidth(0.5).strokeColor(RULE).stroke();
    doc.font(FONT.regular).fontSize(TYPE.note).fillColor(MUTED);
    const pageText = `Page ${i - range.start + 1} of ${total}`;
    const pageWidth = doc.widthOfString(pageText);
    const lineHeight = doc.currentLineHeight(true);
    doc.text(runningTitle, box.left, y, { width: box.width - pageWidth - 16, height: lineHeight, ellipsis: true, lineBreak: true });
    doc.text(pageText, box.right - pageWidth - 1, y, { width: pageWidth + 1, lineBreak: false });
    doc.page.margins.bottom = bottom;
  }
  doc.fillColor(INK).strokeColor(INK);
}

// ---------------------------------------------------------------- formatting

/** "16 mm2" (how sizes are stored) → "16 mm²". */
export function sizeLabel(size: string): string {
  return size.replace(/mm2\b/g, "mm²");
}

const numberFormats = new Map<number, Intl.NumberFormat>();
/** 1234.5 → "1,234.5": at most `digits` decimals, no trailing zeros. */
export function formatNumber(value: number, digits = 2): string {
  let f = numberFormats.get(digits);
  if (!f) numberFormats.set(digits, (f = new Intl.NumberFormat("en-US", { maximumFractionDigits: digits })));
  return f.format(value);
}

/** Exactly `digits` decimals ("23.40"), for columns of measured figures. */
export function formatFixed(value: number, digits: number): string {
  return value.toLocaleString("en-US", { minimumFractionDigits: digits, maximumFractionDigits: digits });
}

const MONTHS = ["Jan", "Feb", "Mar", "Apr", "May", "Jun", "Jul", "Aug", "Sep", "Oct", "Nov", "Dec"];
/** "2026-08-29" or an ISO time → "29 Aug 2026": the day first and the month in words, which reads
 * the same to clients on either side of the Atlantic. The calendar date as written (UTC for times). */
export function formatDate(iso: string): string {
  const m = /^(\d{4})-(\d{2})-(\d{2})/.exec(iso);
  if (!m) return iso;
  return `${Number(m[3])} ${MONTHS[Number(m[2]) - 1] ?? m[2]} ${m[1]}`;
}

export function lengthUnit(units: "metric" | "imperial"): "m" | "ft" {
  return units === "imperial" ? "ft" : "m";
}

export function materialLabel(material: "copper" | "aluminum"): string {
  return material === "copper" ? "Copper" : "Aluminum";
}

/** A run's end as a name: snapshots carry point ids in runs and the names in `points`. */
export function pointNamer(points: ReadonlyArray<{ id: string; name: string }>): (idOrName: string) => string {
  const names = new Map(points.map((p) => [p.id, p.name]));
  return (idOrName) => names.get(idOrName) || idOrName;
}

// ---------------------------------------------------------------- headings and text

export function sectionHeading(doc: Doc, text: string, keepWith = 60): void {
  const box = contentBox(doc);
  doc.font(FONT.bold).fontSize(TYPE.heading);
  const lineHeight = doc.currentLineHeight(true);
  const space = lineHeight * 0.4;
  const h = space + doc.heightOfString(text, { width: box.width }) + 7.5;
  ensureSpace(doc, h + keepWith);
  // No space above a heading at the top of a page.
  const y = doc.y > box.top ? doc.y + space : doc.y;
  doc.fillColor(COPPER).text(text, box.left, y, { width: box.width });
  const lineY = doc.y + 1.5;
  doc.moveTo(box.left, lineY).lineTo(box.right, lineY).lineWidth(0.75).strokeColor(COPPER).stroke();
  doc.y = lineY + 6;
  doc.x = box.left;
  doc.fillColor(INK).strokeColor(INK).font(FONT.regular).fontSize(TYPE.body);
}

export function subheading(doc: Doc, text: string, detail: string | null, keepWith = 50): void {
  const box = contentBox(doc);
  const space = 4;
  doc.font(FONT.bold).fontSize(TYPE.subheading);
  const h = doc.heightOfString(text, { width: box.width });
  doc.font(FONT.regular).fontSize(TYPE.small);
  const d = detail ? 1 + doc.heightOfString(detail, { width: box.width }) : 0;
  ensureSpace(doc, space + h + d + 4 + keepWith);
  const y = doc.y > box.top ? doc.y + space : doc.y;
  doc.font(FONT.bold).fontSize(TYPE.subheading).fillColor(INK).text(text, box.left, y, { width: box.width });
  if (detail) doc.font(FONT.regular).fontSize(TYPE.small).fillColor(MUTED).text(detail, box.left, doc.y + 1, { width: box.width });
  doc.y += 4;
  doc.x = box.left;
  doc.fillColor(INK).font(FONT.regular).fontSize(TYPE.body);
}

/** A flowing paragraph at the left margin (pdfkit carries long ones over to the next page). */
export function paragraph(doc: Doc, text: string, options: { size?: number; color?: string; bold?: boolean; gap?: number } = {}): void {
  const box = contentBox(doc);
  doc.font(options.bold ? FONT.bold : FONT.regular).fontSize(options.size ?? TYPE.body).fillColor(options.color ?? INK);
  ensureSpace(doc, doc.currentLineHeight(true));
  doc.text(text, box.left, doc.y, { width: box.width, paragraphGap: options.gap ?? 3 });
  doc.x = box.left;
  doc.fillColor(INK);
}

/** Items with a copper bullet and a hanging indent. */
export function bulletList(doc: Doc, items: readonly string[]): void {
  const box = contentBox(doc);
  const indent = 12;
  doc.font(FONT.regular).fontSize(TYPE.body);
  for (const item of items) {
    const h = doc.heightOfString(item, { width: box.width - indent });
    // Short items stay whole; a very long one may flow on to the next page.
    ensureSpace(doc, Math.min(h, doc.currentLineHeight(true) * 3));
    const y = doc.y;
    doc.circle(box.left + 3, y + TYPE.body * 0.62, 1.6).fillColor(COPPER).fill();
    doc.fillColor(INK).text(item, box.left + indent, y, { width: box.width - indent, paragraphGap: 2.5 });
  }
  doc.x = box.left;
}

export interface InfoColumn {
  heading: string;
  lines: ReadonlyArray<string | null>;
}

/** Side-by-side blocks of labelled lines (client and site; job details). Null lines are left out. */
export function infoColumns(doc: Doc, columns: readonly InfoColumn[]): void {
  const box = contentBox(doc);
  const gap = 18;
  const width = (box.width - gap * (columns.length - 1)) / columns.length;
  const measure = (c: InfoColumn) => {
    doc.font(FONT.bold).fontSize(TYPE.small);
    let h = doc.currentLineHeight(true) + 3;
    doc.font(FONT.regular).fontSize(TYPE.body);
    for (const line of c.lines) if (line) h += doc.heightOfString(line, { width });
    return h;
  };
  const height = Math.max(...columns.map(measure));
  ensureSpace(doc, Math.min(height, box.bottom - box.top));
  const top = doc.y;
  let bottom = top;
  columns.forEach((c, i) => {
    const x = box.left + i * (width + gap);
    doc.font(FONT.bold).fontSize(TYPE.small).fillColor(COPPER).text(c.heading.toUpperCase(), x, top, { width, characterSpacing: 0.6 });
    doc.y += 3;
    doc.font(FONT.regular).fontSize(TYPE.body).fillColor(INK);
    for (const line of c.lines) if (line) doc.text(line, x, doc.y, { width });
    // A column may have flowed on to a later page only if it was taller than a page: rare,
    // and then the rest simply follows it.
    bottom = Math.max(bottom, doc.y);
  });
  doc.x = box.left;
  doc.y = bottom + 6;
}

// ---------------------------------------------------------------- letterhead

export interface Letterhead {
  company: QuoteSnapshot["company"];
  title: string;
  /** Right-hand lines under the title: the label first (bold), then dates or job facts. */
  facts: readonly string[];
}

/**
 * Decodes the company's logo; null when there is none, pdfkit cannot read it, or its header claims
 * more pixels than a logo upload accepts (one stored before that check, or in an older quote's
 * snapshot): pdfkit would unpack every pixel.
 */
function logoBytes(logo: QuoteSnapshot["company"]["logo"]): Buffer | null {
  if (!logo || !/^image\/(png|jpe?g)$/i.test(logo.mediaType)) return null;
  const bytes = Buffer.from(logo.base64, "base64");
  if (bytes.length === 0) return null;
  try {
    if (!checkImage(bytes, LOGO_IMAGES)) return null;
  } catch {
    return null;
  }
  return bytes;
}

export function drawLetterhead(doc: Doc, head: Letterhead): void {
  const box = contentBox(doc);
  const top = box.top;
  const rightWidth = 200;
  const leftWidth = box.width - rightWidth - 24;

  const logo = logoBytes(head.company.logo);
  let y = top;
  if (logo) {
    try {
      doc.image(logo, box.left, top, { fit: [150, 48] });
      y = top + 48 + 8;
    } catch {
      // The upload was checked as PNG/JPEG, but a file pdfkit cannot decode must not stop the
      // quote from being sent: it goes out without the logo.
    }
  }
  const c = head.company;
  doc.font(FONT.bold).fontSize(14).fillColor(INK).text(c.name, box.left, y, { width: leftWidth });
  doc.y += 2;
  doc.font(FONT.regular).fontSize(TYPE.small).fillColor(MUTED);
  const contact = [c.contactEmail, c.phone].filter(Boolean).join("  ·  ");
  for (const line of [c.licenceNumber ? `Licence ${c.licenceNumber}` : null, contact || null, c.address]) {
    if (line) doc.text(line, box.left, doc.y, { width: leftWidth });
  }
  const leftBottom = doc.y;

  const rx = box.right - rightWidth;
  doc.font(FONT.bold).fontSize(20).fillColor(COPPER).text(head.title, rx, top - 2, { width: rightWidth, align: "right" });
  head.facts.forEach((fact, i) => {
    doc.font(i === 0 ? FONT.bold : FONT.regular).fontSize(i === 0 ? 10.5 : TYPE.small).fillColor(i === 0 ? INK : MUTED);
    doc.text(fact, rx, doc.y + (i === 0 ? 2 : 0.5), { width: rightWidth, align: "right" });
  });
  const bottom = Math.max(leftBottom, doc.y) + 8;
  doc.moveTo(box.left, bottom).lineTo(box.right, bottom).lineWidth(1.5).strokeColor(COPPER).stroke();
  doc.x = box.left;
  doc.y = bottom + 12;
  doc.fillColor(INK).strokeColor(INK);
}

// ---------------------------------------------------------------- tables

export interface TableColumn {
  header: string;
  /** Share of the table's width; the shares are scaled to add up to the whole. */
  width: number;
  align?: "left" | "right" | "center";
}

export interface CellSpec {
  text: string;
  /** A smaller muted line under the text (a price line's quantity rule). */
  note?: string;
  bold?: boolean;
  color?: string;
  /** Draws the status marker before the text, in the status colour. */
  status?: LimitStatus;
  /** An empty square to tick by hand (the cut list's "Done"). */
  tickBox?: boolean;
}
export type Cell = string | CellSpec;

export interface TableRow {
  cells: Cell[];
  /** "group": one full-width heading cell kept with the next row; "sum": bold, ruled above. */
  kind?: "body" | "group" | "sum";
}

const PAD_X = 4;
const PAD_Y = 3.5;
const MARKER = 10;

/**
 * heightOfString in the current font and size. Most cells hold one short line: its width alone
 * says so, which is far cheaper than running pdfkit's line wrapper (a third of a render's time).
 */
function textHeight(doc: Doc, text: string, width: number): number {
  if (!text || (!text.includes("\n") && doc.widthOfString(text) <= width)) return doc.currentLineHeight(true);
  return doc.heightOfString(text, { width });
}

function spec(cell: Cell | undefined): CellSpec {
  return typeof cell === "string" ? { text: cell } : (cell ?? { text: "" });
}

export interface TableOptions {
  /**
   * Draws what must stay on the same page as the table's start (its heading), given the height
   * the table needs below it; the heading then breaks the page if both do not fit.
   */
  lead?: (keepWith: number) => void;
}

/**
 * Draws a table from the current y at the left margin. A row never splits: when it does not fit,
 * the page breaks and the header row is drawn again. A cell taller than a whole page (only
 * hostile input does that) is cut off with an ellipsis instead of running off the paper.
 */
export function drawTable(doc: Doc, columns: readonly TableColumn[], rows: readonly TableRow[], options: TableOptions = {}): void {
  const box = contentBox(doc);
  const share = columns.reduce((s, c) => s + c.width, 0);
  const widths = columns.map((c) => (c.width / share) * box.width);
  const xs = widths.map((_, i) => box.left + widths.slice(0, i).reduce((s, w) => s + w, 0));

  const textWidth = (i: number, cell: CellSpec) => widths[i] - 2 * PAD_X - (cell.status ? MARKER : 0) - (cell.tickBox ? MARKER : 0);

  const headerHeight = () => {
    doc.font(FONT.bold).fontSize(TYPE.note);
    return Math.max(...columns.map((c, i) => doc.heightOfString(c.header, { width: widths[i] - 2 * PAD_X }))) + 2 * PAD_Y;
  };
  const maxRow = box.bottom - box.top - headerHeight() - 4;

  // Heights measured once per cell and reused when drawing (text layout is most of the time a
  // render takes).
  interface Measured {
    main: number;
    note: number;
  }
  const measureCell = (cell: CellSpec, width: number, kind: TableRow["kind"]): Measured => {
    doc.font(cell.bold || kind === "group" || kind === "sum" ? FONT.bold : FONT.regular).fontSize(TYPE.table);
    const main = textHeight(doc, cell.text, width);
    if (!cell.note) return { main, note: 0 };
    doc.font(FONT.regular).fontSize(TYPE.note);
    return { main, note: 1 + textHeight(doc, cell.note, width) };
  };
  const measureRow = (row: TableRow): { height: number; cells: Measured[] } => {
    if (row.kind === "group") {
      const m = measureCell(spec(row.cells[0]), box.width - 2 * PAD_X, "group");
      return { height: Math.min(m.main + m.note, maxRow) + 2 * PAD_Y + 2, cells: [m] };
    }
    const cells = columns.map((_, i) => measureCell(spec(row.cells[i]), textWidth(i, spec(row.cells[i])), row.kind));
    return { height: Math.min(Math.max(...cells.map((m) => m.main + m.note)), maxRow) + 2 * PAD_Y, cells };
  };

  const drawHeader = () => {
    const h = headerHeight();
    const y = doc.y;
    doc.rect(box.left, y, box.width, h).fillColor(SHADE).fill();
    doc.font(FONT.bold).fontSize(TYPE.note).fillColor(MUTED);
    columns.forEach((c, i) => doc.text(c.header, xs[i] + PAD_X, y + PAD_Y, { width: widths[i] - 2 * PAD_X, align: c.align ?? "left" }));
    doc.moveTo(box.left, y + h).lineTo(box.right, y + h).lineWidth(0.75).strokeColor(MUTED).stroke();
    doc.y = y + h;
  };

  const drawText = (cell: CellSpec, m: Measured, x: number, y: number, width: number, height: number, align: TableColumn["align"], kind: TableRow["kind"]) => {
    const bold = cell.bold || kind === "group" || kind === "sum";
    doc.font(bold ? FONT.bold : FONT.regular).fontSize(TYPE.table).fillColor(cell.color ?? INK);
    const main = m.main;
    const clip = main > height ? { height, ellipsis: true } : {};
    if (cell.text) doc.text(cell.text, x, y, { width, align: align ?? "left", ...clip });
    if (cell.note && main < height) {
      doc.font(FONT.regular).fontSize(TYPE.note).fillColor(MUTED);
      doc.text(cell.note, x, y + main + 1, { width, align: align ?? "left", height: height - main - 1, ellipsis: true });
    }
  };

  const drawRow = (row: TableRow, measured: { height: number; cells: Measured[] }) => {
    const h = measured.height;
    const y = doc.y;
    if (row.kind === "group") {
      doc.rect(box.left, y + 2, box.width, h - 2).fillColor(COPPER_TINT).fill();
      drawText({ ...spec(row.cells[0]), color: INK }, measured.cells[0], box.left + PAD_X, y + 2 + PAD_Y, box.width - 2 * PAD_X, h - 2 - 2 * PAD_Y, "left", "group");
    } else {
      if (row.kind === "sum") doc.moveTo(box.left, y).lineTo(box.right, y).lineWidth(0.75).strokeColor(INK).stroke();
      columns.forEach((c, i) => {
        const cell = spec(row.cells[i]);
        let x = xs[i] + PAD_X;
        if (cell.status) {
          drawMarker(doc, cell.status, x + 3.5, y + PAD_Y + TYPE.table * 0.62);
          x += MARKER;
        }
        if (cell.tickBox) {
          doc.rect(x + 0.5, y + PAD_Y + 1, 7.5, 7.5).lineWidth(0.6).strokeColor(MUTED).stroke();
          x += MARKER;
        }
        drawText(cell, measured.cells[i], x, y + PAD_Y, textWidth(i, cell), h - 2 * PAD_Y, c.align, row.kind);
      });
      doc.moveTo(box.left, y + h).lineTo(box.right, y + h).lineWidth(0.4).strokeColor(RULE).stroke();
    }
    doc.y = y + h;
  };

  const measured = rows.map(measureRow);
  const heights = measured.map((m) => m.height);
  // Rows that must not be parted from the next: a group heading from its first line, a line from
  // the subtotal under it, and the last two rows of the table (no single row alone on a page).
  const keepWithNext = (i: number) => i + 1 < rows.length && (rows[i].kind === "group" || rows[i + 1].kind === "sum" || i === rows.length - 2);
  const head = headerHeight();
  const capacity = box.bottom - box.top - head;
  const chainHeight = (i: number) => {
    let h = heights[i];
    for (let j = i; keepWithNext(j); j++) h += heights[j + 1];
    // A chain taller than a page cannot be kept together (only hostile text makes one).
    return h <= capacity ? h : heights[i];
  };
  const whole = head + heights.reduce((s, h) => s + h, 0);
  // A short table moves to the next page whole rather than be split.
  const short = whole <= 0.4 * (box.bottom - box.top);
  const first = head + (rows.length > 0 ? chainHeight(0) : 0);
  if (options.lead) options.lead(short ? whole : first);
  // After a lead only the header and one row must fit: the lead's estimate may be off by a
  // little, and a heading must not be left alone for the sake of a subtotal.
  ensureSpace(doc, options.lead ? head + (heights[0] ?? 0) : short ? whole : first);
  drawHeader();
  let rowsOnPage = 0;
  rows.forEach((row, i) => {
    if (rowsOnPage > 0 && doc.y + chainHeight(i) > box.bottom) {
      newPage(doc);
      drawHeader();
      rowsOnPage = 0;
    }
    drawRow(row, measured[i]);
    rowsOnPage++;
  });
  doc.x = box.left;
  doc.y += 6;
  doc.fillColor(INK).strokeColor(INK).font(FONT.regular).fontSize(TYPE.body);
}

/** Circle, triangle or square in the status colour: a second signal beside the words. */
export function drawMarker(doc: Doc, status: LimitStatus, cx: number, cy: number): void {
  const { color, shape } = STATUS_STYLE[status];
  doc.save().fillColor(color);
  if (shape === "circle") doc.circle(cx, cy, 3.1).fill();
  else if (shape === "square") doc.rect(cx - 2.9, cy - 2.9, 5.8, 5.8).fill();
  else doc.polygon([cx, cy - 3.6], [cx + 3.6, cy + 2.8], [cx - 3.6, cy + 2.8]).fill();
  doc.restore();
}

// ---------------------------------------------------------------- cautions

/**
 * The cautions in a copper frame. Each caution stays whole; if they do not all fit on the page,
 * the frame closes and continues on the next page.
 */
export function cautionsBox(doc: Doc, cautions: readonly string[], heading = "Safety cautions"): void {
  const box = contentBox(doc);
  const pad = 10;
  const indent = 12;
  const inner = box.width - 2 * pad - indent;
  doc.font(FONT.bold).fontSize(TYPE.subheading);
  const headingHeight = doc.currentLineHeight(true) + 5;
  doc.font(FONT.regular).fontSize(TYPE.body);
  const heights = cautions.map((c) => doc.heightOfString(c, { width: inner, paragraphGap: 3 }));
  const maxItem = box.bottom - box.top - headingHeight - 2 * pad;

  let i = 0;
  let first = true;
  while (i < cautions.length || first) {
    const need = headingHeight + 2 * pad + Math.min(heights[i] ?? 0, maxItem);
    ensureSpace(doc, need);
    const top = doc.y + 4;
    let y = top + pad;
    const left = box.left + pad;
    doc.font(FONT.bold).fontSize(TYPE.subheading).fillColor(COPPER).text(first ? heading : `${heading} (continued)`, left, y, { width: box.width - 2 * pad });
    y = doc.y + 5;
    first = false;
    let drawn = 0;
    while (i < cautions.length) {
      const h = Math.min(heights[i], maxItem);
      if (drawn > 0 && y + h + pad > box.bottom) break;
      doc.fillColor(COPPER).font(FONT.bold).fontSize(TYPE.body).text("!", left, y, { width: indent, lineBreak: false });
      doc.font(FONT.regular).fontSize(TYPE.body).fillColor(INK);
      doc.text(cautions[i], left + indent, y, { width: inner, paragraphGap: 3, ...(heights[i] > maxItem ? { height: maxItem, ellipsis: true } : {}) });
      y += h;
      i++;
      drawn++;
    }
    const bottom = y + pad - 3;
    doc.rect(box.left, top, box.width, bottom - top).lineWidth(1.2).strokeColor(COPPER).stroke();
    doc.y = bottom + 8;
    if (i < cautions.length) newPage(doc);
  }
  doc.x = box.left;
  doc.fillColor(INK).strokeColor(INK).font(FONT.regular).fontSize(TYPE.body);
}
