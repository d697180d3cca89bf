/// <reference lib="dom" />
// The whole job in headless Chromium, every step through the screens as people use them: a new
// company signs up, fills in its details and logo, imports its price list from a CSV, records a
// client and a job, lays out a 24 V system with one load over its drop limit, auto-sizes it, builds
// the estimate, creates and sends the quote; the client opens the e-mailed link in a browser of
// their own, accepts, pays the deposit on the Stripe fake's page and sees it paid; the contractor
// then sees "Deposit paid" on the quote and the deposit counted on the dashboard. The API and the
// database are only read, to check what the screens said (and the catcher, to read the e-mail).
import { mkdtempSync, rmSync, writeFileSync } from "node:fs";
import os from "node:os";
import path from "node:path";
import { deflateSync } from "node:zlib";
import type { BrowserContext, Page } from "playwright-core";
import type { DataSource } from "typeorm";
import { afterAll, beforeAll, describe, expect, inject, it } from "vitest";
import { Company, Estimate, Job, LimitProfile, Membership, Payment, PriceItem, Quote, System } from "../../server/db/entities/index.js";
import { formatMoney } from "../../shared/money.js";
import { TEST_PASSWORD, uniqueEmail } from "../support/accounts.js";
import { startTestApp, type TestApp } from "../support/app.js";
import { artifactsDir, closeBrowser, hasChromium, launchBrowser, watchPage } from "../support/browser.js";
import { linkIn, waitForMail } from "../support/mail.js";
import { CARDS } from "../support/stripe.js";
import { openTestDb } from "../support/test-db.js";

// ---------------------------------------------------------------- files the user picks

/** CRC-32 (ISO 3309, as PNG chunks use it). */
function crc32(bytes: Buffer): number {
  let crc = 0xffffffff;
  for (const byte of bytes) {
    crc ^= byte;
    for (let k = 0; k < 8; k++) crc = crc & 1 ? (crc >>> 1) ^ 0xedb88320 : crc >>> 1;
  }
  return (crc ^ 0xffffffff) >>> 0;
}

function pngChunk(type: string, data: Buffer): Buffer {
  const length = Buffer.alloc(4);
  length.writeUInt32BE(data.length);
  const body = Buffer.concat([Buffer.from(type, "ascii"), data]);
  const crc = Buffer.alloc(4);
  crc.writeUInt32BE(crc32(body));
  return Buffer.concat([length, body, crc]);
}

/** A real 96 × 32 RGB PNG: a copper field with a slate band, so the browser and the PDF can decode it. */
function logoPng(width = 96, height = 32): Buffer {
  const header = Buffer.alloc(13);
  header.writeUInt32BE(width, 0);
  header.writeUInt32BE(height, 4);
  header.set([8, 2, 0, 0, 0], 8); // 8 bits, truecolour, deflate, no filter method, no interlace
  const rows: Buffer[] = [];
  for (let y = 0; y < height; y++) {
    const row = Buffer.alloc(1 + width * 3); // filter byte 0, then RGB
    for (let x = 0; x < width; x++) {
      const band = y >= 10 && y < 22 && x >= 8 && x < width - 8;
      row.set(band ? [0x1f, 0x2a, 0x36] : [0xb8, 0x66, 0x32], 1 + x * 3);
    }
    rows.push(row);
  }
  const signature = Buffer.from([0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a]);
  return Buffer.concat([signature, pngChunk("IHDR", header), pngChunk("IDAT", deflateSync(Buffer.concat(rows))), pngChunk("IEND", Buffer.alloc(0))]);
}

/**
 * An invented price list in the price list's CSV columns: single-conductor copper cable per metre in
 * every metric size auto-size may pick, a lug per size, the fuses the layout names and a holder, and
 * one device. Costs in CAD (the company's currency, set in Settings first).
 */
