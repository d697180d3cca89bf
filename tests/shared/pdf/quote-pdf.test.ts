// The quote and cut-list PDFs, read back with poppler's pdftotext/pdfinfo: what the client and the
// installer will actually see, not what we meant to draw. No database: the renderers take a
// snapshot and return bytes.
import { execFileSync } from "node:child_process";
import { existsSync, mkdtempSync, rmSync, writeFileSync } from "node:fs";
import os from "node:os";
import path from "node:path";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { formatMoney } from "../../../shared/money.js";
import type { QuoteSnapshot } from "../../../shared/schemas/estimates.js";
import { renderCutListPdf } from "../../../server/pdf/cut-list-pdf.js";
import { renderQuotePdf } from "../../../server/pdf/quote-pdf.js";
import { largeSnapshot, sampleSnapshot } from "../../support/quote-snapshot.js";
import { pngClaiming } from "../../server/hostile/hostile-files.js";

const PDFTOTEXT = "/usr/bin/pdftotext";
const PDFINFO = "/usr/bin/pdfinfo";
const LABEL = "Q-2026-0042 R2";
const ACCEPT_URL = "https://app.runwright.example/q/7hQk2mZpL0v";
const STATUS_WORDS = { within: "Within limit", near: "Near limit", over: "Over limit" } as const;

let dir = "";
let fileCount = 0;

beforeAll(() => {
  // Fail, never skip: without poppler these tests would prove nothing.
  for (const tool of [PDFTOTEXT, PDFINFO]) {
    if (!existsSync(tool)) throw new Error(`${tool} is missing: apt-get install poppler-utils`);
  }
  dir = mkdtempSync(path.join(os.tmpdir(), "runwright-pdf-"));
});
afterAll(() => {
  if (dir) rmSync(dir, { recursive: true, force: true });
});

function save(pdf: Buffer): string {
  const file = path.join(dir, `doc-${++fileCount}.pdf`);
  writeFileSync(file, pdf);
  return file;
}

/** The text as laid out on the pages (columns kept on their lines); pages split at form feeds. */
function layoutText(pdf: Buffer): string {
  return execFileSync(PDFTOTEXT, ["-layout", "-enc", "UTF-8", save(pdf), "-"], { encoding: "utf8" });
}

function pageCount(pdf: Buffer): number {
  const info = execFileSync(PDFINFO, [save(pdf)], { encoding: "utf8" });
  const m = /^Pages:\s+(\d+)$/m.exec(info);
  if (!m) throw new Error(`pdfinfo gave no page count:\n${info}`);
  return Number(m[1]);
}

/** Runs of spaces and line breaks as one space: wrapped paragraphs read as one line. */
const squash = (text: string) => text.replace(/\s+/g, " ");

/** The single line of the layout text that holds `needle` (fails when none or several do). */
function lineWith(text: string, needle: string): string {
  const lines = text.split("\n").filter((l) => l.includes(needle));
  expect(lines, `one line containing ${JSON.stringify(needle)}`).toHaveLength(1);
  return lines[0];
}

/** The single table row whose first cell is `first` (then at least two spaces: the next column). */
function rowOf(text: string, first: string): string {
  const lines = text.split("\n").filter((l) => l.trimStart().startsWith(`${first}  `));
  expect(lines, `one row starting with ${JSON.stringify(first)}`).toHaveLength(1);
  return lines[0];
}

function expectValidPdf(pdf: Buffer) {
  expect(pdf.subarray(0, 5).toString("latin1")).toBe("%PDF-");
  expect(pdf.subarray(-8).toString("latin1")).toContain("%%EOF");
}

function expectPageNumbers(text: string, pages: number) {
  // pdftotext ends every page with a form feed.
  const texts = text.split("\f").filter((t, i, all) => i < all.length - 1 || t.trim() !== "");
  expect(texts).toHaveLength(pages);
  texts.forEach((t, i) => expect(t).toMatch(new RegExp(`Page ${i + 1} of ${pages}\\b`)));
}

