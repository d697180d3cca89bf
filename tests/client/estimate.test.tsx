import { cleanup, configure, fireEvent, screen, waitFor, within } from "@testing-library/react";
import { afterEach, describe, expect, it, vi } from "vitest";
import { priceEstimate } from "../../shared/estimate/pricing";
import type { Estimate, EstimateFinding, GeneratedLine, LineOverride, ManualLine, SuppliedLoad } from "../../shared/schemas/estimates";
import { apiError, healthUp, sessionAs, stubApi, type ApiCall } from "./api-stub";
import { renderAt } from "./render-app";

// Screens load their code on first visit, and the whole client suite runs in parallel: allow more than the default second.
configure({ asyncUtilTimeout: 5000 });

afterEach(() => {
  cleanup();
  vi.unstubAllGlobals();
});

const JOB_ID = "6c3d4e5f-6a7b-4c8d-9e0f-000000000001";
const SYSTEM_ID = "8e5f6a7b-8c9d-4e0f-9a1b-2c3d4e5f6a7b";
const PUMP_ID = "1f2e3d4c-5b6a-4978-8a9b-0c1d2e3f4a5b";
const QUOTE_ID = "7a1b2c3d-4e5f-4a6b-8c7d-000000000003";
const ESTIMATE = `GET /api/jobs/${JOB_ID}/estimate`;
const PUT = `PUT /api/jobs/${JOB_ID}/estimate`;
const GENERATE = `POST /api/jobs/${JOB_ID}/estimate/generate`;
const CREATE_QUOTE = `POST /api/jobs/${JOB_ID}/quotes`;

const CABLE_KEY = "cable:16 mm2:copper";
const cable: GeneratedLine = {
  key: CABLE_KEY,
  category: "cable",
  description: "16 mm² copper cable",
  detail: "2 conductors × 40 m × 1 set + 10 % waste",
  priceItemId: "2a3b4c5d-6e7f-4a8b-9c0d-1e2f3a4b5c6d",
  sku: "CU16-RB",
  quantity: 88,
  unit: "m",
  unitCostMinor: 450,
  sellPriceMinor: null,
};
const fuse: GeneratedLine = {
  key: "fuse:125",
  category: "fuse",
  description: "125 A ANL fuse",
  detail: "1 fused run",
  priceItemId: "3b4c5d6e-7f8a-4b9c-8d1e-2f3a4b5c6d7e",
  sku: "ANL-125",
  quantity: 1,
  unit: "each",
  unitCostMinor: 1200,
  sellPriceMinor: 2000,
};
const labour: GeneratedLine = {
  key: "labour",
  category: "labour",
  description: "Labour",
  detail: "3 runs, 40 m, 12 terminations",
  priceItemId: null,
  sku: null,
  quantity: 3.5,
  unit: "hour",
  unitCostMinor: 6500,
  sellPriceMinor: null,
};
const tray: ManualLine = {
  id: "4c5d6e7f-8a9b-4c0d-9e1f-3a4b5c6d7e8f",
  category: "other",
  description: "Cable tray and fixings",
  quantity: 1,
  unit: "each",
  unitCostMinor: 4000,
  markupPercent: null,
};
const pumpDevice = {
  id: "5d6e7f8a-9b0c-4d1e-8f2a-4b5c6d7e8f9a",
  sku: "PUMP-24",
  description: "24 V well pump",
  category: "device",
  unit: "each",
  unitCostMinor: 38_000,
  sellPriceMinor: 52_000,
  cableSize: null,
  cableMaterial: null,
  conductors: null,
  ratingA: null,
  updatedAt: "2026-11-01T09:00:00.000Z",
};
const lugItem = { ...pumpDevice, id: "6e7f8a9b-0c1d-4e2f-9a3b-5c6d7e8f9a0b", sku: "LUG-16", description: "16 mm² lug", category: "termination" };

const missingCable: EstimateFinding = {
  code: "MISSING_PRICE",
  severity: "error",
  message: "No price for 35 mm2 copper cable (Feeder to the pump house).",
  need: { category: "cable", unit: "m", cableSize: "35 mm2", cableMaterial: "copper", ratingA: null, description: "35 mm2 copper cable" },
};
const missingFuse: EstimateFinding = {
  code: "MISSING_PRICE",
  severity: "error",
  message: "No price for a 200 A fuse.",
  need: { category: "fuse", unit: "each", cableSize: null, cableMaterial: null, ratingA: 200, description: "200 A fuse" },
};
const overLimit: EstimateFinding = { code: "LOAD_OVER_LIMIT", severity: "warning", message: "Well pump is over its drop limit in House bank." };