const CABLE = [
  ["2.5", "0.85"],
  ["4", "1.25"],
  ["6", "1.80"],
  ["10", "3.05"],
  ["16", "4.60"],
  ["25", "7.10"],
] as const;
const LUG_COST: Record<string, string> = { "2.5": "0.65", "4": "0.65", "6": "1.90", "10": "1.90", "16": "4.20", "25": "4.20" };
const PRICE_CSV = [
  "sku,description,category,unit,unit_cost,sell_price,size,material,conductors,rating_a",
  ...CABLE.map(([size, cost]) => `FW-CU-${size},"Tinned copper cable ${size} mm², single conductor, UV-stable",cable,m,${cost},,${size} mm2,copper,1,`),
  ...CABLE.map(([size]) => `FW-LUG-${size},Tinned copper lug for ${size} mm² (crimped and heat-shrunk),termination,each,${LUG_COST[size]},,${size} mm2,,,`),
  `FW-FUSE-15,"15 A DC blade fuse, 2 kA interrupting",fuse,each,2.40,,,,,15`,
  `FW-FUSE-20,"20 A DC blade fuse, 2 kA interrupting",fuse,each,2.40,,,,,20`,
  `FW-FUSE-30,"30 A DC blade fuse, 2 kA interrupting",fuse,each,2.60,,,,,30`,
  `FW-FH-SEALED,"Sealed inline fuse holder, with cover",fuse,each,14.75,,,,,`,
  `FW-DEV-SOFTSTART,"Pump soft-start module, 24 V",device,each,96.00,149.00,,,,`,
].join("\r\n");
const PRICE_ROWS = PRICE_CSV.split("\r\n").length - 1;

// ---------------------------------------------------------------- the job

const SUFFIX = String(Date.now() % 100000);
const COMPANY_SIGNED_UP = `Fernwick Lowvolt ${SUFFIX}`;
const COMPANY = `Fernwick Lowvolt Works ${SUFFIX}`;
const CLIENT = "Odalys Brackwater";
const JOB = `Brackwater croft ${SUFFIX}: 24 V bank, well pump and studio`;
const SYSTEM = "Croft house bank";
const CURRENCY = "CAD";

const escapeRegExp = (text: string) => text.replace(/[.*+?^${}()|[\]\\]/g, "\\$&");

/** The results table's caption names it. */
const RESULTS = "Loads in their worst case, worst first";