describe("the quote PDF", () => {
  let snapshot: QuoteSnapshot;
  let pdf: Buffer;
  let text: string;
  beforeAll(async () => {
    snapshot = sampleSnapshot();
    pdf = await renderQuotePdf(snapshot, { label: LABEL, acceptUrl: ACCEPT_URL });
    text = layoutText(pdf);
  });

  it("is a PDF with the quote number and revision, the company, the client and the site", () => {
    expectValidPdf(pdf);
    expect(text).toContain(LABEL);
    expect(text).toContain(snapshot.company.name);
    expect(text).toContain(`Licence ${snapshot.company.licenceNumber}`);
    expect(text).toContain(snapshot.client.name);
    expect(text).toContain(snapshot.job.siteAddress);
    // issuedAt 2026-03-04T15:20Z and validUntil 2026-04-03, day first with the month in words
    expect(text).toContain("Issued 4 Mar 2026");
    expect(text).toContain("Valid until 3 Apr 2026");
  });

  it("gives every load its own line with its name and its status in words", () => {
    const loads = snapshot.systems.flatMap((s) => s.loads);
    expect(new Set(loads.map((l) => l.status))).toEqual(new Set(["within", "near", "over"]));
    for (const load of loads) {
      const line = rowOf(text, load.name);
      expect(line).toContain(STATUS_WORDS[load.status]);
      for (const [status, words] of Object.entries(STATUS_WORDS)) if (status !== load.status) expect(line).not.toContain(words);
      expect(line).toContain(load.worstCase);
      expect(line).toContain(`${load.voltage.toFixed(2)} V`);
    }
  });

  it("shows the total and the deposit due as formatted money, and the sell amount of every line", () => {
    const { totals, currency } = snapshot;
    expect(totals.depositMinor).toBeGreaterThan(0);
    expect(lineWith(text, "Deposit due")).toContain(formatMoney(totals.depositMinor, currency));
    expect(lineWith(text, "Subtotal ")).toContain(formatMoney(totals.subtotalMinor, currency));
    // "Total" alone on its line, not a subtotal
    const total = text.split("\n").filter((l) => /^\s*Total\s/.test(l));
    expect(total).toHaveLength(1);
    expect(total[0]).toContain(formatMoney(totals.totalMinor, currency));
    expect(lineWith(text, "Discount")).toContain(formatMoney(totals.discountMinor, currency));
    expect(lineWith(text, "Tax (8.25 %)")).toContain(formatMoney(totals.taxMinor, currency));
    for (const line of snapshot.lines) expect(rowOf(text, line.description)).toContain(formatMoney(line.sellMinor, currency));
  });

  it("never shows the contractor's cost, unit cost or margin", () => {
    const { currency } = snapshot;
    const sells = new Set(snapshot.lines.map((l) => formatMoney(l.sellMinor, currency)));
    const hidden = snapshot.lines.flatMap((l) => [l.costMinor, l.unitCostMinor]).map((m) => formatMoney(m, currency)).filter((s) => !sells.has(s));
    // The 16 mm² cable: 66 m × $4.12 = $271.92 cost, sold at $339.90 (25 % markup).
    expect(hidden).toContain("$271.92");
    for (const amount of hidden) expect(text).not.toContain(amount);
    expect(text).not.toContain(formatMoney(snapshot.totals.marginMinor, currency));
    expect(text).not.toContain(formatMoney(snapshot.totals.costMinor, currency));
    expect(text.toLowerCase()).not.toContain("markup");
  });

  it("prints every caution and the terms", () => {
    const flat = squash(text);
    expect(snapshot.cautions.length).toBeGreaterThan(0);
    for (const caution of snapshot.cautions) expect(flat).toContain(squash(caution));
    for (const para of snapshot.terms.split(/\n{2,}/)) expect(flat).toContain(squash(para));
  });

  it("numbers every page as Page N of M", () => {
    const pages = pageCount(pdf);
    expect(pages).toBeGreaterThan(1);
    expectPageNumbers(text, pages);
  });

  it("ends with the accept link as text and as a clickable link", async () => {
    expect(squash(text)).toContain(`Accept this quote online: ${ACCEPT_URL}`);
    // pdfkit writes annotation dictionaries uncompressed: the link's target is in the file as is.
    expect(pdf.toString("latin1")).toContain(`/URI (${ACCEPT_URL})`);

    const without = await renderQuotePdf(snapshot, { label: LABEL, acceptUrl: null });
    expect(layoutText(without)).not.toContain("Accept this quote online");
    expect(without.toString("latin1")).not.toContain("/URI");
  });

  it("shows each run's size with mm² and its one-way length in the system's units", () => {
    const cabin = snapshot.systems[0];
    const feeder = cabin.runs.find((r) => r.id === "feed-cabin");
    expect(feeder).toBeDefined();
    // 2 × 35 mm2 with a 25 mm2 return, 12.5 m one way, 96.4 A
    const line = lineWith(text, "Battery bus bar → Cabin distribution block");
    expect(line).toContain("2 × 35 mm²");
    expect(line).toContain("12.5 m");
    expect(line).toContain("96.4 A");
    expect(lineWith(text, "Dock post → Dock light string")).toContain("65 ft");
    expect(text).not.toContain("mm2");
  });
});