interface Parts {
  version?: number;
  generated?: GeneratedLine[];
  manual?: ManualLine[];
  overrides?: Record<string, LineOverride>;
  supplied?: SuppliedLoad[];
  settings?: Partial<Estimate["settings"]>;
  findings?: EstimateFinding[];
  lastChanges?: Estimate["lastChanges"];
}

/** An estimate as the server answers it, priced with the same shared code. */
function estimate(parts: Parts = {}): Estimate {
  const settings = { markupPercent: 30, discountMinor: 0, taxRatePercent: 8, depositMode: "percent" as const, depositPercent: 30, depositFixedMinor: 0, wastePercent: 10, ...parts.settings };
  const generated = parts.generated ?? [cable, fuse, labour];
  const manual = parts.manual ?? [tray];
  const overrides = parts.overrides ?? {};
  const priced = priceEstimate({ generated, manual, overrides, settings });
  return {
    id: "9a8b7c6d-5e4f-4a3b-9c2d-1e0f9a8b7c6d",
    jobId: JOB_ID,
    currency: "USD",
    settings,
    generated,
    manual,
    overrides,
    supplied: parts.supplied ?? [],
    lines: priced.lines,
    totals: priced.totals,
    findings: [...(parts.findings ?? []), ...priced.findings],
    loads: [
      { systemId: SYSTEM_ID, systemName: "House bank", loadId: "pump", name: "Well pump" },
      { systemId: SYSTEM_ID, systemName: "House bank", loadId: "lights", name: "Cabin lights" },
    ],
    generatedAt: "2026-11-21T09:00:00.000Z",
    lastChanges: parts.lastChanges ?? [],
    version: parts.version ?? 4,
    updatedAt: "2026-11-21T09:00:00.000Z",
  };
}

/** The server's PUT: the body saved over `current`, version + 1, new manual lines given ids. */
function savePut(current: () => Estimate, set: (e: Estimate) => void) {
  let ids = 0;
  return (call: ApiCall) => {
    const body = call.body as Record<string, unknown> & { version: number; manual: Array<Partial<ManualLine>> };
    const was = current();
    if (body.version !== was.version) return apiError(409, "conflict", "The estimate was changed by someone else.");
    const manual = body.manual.map((m) => ({ ...m, id: m.id ?? `0d0e0f0a-0b0c-4d0e-8f0a-00000000000${++ids}` }) as ManualLine);
    const next = estimate({
      version: was.version + 1,
      generated: was.generated,
      manual,
      overrides: body.overrides as Record<string, LineOverride>,
      supplied: body.supplied as SuppliedLoad[],
      settings: {
        markupPercent: body.markupPercent as number,
        discountMinor: body.discountMinor as number,
        taxRatePercent: body.taxRatePercent as number,
        depositMode: body.depositMode as "percent" | "fixed",
        depositPercent: body.depositPercent as number,
        depositFixedMinor: body.depositFixedMinor as number,
      },
    });
    set(next);
    return { body: next };
  };
}

const job = {
  id: JOB_ID,
  title: "Cabin battery bank",
  status: "quoted",
  siteAddress: "12 Lake Road, North Fork",
  client: { id: "4b2c3d4e-5f6a-4b7c-9d8e-0f1a2b3c4d5e", name: "Ridge Cabins Ltd" },
  systemCount: 1,
  worstStatus: "over",
  createdAt: "2026-10-01T09:00:00.000Z",
  updatedAt: "2026-11-21T09:00:00.000Z",
  notes: null,
  createdBy: null,
  systems: [],
  attachments: [],
};

const base = (role: "owner" | "estimator" | "installer" = "estimator") => ({
  "GET /api/auth/session": sessionAs(role),
  "GET /api/health": healthUp,
  [`GET /api/jobs/${JOB_ID}`]: { body: job },
  "GET /api/price-list": { body: { items: [pumpDevice, lugItem], currency: "USD" } },
});

const linesTable = () => screen.getByRole("table", { name: "Estimate lines by category" });
const rowOf = (text: string) => within(linesTable()).getByText(text).closest("tr") as HTMLElement;