describe.skipIf(!hasChromium)("the whole job in headless Chromium: sign-up → settings → prices → layout → auto-size → quote → acceptance → deposit", () => {
  let db: DataSource;
  let app: TestApp;
  let contractor: BrowserContext;
  let client: BrowserContext;
  let files: string;
  const shots = artifactsDir("whole-job");
  const watches: Array<{ who: string; problems: string[] }> = [];

  beforeAll(async () => {
    db = await openTestDb();
    app = await startTestApp(db, { clientDir: inject("clientDir") });
    contractor = await launchBrowser();
    client = await launchBrowser();
    // Every page either browser opens is watched, popups included.
    for (const [who, context] of [["contractor", contractor], ["client", client]] as const) {
      context.on("page", (page) => watches.push({ who, problems: watchPage(page, app.url).problems }));
    }
    files = mkdtempSync(path.join(os.tmpdir(), "runwright-whole-job-"));
  });
  afterAll(async () => {
    await closeBrowser(contractor);
    await closeBrowser(client);
    await app?.close();
    await db?.destroy();
    if (files) rmSync(files, { recursive: true, force: true });
  });

  /** A new page in a context (watched by the context's "page" listener). */
  async function openPage(context: BrowserContext): Promise<Page> {
    const page = await context.newPage();
    page.setDefaultTimeout(15_000);
    return page;
  }

  it("runs from sign-up to the deposit counted on the dashboard", async () => {
    const ownerEmail = uniqueEmail("fernwick-owner");
    const clientEmail = uniqueEmail("odalys");
    const page = await openPage(contractor);
    let shot = 0;
    const screenshot = (p: Page, name: string) => p.screenshot({ path: path.join(shots, `${String(++shot).padStart(2, "0")}-${name}.png`), fullPage: true });
    const nav = (name: string) => page.getByRole("navigation", { name: "Main", exact: true }).getByRole("link", { name, exact: true }).click();

    // ------------------------------------------------------------ 1. sign up a new company
    await page.goto(`${app.url}/sign-up`);
    await page.getByRole("heading", { name: "Create your company account", exact: true }).waitFor();
    await page.getByLabel("Company name", { exact: true }).fill(COMPANY_SIGNED_UP);
    await page.getByLabel("Your name", { exact: true }).fill("Ines Fernwick");
    await page.getByLabel("E-mail", { exact: true }).fill(ownerEmail);
    await page.getByLabel("Password", { exact: true }).fill(TEST_PASSWORD);
    await page.getByRole("button", { name: "Create account", exact: true }).click();
    await page.getByRole("heading", { level: 1, name: "Dashboard", exact: true }).waitFor();
    await page.getByRole("heading", { name: "Nothing to follow up yet", exact: true }).waitFor();
    await screenshot(page, "signed-up");
    const membership = await db.getRepository(Membership).findOneOrFail({ where: { user: { email: ownerEmail } }, relations: { user: true } });
    expect(membership.role).toBe("owner");
    const companyId = membership.companyId;

    // ------------------------------------------------------------ 2. company details and logo
    await nav("Settings");
    await page.getByRole("heading", { name: "Company", exact: true }).waitFor();
    await page.getByLabel("Company name", { exact: true }).fill(COMPANY);
    await page.getByLabel("Licence number", { exact: true }).fill("LV-4471-FW");
    await page.getByLabel("Contact e-mail", { exact: true }).fill("office@fernwick-lowvolt.test");
    await page.getByLabel("Phone", { exact: true }).fill("+1 555 0134");
    await page.getByLabel("Address", { exact: true }).fill("12 Tallow Lane\nFernwick Quay");
    await page.getByLabel("Currency", { exact: true }).fill(CURRENCY);
    await page.getByLabel("Tax rate (%)", { exact: true }).fill("5");
    await page.getByLabel("Default markup (%)", { exact: true }).fill("20");
    await page.getByLabel("Labour rate per hour", { exact: true }).fill("92.50");
    await page.getByLabel("Deposit (%)", { exact: true }).fill("30");
    await page.getByRole("button", { name: "Save settings", exact: true }).click();
    await page.getByRole("status").filter({ hasText: "Settings saved" }).waitFor();
    // The side rail takes the new name from the session.
    await page.getByText(COMPANY, { exact: true }).first().waitFor();

    await page.getByRole("heading", { name: "Company logo", exact: true }).waitFor();
    const logoFile = path.join(files, "fernwick-logo.png");
    writeFileSync(logoFile, logoPng());
    const logoChooser = page.waitForEvent("filechooser");
    await page.getByRole("button", { name: "Upload logo", exact: true }).click();
    await (await logoChooser).setFiles(logoFile);
    await page.getByRole("status").filter({ hasText: "Logo saved" }).waitFor();
    const preview = page.getByRole("img", { name: "Company logo", exact: true });
    await preview.waitFor();
    // The browser decoded the stored image: it is the one we made.
    await expect.poll(() => preview.evaluate((img) => (img as HTMLImageElement).naturalWidth), { timeout: 15_000 }).toBe(96);
    await page.getByRole("button", { name: "Replace logo", exact: true }).waitFor();
    await screenshot(page, "settings-and-logo");

    // ------------------------------------------------------------ 3. the price list from a CSV
    await nav("Price list");
    await page.getByRole("heading", { level: 1, name: "Price list", exact: true }).waitFor();
    const csvFile = path.join(files, "fernwick-prices.csv");
    writeFileSync(csvFile, PRICE_CSV, "utf8");
    const csvChooser = page.waitForEvent("filechooser");
    await page.getByRole("button", { name: "Import CSV", exact: true }).click();
    await (await csvChooser).setFiles(csvFile);
    const importDialog = page.getByRole("dialog", { name: "Import fernwick-prices.csv?", exact: true });
    await importDialog.waitFor();
    await importDialog.getByText(`${PRICE_ROWS} items to add, 0 items to change, 0 unchanged.`).waitFor();
    const toAdd = importDialog.getByRole("region", { name: "Items to add", exact: true });
    for (const sku of ["FW-CU-16", "FW-LUG-2.5", "FW-FUSE-20", "FW-FH-SEALED"]) await toAdd.getByText(sku, { exact: true }).waitFor();
    await screenshot(page, "price-list-preview");
    // Nothing is written by the preview.
    expect(await db.getRepository(PriceItem).countBy({ companyId })).toBe(0);
    await importDialog.getByRole("button", { name: "Apply import", exact: true }).click();
    await importDialog.waitFor({ state: "hidden" });
    await page.getByRole("status").filter({ hasText: `Imported fernwick-prices.csv: ${PRICE_ROWS} items added, 0 items changed, 0 unchanged.` }).waitFor();
    const cable16 = page.getByRole("table", { name: "Price list", exact: true }).getByRole("row").filter({ has: page.getByRole("rowheader", { name: "FW-CU-16", exact: true }) });
    await cable16.waitFor();
    expect(await cable16.innerText()).toContain(formatMoney(460, CURRENCY));
    await page.getByText(`${PRICE_ROWS} items · prices in ${CURRENCY}`, { exact: true }).waitFor();
    await screenshot(page, "price-list-imported");
    expect(await db.getRepository(PriceItem).countBy({ companyId })).toBe(PRICE_ROWS);

    // ------------------------------------------------------------ 4. a client and a job
    await nav("Clients");
    await page.getByRole("heading", { level: 1, name: "Clients", exact: true }).waitFor();
    await page.getByRole("button", { name: "New client", exact: true }).first().click();
    const clientDialog = page.getByRole("dialog", { name: "New client", exact: true });
    await clientDialog.getByLabel("Name", { exact: true }).fill(CLIENT);
    await clientDialog.getByLabel("E-mail", { exact: true }).fill(clientEmail);
    await clientDialog.getByLabel("Phone", { exact: true }).fill("+1 555 0199");
    await clientDialog.getByLabel("Billing address", { exact: true }).fill("Brackwater Croft\nRR 3, Lowmere");
    await clientDialog.getByRole("button", { name: "Create client", exact: true }).click();
    await page.getByRole("table", { name: "Clients", exact: true }).getByText(CLIENT, { exact: true }).waitFor();
    await screenshot(page, "client");

    await nav("Jobs");
    await page.getByRole("heading", { level: 1, name: "Jobs", exact: true }).waitFor();
    await page.getByRole("button", { name: "New job", exact: true }).click();
    const jobDialog = page.getByRole("dialog", { name: "New job", exact: true });
    await jobDialog.getByLabel("Client", { exact: true }).selectOption({ label: CLIENT });
    await jobDialog.getByLabel("Title", { exact: true }).fill(JOB);
    await jobDialog.getByLabel("Site address", { exact: true }).fill("Brackwater Croft, Lowmere");
    await jobDialog.getByRole("button", { name: "Create job", exact: true }).click();
    await page.getByRole("heading", { level: 1, name: JOB, exact: true }).waitFor();
    const job = await db.getRepository(Job).findOneOrFail({ where: { companyId, title: JOB }, relations: { client: true } });
    expect(job.client.email).toBe(clientEmail);
    await screenshot(page, "job");

    // ------------------------------------------------------------ 5. the 24 V system
    await page.getByRole("button", { name: "New system", exact: true }).click();
    const systemDialog = page.getByRole("dialog", { name: "New system", exact: true });
    await systemDialog.getByLabel("System name", { exact: true }).fill(SYSTEM);
    await systemDialog.getByLabel("Nominal voltage", { exact: true }).selectOption({ label: "24 V" });
    await systemDialog.getByLabel("Units", { exact: true }).selectOption("metric");
    await systemDialog.getByRole("button", { name: "Create system", exact: true }).click();
    await page.getByRole("heading", { name: "One-line diagram", exact: true }).waitFor();

    const focusedLabel = () => page.evaluate(() => document.activeElement?.getAttribute("aria-label") ?? "");
    /** Types into an entry-table cell as a user does: select what is there, type, Enter commits. */
    const enter = async (name: string, text: string, nameAfter = name) => {
      await page.getByLabel(name, { exact: true }).focus();
      await page.keyboard.press("Control+A");
      await page.keyboard.type(text);
      await page.keyboard.press("Enter");
      // Committed: the cell (renamed with its row when the id changed) holds a value the row's schema took.
      const cell = page.getByLabel(nameAfter, { exact: true });
      await expect.poll(async () => [await cell.inputValue(), await cell.getAttribute("aria-invalid")], { timeout: 5_000 }).toEqual([expect.stringMatching(/\S/), null]);
    };
    const choose = (name: string, value: string) => page.getByLabel(name, { exact: true }).selectOption(value);
    const tab = (name: string) => page.getByRole("tablist", { name: "Entry tables", exact: true }).getByRole("tab", { name, exact: true }).click();
    /** Adds a row and renames it; the new row's first cell has the focus. */
    const addRow = async (noun: string, expectedId: string, id = expectedId) => {
      await page.getByRole("button", { name: `Add ${noun}`, exact: true }).click();
      await expect.poll(focusedLabel, { timeout: 5_000 }).toBe(`Id of ${noun} ${expectedId}`);
      if (id !== expectedId) await enter(`Id of ${noun} ${expectedId}`, id, `Id of ${noun} ${id}`);
    };

    // The battery bank the system starts with: a 24 V LiFePO4 bank resting at 25.6 V.
    await tab("Sources");
    await enter("Name of source bank", "LiFePO4 bank 8 × 3.2 V 280 Ah");
    await enter("Voltage of source bank", "25.6");
    await enter("Internal resistance of source bank", "0.005");

    // Three points beside the bus bar.
    await tab("Points");
    await addRow("point", "p2", "cabin");
    await enter("Name of point cabin", "Cabin distribution block");
    await addRow("point", "p3", "studio");
    await enter("Name of point studio", "Studio lights");
    await addRow("point", "p4", "pump");
    await enter("Name of point pump", "Well pump controller");

    // Three runs: a fused feeder to the cabin, a branch on to the studio, and the pump's fused run
    // on 10 mm², which leaves the pump about 3.5 % down against its 3 % branch limit.
    await tab("Runs");
    const runs = [
      { id: "r1", from: "bus", to: "cabin", length: "5", size: "6", kind: "feeder", fuse: "15" },
      { id: "r2", from: "cabin", to: "studio", length: "12", size: "2.5", kind: "branch", fuse: null },
      { id: "r3", from: "bus", to: "pump", length: "20", size: "10", kind: "branch", fuse: "20" },
    ];
    for (const run of runs) {
      await addRow("run", run.id);
      await enter(`From of run ${run.id}`, run.from);
      await enter(`To of run ${run.id}`, run.to);
      await enter(`Length of run ${run.id}`, run.length);
      await enter(`Size of run ${run.id}`, run.size);
      await choose(`Kind of run ${run.id}`, run.kind);
      if (run.fuse) await enter(`Fuse of run ${run.id}`, run.fuse);
    }

    // Four loads; only the well pump's drive is constant-power.
    await tab("Loads");
    const loads = [
      { id: "l1", name: "Cabin LED lights", point: "cabin", model: "constantCurrent", demand: ["Amps", "2"] },
      { id: "l2", name: "Fridge", point: "cabin", model: "constantResistance", demand: ["Watts", "60"] },
      { id: "l3", name: "Studio lights", point: "studio", model: "constantCurrent", demand: ["Amps", "1.5"] },
      { id: "l4", name: "Well pump", point: "pump", model: "constantPower", demand: ["Watts", "220"] },
    ] as const;
    for (const load of loads) {
      await addRow("load", load.id);
      await enter(`Name of load ${load.id}`, load.name);
      await enter(`Point of load ${load.id}`, load.point);
      await choose(`Model of load ${load.id}`, load.model);
      await enter(`${load.demand[0]} of load ${load.id}`, load.demand[1]);
    }

    // ------------------------------------------------------------ 6. one load over limit → auto-size → all within
    const results = page.getByRole("table", { name: RESULTS, exact: true });
    const statusOf = (id: string) => results.locator(`tr[data-load-id="${id}"]`).getAttribute("data-status");
    const summary = () => page.getByText(/^\d+ over limit, \d+ near, \d+ within$/).first().innerText();
    await expect.poll(summary, { timeout: 20_000 }).toBe("1 over limit, 0 near, 3 within");
    expect(await statusOf("l4")).toBe("over");
    for (const id of ["l1", "l2", "l3"]) expect(await statusOf(id)).toBe("within");
    const pumpRow = results.locator('tr[data-load-id="l4"]');
    expect(await pumpRow.innerText()).toMatch(/Well pump[\s\S]*Over limit/);
    await screenshot(page, "layout-pump-over-limit");

    await page.getByRole("button", { name: "Auto-size", exact: true }).click();
    const proposal = page.getByRole("dialog", { name: "Auto-size proposal", exact: true });
    await proposal.waitFor({ timeout: 20_000 });
    await proposal.getByRole("heading", { name: "Runs changed (1)", exact: true }).waitFor();
    // Only the pump's run grows, one size, costed from the imported price list: (4.60 − 3.05) × 40 m.
    expect(await proposal.locator('li[data-run-id="r3"]').innerText()).toMatch(/r3: 10 mm² → 16 mm²/);
    expect(await proposal.innerText()).toContain(`(+${formatMoney(6200, CURRENCY)})`);
    expect(await proposal.locator('tr[data-load-id="l4"]').innerText()).toMatch(/Over limit[\s\S]*Within limit/);
    await screenshot(page, "auto-size-proposal");
    await proposal.getByRole("button", { name: "Apply proposal", exact: true }).click();
    await proposal.waitFor({ state: "hidden" });
    await expect.poll(summary, { timeout: 20_000 }).toBe("0 over limit, 0 near, 4 within");
    for (const load of loads) expect(await statusOf(load.id)).toBe("within");
    await tab("Runs");
    expect(await page.getByRole("combobox", { name: "Size of run r3", exact: true }).inputValue()).toBe("16 mm²");

    await page.getByRole("button", { name: "Save", exact: true }).click();
    await page.getByText("Saved", { exact: true }).first().waitFor();
    await screenshot(page, "auto-sized-and-saved");
    const system = await db.getRepository(System).findOneByOrFail({ companyId, jobId: job.id });
    const doc = system.document as { nominalVoltage: number; sources: Array<{ voltage: number; internalResistanceOhm: number }>; runs: Array<{ id: string; size: string; fuseA?: number }>; loads: Array<{ id: string; model: string }> };
    expect(doc.nominalVoltage).toBe(24);
    expect(doc.sources).toEqual([expect.objectContaining({ voltage: 25.6, internalResistanceOhm: 0.005 })]);
    expect(doc.runs.map((r) => [r.id, r.size, r.fuseA])).toEqual([
      ["r1", "6 mm2", 15],
      ["r2", "2.5 mm2", undefined],
      ["r3", "16 mm2", 20],
    ]);
    expect(doc.loads.map((l) => l.model)).toEqual(["constantCurrent", "constantResistance", "constantCurrent", "constantPower"]);
    expect(system.lastSolve).toMatchObject({ over: 0 });
    const profile = await db.getRepository(LimitProfile).findOneByOrFail({ id: system.limitProfileId! });
    expect(profile.name).toBe("General — 3 % branch, 5 % total");

    // ------------------------------------------------------------ 7. estimate → quote → send
    await page.getByRole("link", { name: `← ${JOB}`, exact: true }).click();
    await page.getByRole("heading", { level: 1, name: JOB, exact: true }).waitFor();
    await page.getByRole("link", { name: "Estimate", exact: true }).click();
    await page.getByRole("button", { name: "Build from the layout", exact: true }).click();
    const createQuote = page.getByRole("button", { name: "Create quote", exact: true });
    await expect.poll(() => createQuote.isEnabled(), { timeout: 20_000 }).toBe(true);
    const estimateText = await page.locator("main").innerText();
    expect(estimateText).not.toMatch(/No price for/);
    expect(estimateText).not.toMatch(/Create quote is not available/);
    for (const sku of ["FW-CU-2.5", "FW-CU-6", "FW-CU-16", "FW-LUG-16", "FW-FUSE-15", "FW-FUSE-20", "FW-FH-SEALED"]) expect(estimateText).toContain(sku);
    // The pump's old size went with the auto-size: nothing of 10 mm² is bought.
    expect(estimateText).not.toContain("FW-CU-10");
    expect(estimateText).toContain("Installation labour");
    const estimate = await db.getRepository(Estimate).findOneByOrFail({ companyId, jobId: job.id });
    expect(estimate.bomFindings.filter((f) => f.code === "MISSING_PRICE")).toEqual([]);
    await screenshot(page, "estimate");

    await createQuote.click();
    const quoteHeading = page.getByRole("heading", { level: 1, name: /^Q-\d{4}-\d{4} R1$/ });
    await quoteHeading.waitFor({ timeout: 20_000 });
    const label = await quoteHeading.innerText();
    const quoteHeader = quoteHeading.locator("..");
    await quoteHeader.getByText("Draft", { exact: true }).waitFor();
    await screenshot(page, "quote-draft");

    await page.getByRole("button", { name: "Send to client", exact: true }).click();
    const sendDialog = page.getByRole("dialog", { name: `Send ${label} to the client`, exact: true });
    // The client's address is filled in from the client record.
    expect(await sendDialog.getByLabel("To", { exact: true }).inputValue()).toBe(clientEmail);
    await sendDialog.getByLabel("Message (optional)", { exact: true }).fill("Here is the quote for the croft, with the pump feeder upsized to 16 mm².");
    await sendDialog.getByRole("button", { name: "Send quote", exact: true }).click();
    await sendDialog.waitFor({ state: "hidden", timeout: 20_000 });
    await quoteHeader.getByText("Sent", { exact: true }).waitFor();
    await screenshot(page, "quote-sent");
    const quote = await db.getRepository(Quote).findOneByOrFail({ companyId, jobId: job.id });
    expect(quote).toMatchObject({ status: "sent", currency: CURRENCY, sentTo: clientEmail });
    expect(quote.depositMinor).toBeGreaterThan(0);
    const deposit = formatMoney(quote.depositMinor, CURRENCY);
    const total = formatMoney(quote.totalMinor, CURRENCY);

    // ------------------------------------------------------------ 8. the e-mail, the client's page, acceptance
    const mail = await waitForMail(clientEmail);
    expect(mail.subject).toContain(label);
    expect(mail.subject).toContain(COMPANY);
    expect(mail.text).toContain("pump feeder upsized");
    const link = linkIn(mail, `${app.url}/q/`);

    const clientPage = await openPage(client);
    await clientPage.goto(link);
    await clientPage.getByRole("button", { name: "Accept quote", exact: true }).waitFor({ timeout: 20_000 });
    const logo = clientPage.getByRole("img", { name: `${COMPANY} logo`, exact: true });
    await logo.waitFor();
    expect(await logo.evaluate((img) => (img as HTMLImageElement).naturalWidth)).toBe(96);
    const shown = await clientPage.locator("main").innerText();
    expect(shown).toContain(label);
    expect(shown).toContain(COMPANY);
    expect(shown).toContain(total);
    expect(shown).toContain(deposit);
    for (const load of loads) expect(shown).toContain(load.name);
    expect(shown).toMatch(/Within limit/);
    expect(shown).not.toMatch(/Over limit/);
    await screenshot(clientPage, "client-quote");
    await clientPage.getByLabel("Your full name", { exact: true }).fill(CLIENT);
    await clientPage.getByLabel("I have read and agree to the terms above", { exact: true }).check();
    await clientPage.getByRole("button", { name: "Accept quote", exact: true }).click();
    await clientPage.getByText(`Accepted by ${CLIENT}`).first().waitFor({ timeout: 20_000 });
    const payDeposit = clientPage.getByRole("button", { name: "Pay deposit", exact: true });
    await payDeposit.waitFor();
    await clientPage.getByRole("heading", { name: "Deposit due", exact: true }).waitFor();
    await screenshot(clientPage, "client-accepted");
    expect((await db.getRepository(Quote).findOneByOrFail({ id: quote.id })).status).toBe("accepted");

    // ------------------------------------------------------------ 9. the deposit on the Stripe fake's page
    const fakeOrigin = app.stripe!.apiBase;
    await payDeposit.click();
    await clientPage.waitForURL(`${fakeOrigin}/pay/**`, { timeout: 20_000 });
    await clientPage.getByRole("heading", { name: "Test payment", exact: true }).waitFor();
    expect(await clientPage.locator("body").innerText()).toContain(deposit);
    const email = clientPage.getByLabel("Email", { exact: true });
    if ((await email.inputValue()) === "") await email.fill(clientEmail);
    await clientPage.getByLabel("Card number", { exact: true }).fill(CARDS.success);
    await clientPage.getByLabel("Expiry (MM / YY)", { exact: true }).fill("11 / 38");
    await clientPage.getByLabel("CVC", { exact: true }).fill("314");
    await clientPage.getByLabel("Name on card", { exact: true }).fill(CLIENT);
    await screenshot(clientPage, "payment-page");
    await clientPage.getByRole("button", { name: /^Pay / }).click();
    await clientPage.waitForURL(/\/q\/[^?]+\?deposit=returned/, { timeout: 20_000 });
    // Recorded only once the webhook arrived; the page polls until then.
    await clientPage.getByRole("heading", { name: "Deposit paid — thank you", exact: true }).waitFor({ timeout: 30_000 });
    const payment = await db.getRepository(Payment).findOneByOrFail({ quoteId: quote.id });
    const paidText = await clientPage.locator("main").innerText();
    expect(paidText).toContain(deposit);
    expect(paidText).toContain(payment.receiptNumber);
    await clientPage.getByRole("link", { name: "Download receipt (PDF)", exact: true }).waitFor();
    await screenshot(clientPage, "client-deposit-paid");
    const receiptMail = await waitForMail(clientEmail, 2);
    expect(receiptMail.subject).toContain(payment.receiptNumber);

    // ------------------------------------------------------------ 10. the contractor sees it paid and counted
    await nav("Dashboard");
    await page.getByRole("heading", { level: 1, name: "Dashboard", exact: true }).waitFor();
    const depositTiles = page.getByRole("list", { name: "Deposits", exact: true });
    const received = depositTiles.getByRole("listitem").filter({ has: page.getByRole("heading", { name: "Deposits received this month", exact: true }) });
    await expect.poll(() => received.innerText(), { timeout: 20_000 }).toMatch(new RegExp(`^Deposits received this month\\s+1\\s+deposit\\s+${escapeRegExp(deposit)}$`));
    const outstanding = depositTiles.getByRole("listitem").filter({ has: page.getByRole("heading", { name: "Deposits outstanding", exact: true }) });
    expect(await outstanding.innerText()).toMatch(/^Deposits outstanding\s+0\s+deposits\s/);
    const paidTile = page.getByRole("list", { name: "Quotes this month by status", exact: true }).getByRole("listitem").filter({ hasText: "Deposit paid" });
    expect(await paidTile.innerText()).toMatch(/^Deposit paid\s+1\s+quote\s/);
    expect(await paidTile.innerText()).toContain(total);
    await page.locator("figure .recharts-surface").first().waitFor({ timeout: 20_000 });
    await screenshot(page, "dashboard");

    await page.getByRole("list", { name: "Recent activity", exact: true }).getByRole("link", { name: label, exact: true }).first().click();
    await page.getByRole("heading", { level: 1, name: label, exact: true }).waitFor();
    await page.getByRole("heading", { level: 1, name: label, exact: true }).locator("..").getByText("Deposit paid", { exact: true }).waitFor();
    const paymentItem = page.getByRole("list", { name: "Payments", exact: true }).getByRole("listitem", { name: `Receipt ${payment.receiptNumber}`, exact: true });
    await paymentItem.waitFor();
    expect(await paymentItem.innerText()).toContain(deposit);
    expect(await paymentItem.getByText("Paid", { exact: true }).count()).toBe(1);
    await page.getByRole("heading", { name: "Acceptance", exact: true }).waitFor();
    // The history, oldest first, ends with the deposit and its receipt.
    const history = (await page.getByRole("list", { name: "History", exact: true }).getByRole("listitem").allInnerTexts()).map((t) => t.split("\n")[0]);
    expect(history).toEqual(["Quote created", "Sent to the client", "Opened by the client", "Accepted by the client", "Deposit paid"]);
    expect(await page.getByRole("list", { name: "History", exact: true }).getByRole("listitem").last().innerText()).toContain(payment.receiptNumber);
    await screenshot(page, "quote-deposit-paid");

    // ------------------------------------------------------------ the rows behind what the screens said
    const company = await db.getRepository(Company).findOneByOrFail({ id: companyId });
    expect(company).toMatchObject({
      name: COMPANY,
      licenceNumber: "LV-4471-FW",
      contactEmail: "office@fernwick-lowvolt.test",
      currency: CURRENCY,
      taxRatePercent: 5,
      defaultMarkupPercent: 20,
      labourRateMinor: 9250,
      depositPercent: 30,
      logoMediaType: "image/png",
    });
    const paidQuote = await db.getRepository(Quote).findOneByOrFail({ id: quote.id });
    expect(paidQuote).toMatchObject({ status: "deposit paid", acceptedName: CLIENT, depositMinor: quote.depositMinor });
    expect(await db.getRepository(Quote).countBy({ companyId })).toBe(1);
    const payments = await db.getRepository(Payment).findBy({ quoteId: quote.id });
    expect(payments).toHaveLength(1);
    expect(payments[0]).toMatchObject({ companyId, jobId: job.id, status: "paid", amountMinor: quote.depositMinor, currency: CURRENCY, refundedMinor: 0 });

    // No console error, failed request or foreign request on any page of either browser; the
    // client's only requests elsewhere are the Stripe fake's payment page (a different origin).
    expect(watches.map((w) => w.who)).toEqual(["contractor", "client"]);
    for (const w of watches) {
      const problems = w.who === "client" ? w.problems.filter((p) => !p.startsWith(`foreign request: ${fakeOrigin}/pay/`)) : w.problems;
      expect(problems, `${w.who} page`).toEqual([]);
    }
  }, 240_000);
});