describe("the quote PDF's logo", () => {
  // pdfinfo has no image count; pdfkit writes each embedded image as an XObject of subtype /Image.
  const images = (pdf: Buffer) => (pdf.toString("latin1").match(/\/Subtype \/Image/g) ?? []).length;

  it("prints the company's logo", async () => {
    expect(images(await renderQuotePdf(sampleSnapshot(), { label: LABEL, acceptUrl: null }))).toBeGreaterThan(0);
  });

  it("leaves out a stored logo whose header claims more pixels than an upload may have, rather than unpacking it", async () => {
    const snapshot = sampleSnapshot();
    // A PNG header claiming 100,000 × 100,000 pixels (stored before uploads checked the size, or in an old snapshot).
    snapshot.company.logo = { mediaType: "image/png", base64: pngClaiming(100_000, 100_000).toString("base64") };
    const pdf = await renderQuotePdf(snapshot, { label: LABEL, acceptUrl: null });
    expect(pdf.subarray(0, 5).toString()).toBe("%PDF-");
    expect(images(pdf)).toBe(0);
    expect(layoutText(pdf)).toContain(snapshot.company.name);
  });
});

describe("the cut list PDF", () => {
  let snapshot: QuoteSnapshot;
  let pdf: Buffer;
  let text: string;
  beforeAll(async () => {
    snapshot = sampleSnapshot();
    pdf = await renderCutListPdf(snapshot, { label: LABEL });
    text = layoutText(pdf);
  });

  it("lists every run with its wire label and the names of both ends", () => {
    expectValidPdf(pdf);
    expect(text).toContain(LABEL);
    expect(text).toContain(snapshot.job.title);
    snapshot.systems.forEach((system, s) => {
      const names = new Map(system.points.map((p) => [p.id, p.name]));
      system.runs.forEach((run, r) => {
        const label = `W${s + 1}.${String(r + 1).padStart(2, "0")}`;
        const line = lineWith(text, `${label} `);
        expect(line).toContain(names.get(run.from));
        expect(line).toContain(names.get(run.to));
      });
    });
  });

  it("cuts each conductor to the one-way length plus waste, rounded up to 0.1 m or 1 ft", () => {
    expect(snapshot.wastePercent).toBe(10);
    // By hand, waste 10 %:
    //  W1.01  8 m    × 1.10 =  8.8 m   (8 × 1.1 is 8.800000000000001 in floating point: still 8.8)
    //  W1.03 12.5 m  × 1.10 = 13.75 m  → up to 13.8 m
    //  W1.04  6.4 m  × 1.10 =  7.04 m  → up to 7.1 m (rounding to nearest would give 7.0)
    //  W2.01 40 ft   × 1.10 = 44 ft    → 44 ft
    //  W2.04 23.5 ft × 1.10 = 25.85 ft → up to 26 ft
    // (pdftotext -layout may drop the narrow space in a short right-aligned "8 m": hence " ?")
    expect(lineWith(text, "W1.01 ")).toMatch(/\s8 ?m\s+8\.8 ?m\s/);
    expect(lineWith(text, "W1.03 ")).toMatch(/\s12\.5 ?m\s+13\.8 ?m\s/);
    expect(lineWith(text, "W1.04 ")).toMatch(/\s6\.4 ?m\s+7\.1 ?m\s/);
    expect(lineWith(text, "W2.01 ")).toMatch(/\s40 ?ft\s+44 ?ft\s/);
    expect(lineWith(text, "W2.04 ")).toMatch(/\s23\.5 ?ft\s+26 ?ft\s/);
    // The cabin feeder: 2 parallel sets of 35 mm², returning on 25 mm²; fused at 125 A.
    expect(lineWith(text, "W1.03 ")).toContain("125 A");
    expect(squash(lineWith(text, "W1.03 "))).toContain("2 + 2 return 25");
    // An unfused run says so.
    expect(lineWith(text, "W1.02 ")).toContain("—");
  });

  it("totals the conductor to take to site per size and material", () => {
    // 16 mm²: W1.01 and W1.02, 2 conductors each: 2 × 8.8 m + 2 × 24.2 m (22 m × 1.1) = 66 m
    expect(text.split("\n").filter((l) => /^\s*16 mm²\s+Copper\s+4\s+66 ?m\s*$/.test(l))).toHaveLength(1);
    // 25 mm²: only W1.03's return, 2 sets × 13.8 m = 27.6 m
    expect(text.split("\n").filter((l) => /^\s*25 mm²\s+Copper\s+2\s+27\.6 ?m\s*$/.test(l))).toHaveLength(1);
    // 14 AWG: W2.03, 65 ft × 1.1 = 71.5 → 72 ft, 2 conductors = 144 ft
    expect(text.split("\n").filter((l) => /^\s*14 AWG\s+Copper\s+2\s+144 ?ft\s*$/.test(l))).toHaveLength(1);
  });

  it("carries the cautions and page numbers", () => {
    const flat = squash(text);
    for (const caution of snapshot.cautions) expect(flat).toContain(squash(caution));
    expectPageNumbers(text, pageCount(pdf));
  });
});