describe("the Estimate screen", () => {
  it("offers to build the estimate from the layout when there is none, then shows it", async () => {
    const built = estimate({ manual: [] });
    const api = stubApi({ ...base(), [ESTIMATE]: { status: 204 }, [GENERATE]: { body: built } });
    renderAt(`/jobs/${JOB_ID}/estimate`);
    expect(await screen.findByRole("heading", { name: "No estimate yet" })).toBeTruthy();
    expect((await screen.findByRole("link", { name: /Cabin battery bank/ })).getAttribute("href")).toBe(`/jobs/${JOB_ID}`);
    fireEvent.click(screen.getByRole("button", { name: "Build from the layout" }));
    expect(await screen.findByRole("table", { name: "Estimate lines by category" })).toBeTruthy();
    expect(api.callsTo(GENERATE)).toHaveLength(1);
    expect(api.callsTo(GENERATE)[0].body).toBeUndefined();
    expect(within(linesTable()).getByRole("rowgroup", { name: "Cable" }).textContent).toContain("16 mm² copper cable");
    expect(api.unexpected).toEqual([]);
  });

  it("shows the lines by category with their figures, the totals and the cautions", async () => {
    const api = stubApi({ ...base(), [ESTIMATE]: { body: estimate() } });
    renderAt(`/jobs/${JOB_ID}/estimate`);
    await screen.findByRole("table", { name: "Estimate lines by category" });
    const groups = within(linesTable()).getAllByRole("rowgroup").slice(1);
    expect(groups.map((g) => g.getAttribute("aria-label"))).toEqual(["Cable", "Fuses and holders", "Labour", "Other"]);
    const row = rowOf("16 mm² copper cable");
    expect(row.textContent).toContain("2 conductors × 40 m × 1 set + 10 % waste");
    expect(row.textContent).toContain("CU16-RB");
    expect((within(row).getByLabelText("Quantity of 16 mm² copper cable") as HTMLInputElement).value).toBe("88");
    expect((within(row).getByLabelText("Markup % of 16 mm² copper cable") as HTMLInputElement).value).toBe("30");
    // 88 m × $4.50 = $396.00 cost; + 30 % = $514.80 sell.
    expect(row.textContent).toContain("$4.50");
    expect(row.textContent).toContain("$396.00");
    expect(row.textContent).toContain("$514.80");
    // A fixed sell price has no markup until one is typed.
    expect((within(rowOf("125 A ANL fuse")).getByLabelText("Markup % of 125 A ANL fuse") as HTMLInputElement).value).toBe("");
    expect(rowOf("Cable tray and fixings").textContent).toContain("Added by hand");

    const totals = screen.getByRole("region", { name: "Totals" });
    const e = estimate();
    for (const minor of [e.totals.costMinor, e.totals.subtotalMinor, e.totals.taxMinor, e.totals.totalMinor, e.totals.depositMinor, e.totals.marginMinor]) {
      expect(totals.textContent).toContain(new Intl.NumberFormat("en-US", { style: "currency", currency: "USD" }).format(minor / 100));
    }
    expect(screen.getByRole("region", { name: "Safety cautions" }).textContent).toMatch(/fault/);
    expect(screen.getByRole("button", { name: "Create quote" }).hasAttribute("disabled")).toBe(false);
    expect(api.unexpected).toEqual([]);
  });

  it("links each missing price to the price list's add form and holds Create quote back with the reason", async () => {
    stubApi({ ...base(), [ESTIMATE]: { body: estimate({ findings: [overLimit, missingCable, missingFuse] }) } });
    renderAt(`/jobs/${JOB_ID}/estimate`);
    const checks = await screen.findByRole("list", { name: "Checks" });
    const items = within(checks).getAllByRole("listitem");
    // Errors first, then warnings.
    expect(items.map((li) => li.textContent)).toEqual([
      expect.stringContaining("No price for 35 mm2 copper cable"),
      expect.stringContaining("No price for a 200 A fuse"),
      expect.stringContaining("Well pump is over its drop limit"),
    ]);
    const links = within(checks).getAllByRole("link", { name: "Add to price list" });
    expect(links.map((a) => a.getAttribute("href"))).toEqual(["/price-list?add=cable&size=35+mm2&material=copper", "/price-list?add=fuse&rating=200"]);
    const create = screen.getByRole("button", { name: "Create quote" });
    expect(create.hasAttribute("disabled")).toBe(true);
    const reason = document.getElementById(create.getAttribute("aria-describedby") ?? "");
    expect(reason?.textContent).toContain("2 items have no price yet");
  });

  it("saves an adjusted quantity with the version it started from, marks the line, and resets it", async () => {
    let current = estimate();
    const api = stubApi({ ...base(), [ESTIMATE]: () => ({ body: current }), [PUT]: savePut(() => current, (e) => (current = e)) });
    renderAt(`/jobs/${JOB_ID}/estimate`);
    const quantity = (await screen.findByLabelText("Quantity of 16 mm² copper cable")) as HTMLInputElement;
    fireEvent.change(quantity, { target: { value: "100" } });
    fireEvent.blur(quantity);
    // Priced at once, before the save answers: 100 m × $4.50 × 1.3.
    expect(rowOf("16 mm² copper cable").textContent).toContain("$585.00");
    expect(screen.getByRole("status", { name: /Unsaved changes|Saving/ })).toBeTruthy();
    await waitFor(() => expect(api.callsTo(PUT)).toHaveLength(1));
    expect(api.callsTo(PUT)[0].body).toEqual({
      version: 4,
      markupPercent: 30,
      discountMinor: 0,
      taxRatePercent: 8,
      depositMode: "percent",
      depositPercent: 30,
      depositFixedMinor: 0,
      manual: [{ id: tray.id, category: "other", description: "Cable tray and fixings", quantity: 1, unit: "each", unitCostMinor: 4000, markupPercent: null }],
      overrides: { [CABLE_KEY]: { quantity: 100 } },
      supplied: [],
    });
    await screen.findByRole("status", { name: "All changes saved" });
    const row = rowOf("16 mm² copper cable");
    expect(row.textContent).toContain("Adjusted");
    expect(row.textContent).toContain("The layout gives 88 m");

    fireEvent.change(within(row).getByLabelText("Markup % of 16 mm² copper cable"), { target: { value: "45" } });
    fireEvent.keyDown(within(row).getByLabelText("Markup % of 16 mm² copper cable"), { key: "Enter" });
    await waitFor(() => expect(api.callsTo(PUT)).toHaveLength(2));
    expect(api.callsTo(PUT)[1].body).toMatchObject({ version: 5, overrides: { [CABLE_KEY]: { quantity: 100, markupPercent: 45 } } });
    await screen.findByRole("status", { name: "All changes saved" });

    fireEvent.click(within(rowOf("16 mm² copper cable")).getByRole("button", { name: "Reset 16 mm² copper cable" }));
    await waitFor(() => expect(api.callsTo(PUT)).toHaveLength(3));
    expect(api.callsTo(PUT)[2].body).toMatchObject({ version: 6, overrides: {} });
    await waitFor(() => expect((screen.getByLabelText("Quantity of 16 mm² copper cable") as HTMLInputElement).value).toBe("88"));
    expect(rowOf("16 mm² copper cable").textContent).not.toContain("Adjusted");
  }, 20_000);

  it("refuses a quantity that is not a number, in words, and sends nothing", async () => {
    const api = stubApi({ ...base(), [ESTIMATE]: { body: estimate() } });
    renderAt(`/jobs/${JOB_ID}/estimate`);
    const quantity = await screen.findByLabelText("Quantity of 16 mm² copper cable");
    fireEvent.change(quantity, { target: { value: "ninety" } });
    fireEvent.blur(quantity);
    expect(quantity.getAttribute("aria-invalid")).toBe("true");
    expect(rowOf("16 mm² copper cable").textContent).toContain("quantity must be a number");
    await new Promise((r) => setTimeout(r, 600));
    expect(api.callsTo(PUT)).toHaveLength(0);
  });

  it("adds, edits and removes a line by hand, its cost typed in dollars", async () => {
    let current = estimate({ manual: [] });
    const api = stubApi({ ...base(), [ESTIMATE]: () => ({ body: current }), [PUT]: savePut(() => current, (e) => (current = e)) });
    renderAt(`/jobs/${JOB_ID}/estimate`);
    fireEvent.click(await screen.findByRole("button", { name: "Add a line" }));
    let dialog = screen.getByRole("dialog", { name: "Add a line" });
    fireEvent.change(within(dialog).getByLabelText("Category"), { target: { value: "termination" } });
    fireEvent.change(within(dialog).getByLabelText("Description"), { target: { value: "Heat-shrink lugs, 16 mm²" } });
    fireEvent.change(within(dialog).getByLabelText("Quantity"), { target: { value: "12" } });
    fireEvent.change(within(dialog).getByLabelText("Unit cost (USD)"), { target: { value: "2.5x" } });
    fireEvent.click(within(dialog).getByRole("button", { name: "Add line" }));
    expect(await within(dialog).findByText("unit cost must be an amount such as 120.00")).toBeTruthy();
    fireEvent.change(within(dialog).getByLabelText("Unit cost (USD)"), { target: { value: "2.75" } });
    fireEvent.change(within(dialog).getByLabelText("Markup (%)"), { target: { value: "50" } });
    fireEvent.click(within(dialog).getByRole("button", { name: "Add line" }));
    await waitFor(() => expect(screen.queryByRole("dialog")).toBeNull());
    await waitFor(() => expect(api.callsTo(PUT)).toHaveLength(1));
    expect((api.callsTo(PUT)[0].body as { manual: unknown }).manual).toEqual([
      { category: "termination", description: "Heat-shrink lugs, 16 mm²", quantity: 12, unit: "each", unitCostMinor: 275, markupPercent: 50 },
    ]);
    await screen.findByRole("status", { name: "All changes saved" });
    // 12 × $2.75 = $33.00 + 50 % = $49.50
    expect(rowOf("Heat-shrink lugs, 16 mm²").textContent).toContain("$49.50");

    fireEvent.click(screen.getByRole("button", { name: "Edit Heat-shrink lugs, 16 mm²" }));
    dialog = screen.getByRole("dialog", { name: "Edit line" });
    expect((within(dialog).getByLabelText("Unit cost (USD)") as HTMLInputElement).value).toBe("2.75");
    fireEvent.change(within(dialog).getByLabelText("Quantity"), { target: { value: "16" } });
    fireEvent.click(within(dialog).getByRole("button", { name: "Save line" }));
    await waitFor(() => expect(api.callsTo(PUT)).toHaveLength(2));
    const id = current.manual[0].id;
    expect((api.callsTo(PUT)[1].body as { manual: unknown }).manual).toEqual([
      { id, category: "termination", description: "Heat-shrink lugs, 16 mm²", quantity: 16, unit: "each", unitCostMinor: 275, markupPercent: 50 },
    ]);
    await screen.findByRole("status", { name: "All changes saved" });

    fireEvent.click(screen.getByRole("button", { name: "Remove Heat-shrink lugs, 16 mm²" }));
    fireEvent.click(within(screen.getByRole("dialog", { name: "Remove Heat-shrink lugs, 16 mm²?" })).getByRole("button", { name: "Remove line" }));
    await waitFor(() => expect(api.callsTo(PUT)).toHaveLength(3));
    expect((api.callsTo(PUT)[2].body as { manual: unknown }).manual).toEqual([]);
  }, 20_000);

  it("prices a load the contractor supplies from a device in the price list, and saves the pricing settings", async () => {
    let current = estimate();
    const api = stubApi({ ...base(), [ESTIMATE]: () => ({ body: current }), [PUT]: savePut(() => current, (e) => (current = e)) });
    renderAt(`/jobs/${JOB_ID}/estimate`);
    const loads = await screen.findByRole("list", { name: "Loads" });
    const pump = within(loads).getByLabelText(/Well pump/) as HTMLSelectElement;
    // Only devices (and other items) are offered.
    await waitFor(() => expect([...pump.options].map((o) => o.textContent)).toEqual(["Not supplied by us", "24 V well pump (PUMP-24)"]));
    fireEvent.change(pump, { target: { value: pumpDevice.id } });
    await waitFor(() => expect(api.callsTo(PUT)).toHaveLength(1));
    expect((api.callsTo(PUT)[0].body as { supplied: unknown }).supplied).toEqual([{ systemId: SYSTEM_ID, loadId: "pump", priceItemId: pumpDevice.id }]);
    await screen.findByRole("status", { name: "All changes saved" });

    fireEvent.change(screen.getByLabelText("Discount (USD)"), { target: { value: "150" } });
    fireEvent.blur(screen.getByLabelText("Discount (USD)"));
    fireEvent.change(screen.getByLabelText("Tax rate (%)"), { target: { value: "6.5" } });
    fireEvent.blur(screen.getByLabelText("Tax rate (%)"));
    fireEvent.change(screen.getByLabelText("Deposit"), { target: { value: "fixed" } });
    fireEvent.change(screen.getByLabelText("Deposit amount (USD)"), { target: { value: "500" } });
    fireEvent.blur(screen.getByLabelText("Deposit amount (USD)"));
    await waitFor(() => expect(api.callsTo(PUT).length).toBeGreaterThanOrEqual(2));
    await screen.findByRole("status", { name: "All changes saved" });
    expect(api.callsTo(PUT).at(-1)?.body).toMatchObject({ version: current.version - 1, discountMinor: 15_000, taxRatePercent: 6.5, depositMode: "fixed", depositFixedMinor: 50_000 });
    expect(screen.getByRole("region", { name: "Totals" }).textContent).toContain("$500.00");
  }, 20_000);

  it("says when someone else changed the estimate, and reloads their version", async () => {
    let reloaded = false;
    const theirs = estimate({ version: 9, settings: { markupPercent: 40 } });
    const api = stubApi({
      ...base(),
      [ESTIMATE]: () => ({ body: reloaded ? theirs : estimate() }),
      [PUT]: () => {
        reloaded = true;
        return apiError(409, "conflict", "The estimate was changed by someone else.");
      },
    });
    renderAt(`/jobs/${JOB_ID}/estimate`);
    const markup = await screen.findByLabelText("Markup on cost (%)");
    fireEvent.change(markup, { target: { value: "35" } });
    fireEvent.blur(markup);
    const alert = await screen.findByRole("alert");
    expect(alert.textContent).toContain("changed by someone else — reload");
    expect(screen.getByRole("button", { name: "Create quote" }).hasAttribute("disabled")).toBe(true);
    expect(screen.queryByLabelText("Quantity of 16 mm² copper cable")).toBeNull();
    fireEvent.click(within(alert).getByRole("button", { name: "Reload" }));
    await waitFor(() => expect(screen.queryByRole("alert")).toBeNull());
    expect((screen.getByLabelText("Markup on cost (%)") as HTMLInputElement).value).toBe("40");
    expect(api.callsTo(ESTIMATE)).toHaveLength(2);
    expect(api.callsTo(PUT)).toHaveLength(1);
  });

  it("rebuilds from the layout and lists what changed until dismissed", async () => {
    const longer = { ...cable, quantity: 96 };
    const lug = { ...cable, key: "termination:16 mm2", category: "termination" as const, description: "16 mm² lug", detail: "4 ends", sku: "LUG-16", quantity: 4, unit: "each" as const, unitCostMinor: 180 };
    const rebuilt = estimate({
      version: 5,
      generated: [longer, fuse, labour, lug],
      lastChanges: [
        { key: CABLE_KEY, description: "16 mm² copper cable", change: "changed", before: { quantity: 88, unitCostMinor: 450 }, after: { quantity: 96, unitCostMinor: 450 } },
        { key: lug.key, description: "16 mm² lug", change: "added", before: null, after: { quantity: 4, unitCostMinor: 180 } },
        { key: "fuse:80", description: "80 A fuse", change: "removed", before: { quantity: 1, unitCostMinor: 900 }, after: null },
      ],
    });
    const api = stubApi({ ...base(), [ESTIMATE]: { body: estimate() }, [GENERATE]: { body: rebuilt } });
    renderAt(`/jobs/${JOB_ID}/estimate`);
    fireEvent.click(await screen.findByRole("button", { name: "Rebuild from the layout" }));
    const notice = await screen.findByRole("region", { name: /Rebuilt from the layout: 3 lines changed/ });
    const items = within(notice).getAllByRole("listitem").map((li) => li.textContent);
    expect(items).toEqual(["Changed16 mm² copper cable · 88 m → 96 m", "Added16 mm² lug · 4 each", "Removed80 A fuse · was 1"]);
    expect((screen.getByLabelText("Quantity of 16 mm² copper cable") as HTMLInputElement).value).toBe("96");
    expect(api.callsTo(GENERATE)).toHaveLength(1);
    fireEvent.click(within(notice).getByRole("button", { name: "Dismiss" }));
    expect(screen.queryByRole("region", { name: /Rebuilt from the layout/ })).toBeNull();
  });

  it("creates a quote from the estimate and opens it", async () => {
    const e = estimate();
    const created = {
      id: QUOTE_ID,
      jobId: JOB_ID,
      jobTitle: job.title,
      clientName: job.client.name,
      number: "Q-2026-0043",
      revision: 1,
      label: "Q-2026-0043 R1",
      status: "draft",
      superseded: false,
      currency: "USD",
      totalMinor: e.totals.totalMinor,
      depositMinor: e.totals.depositMinor,
      validUntil: "2026-12-31",
      sentAt: null,
      sentTo: null,
      sentBy: null,
      sendError: null,
      sendPendingSince: null,
      viewedAt: null,
      acceptedAt: null,
      acceptedName: null,
      declinedAt: null,
      declineReason: null,
      linkActive: false,
      createdAt: "2026-12-01T09:00:00.000Z",
      acceptedIp: null,
      acceptedUserAgent: null,
      events: [{ type: "created", at: "2026-12-01T09:00:00.000Z", actor: "Ada Quill", detail: null }],
      payments: [],
      snapshot: {
        company: { name: "Kestrel Bay DC Works", licenceNumber: null, contactEmail: null, phone: null, address: null, logo: null },
        client: { name: job.client.name, email: "office@ridge.example", phone: null, billingAddress: null },
        job: { id: JOB_ID, title: job.title, siteAddress: null },
        currency: "USD",
        number: "Q-2026-0043",
        revision: 1,
        issuedAt: "2026-12-01T09:00:00.000Z",
        validUntil: "2026-12-31",
        terms: "",
        scope: [],
        lines: e.lines,
        totals: e.totals,
        systems: [],
        cautions: [],
        wastePercent: 10,
      },
    };
    let refuse = true;
    const api = stubApi({
      ...base(),
      [ESTIMATE]: { body: e },
      [CREATE_QUOTE]: () => (refuse ? apiError(422, "unprocessable", "The estimate has lines without a price.") : { status: 201, body: created }),
      // The quote screen shows the created quote at once and reads it again (quotes change from the client's side).
      [`GET /api/quotes/${QUOTE_ID}`]: { body: created },
    });
    const router = renderAt(`/jobs/${JOB_ID}/estimate`);
    fireEvent.click(await screen.findByRole("button", { name: "Create quote" }));
    expect((await screen.findByRole("alert")).textContent).toContain("The quote was not created. The estimate has lines without a price.");
    expect(router.state.location.pathname).toBe(`/jobs/${JOB_ID}/estimate`);

    refuse = false;
    fireEvent.click(screen.getByRole("button", { name: "Create quote" }));
    expect(await screen.findByRole("heading", { level: 1, name: "Q-2026-0043 R1" })).toBeTruthy();
    expect(router.state.location.pathname).toBe(`/jobs/${JOB_ID}/quotes/${QUOTE_ID}`);
    expect(api.callsTo(CREATE_QUOTE).map((c) => c.body)).toEqual([{}, {}]);
    expect(api.unexpected).toEqual([]);
  });

  it("gives an Installer the estimate read-only", async () => {
    const api = stubApi({ ...base("installer"), [ESTIMATE]: { body: estimate({ findings: [missingCable], supplied: [{ systemId: SYSTEM_ID, loadId: "pump", priceItemId: pumpDevice.id }] }) } });
    renderAt(`/jobs/${JOB_ID}/estimate`);
    await screen.findByRole("table", { name: "Estimate lines by category" });
    expect(screen.queryByRole("button", { name: "Rebuild from the layout" })).toBeNull();
    expect(screen.queryByRole("button", { name: "Create quote" })).toBeNull();
    expect(screen.queryByRole("button", { name: "Add a line" })).toBeNull();
    expect(screen.queryByRole("button", { name: /^Edit / })).toBeNull();
    expect(screen.queryByRole("button", { name: /^Remove / })).toBeNull();
    expect(screen.queryByRole("link", { name: "Add to price list" })).toBeNull();
    expect(within(linesTable()).queryAllByRole("textbox")).toHaveLength(0);
    expect(screen.queryByRole("combobox")).toBeNull();
    expect(rowOf("16 mm² copper cable").textContent).toContain("88 m");
    await waitFor(() => expect(within(screen.getByRole("list", { name: "Loads" })).getByText("24 V well pump")).toBeTruthy());
    expect(screen.getByRole("region", { name: "Pricing" }).textContent).toContain("30 %");
    expect(api.callsTo(PUT)).toHaveLength(0);
    expect(api.unexpected).toEqual([]);
  });
});