describe("a long quote", () => {
  it("renders 100 lines over several pages, repeating the table header on each", async () => {
    const snapshot = largeSnapshot(100);
    expect(snapshot.lines).toHaveLength(100);
    const pdf = await renderQuotePdf(snapshot, { label: LABEL, acceptUrl: ACCEPT_URL });
    expectValidPdf(pdf);
    const pages = pageCount(pdf);
    expect(pages).toBeGreaterThan(1);
    const text = layoutText(pdf);
    expectPageNumbers(text, pages);
    for (const line of snapshot.lines) expect(rowOf(text, line.description)).toContain(formatMoney(line.sellMinor, snapshot.currency));
    // Every page that shows a priced line starts that table with its header row.
    const withLines = text.split("\f").filter((page) => /, item \d+\b/.test(page));
    expect(withLines.length).toBeGreaterThan(1);
    for (const page of withLines) expect(page).toMatch(/Item\s+SKU\s+Quantity\s+Amount/);
    expect(lineWith(text, "Deposit due")).toContain(formatMoney(snapshot.totals.depositMinor, snapshot.currency));
  });
});

describe("text from users", () => {
  const SCRIPT = "<script>alert(1)</script>";
  const ATTRIBUTE = '"><img onerror=x>';
  const LONG_WORD = `Ω${"ab".repeat(249)}²`; // 500 characters, no space to break at

  it("prints markup, quotes, Ω, ² and a 500-character word literally, without breaking the layout", async () => {
    const base = sampleSnapshot();
    const snapshot = sampleSnapshot({
      client: { ...base.client, name: SCRIPT },
      job: { ...base.job, title: ATTRIBUTE },
      scope: [...base.scope, LONG_WORD],
      lines: base.lines.map((l, i) => (i === 0 ? { ...l, description: `Heater element 2 Ω, 4 mm² tails ${SCRIPT}` } : l)),
      systems: base.systems.map((s, i) => (i === 0 ? { ...s, loads: s.loads.map((l, j) => (j === 0 ? { ...l, name: "Heater 2 Ω" } : l)) } : s)),
    });
    expect(LONG_WORD).toHaveLength(500);
    const pdf = await renderQuotePdf(snapshot, { label: LABEL, acceptUrl: ACCEPT_URL });
    expectValidPdf(pdf);
    const text = layoutText(pdf);
    expect(text).toContain(SCRIPT);
    expect(text).toContain(ATTRIBUTE);
    expect(lineWith(text, "Heater element 2 Ω, 4 mm² tails")).toContain(formatMoney(snapshot.lines[0].sellMinor, "USD"));
    expect(rowOf(text, "Heater 2 Ω")).toContain("Near limit");
    // The long word wraps over several lines of the scope (nothing else shares them): joined up
    // again it is the whole word, in order.
    const pieces = text.split("\n").filter((l) => l.trim() !== "" && /^\s*Ω?[ab]*²?\s*$/.test(l));
    expect(pieces.length).toBeGreaterThan(1);
    expect(pieces.map((l) => l.trim()).join("")).toBe(LONG_WORD);
    expectPageNumbers(text, pageCount(pdf));

    const cut = layoutText(await renderCutListPdf(snapshot, { label: LABEL }));
    expect(cut).toContain(ATTRIBUTE);
  });

  it("cuts off a cell taller than a page instead of running off the paper", async () => {
    const base = sampleSnapshot();
    const tall = `Start of a very long name ${"and more words ".repeat(600)}end`;
    const snapshot = sampleSnapshot({ systems: base.systems.map((s, i) => (i === 0 ? { ...s, loads: s.loads.map((l, j) => (j === 0 ? { ...l, name: tall } : l)) } : s)) });
    const pdf = await renderQuotePdf(snapshot, { label: LABEL, acceptUrl: null });
    expectValidPdf(pdf);
    const text = layoutText(pdf);
    expect(text).toContain("Start of a very long name");
    expect(text).not.toContain("more words end");
    // The rest of the quote still follows.
    expect(rowOf(text, "Galley fridge")).toContain("Within limit");
    expect(squash(text)).toContain(squash(snapshot.cautions[0]));
    expectPageNumbers(text, pageCount(pdf));
  });
});
