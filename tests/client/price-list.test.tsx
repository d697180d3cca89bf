import { cleanup, configure, fireEvent, screen, waitFor, within } from "@testing-library/react";
import { afterEach, describe, expect, it, vi } from "vitest";
import { apiError, healthUp, sessionAs, stubApi, type Reply } from "./api-stub";
import { renderAt } from "./render-app";

// Screens load their code on first visit, and the whole client suite runs in parallel: allow more than the default second.
configure({ asyncUtilTimeout: 5000 });
// The first test of the file also waits for the screen's code; under a busy machine that alone can pass vitest's 5 s.
vi.setConfig({ testTimeout: 15_000 });

afterEach(() => {
  cleanup();
  vi.unstubAllGlobals();
});

const item = (id: string, sku: string, description: string, extra: Record<string, unknown>) => ({
  id,
  sku,
  description,
  category: "other",
  unit: "each",
  unitCostMinor: 0,
  sellPriceMinor: null,
  cableSize: null,
  cableMaterial: null,
  conductors: null,
  ratingA: null,
  updatedAt: "2026-11-02T09:00:00.000Z",
  ...extra,
});
const cable = item("1d0e7c4a-0b1f-4c2d-8e3f-4a5b6c7d8e01", "CU-16-RED", "16 mm² tinned battery cable, red", {
  category: "cable",
  unit: "m",
  unitCostMinor: 1250,
  cableSize: "16 mm2",
  cableMaterial: "copper",
  conductors: 1,
});
const fuse = item("1d0e7c4a-0b1f-4c2d-8e3f-4a5b6c7d8e02", "ANL-30", "ANL fuse 30 A", { category: "fuse", unitCostMinor: 450, sellPriceMinor: 900, ratingA: 30 });
const lug = item("1d0e7c4a-0b1f-4c2d-8e3f-4a5b6c7d8e03", "LUG-16-M8", "Tinned lug 16 mm², M8 hole", { category: "termination", unitCostMinor: 85, cableSize: "16 mm2" });
const labour = item("1d0e7c4a-0b1f-4c2d-8e3f-4a5b6c7d8e04", "LAB-STD", "Installer, standard hour", { category: "labour", unit: "hour", unitCostMinor: 6500 });
const ITEMS = [cable, fuse, lug, labour];

const list = (items: unknown[] = ITEMS) => ({ body: { items, currency: "USD" } });
const LIST = "GET /api/price-list";
const PREVIEW = "POST /api/price-list/import.csv";
const APPLY = "POST /api/price-list/import.csv?apply=1";
const base = (role: "owner" | "estimator" | "installer" = "estimator") => ({ "GET /api/auth/session": sessionAs(role), "GET /api/health": healthUp });

function open(routes: Record<string, Reply>, { role = "estimator" as "owner" | "estimator" | "installer", path = "/price-list" } = {}) {
  const api = stubApi({ ...base(role), ...routes });
  const router = renderAt(path);
  return { api, router };
}

const table = () => screen.findByRole("table", { name: "Price list" });
const skus = (t: HTMLElement) => within(t).getAllByRole("rowheader").map((th) => th.textContent);
const field = (scope: HTMLElement, label: string) => within(scope).getByLabelText(label) as HTMLInputElement;
const type = (scope: HTMLElement, label: string, value: string) => fireEvent.change(field(scope, label), { target: { value } });
/** The message the field is described by (its error comes first). */
const errorOf = (input: HTMLElement) => document.getElementById(input.getAttribute("aria-describedby")?.split(" ")[0] ?? "")?.textContent ?? "";
/** The FormData bodies fetch was given for one URL. */
const formsSentTo = (url: string) =>
  vi
    .mocked(fetch)
    .mock.calls.filter(([u]) => String(u) === url)
    .map(([, init]) => init?.body as FormData);

describe("the Price list page", () => {
  it("lists the items with their size or rating, unit and money, sorts, searches and filters by category", async () => {
    const { api, router } = open({ [LIST]: list() });
    const t = await table();
    expect(within(t).getAllByRole("columnheader").map((th) => th.textContent)).toEqual([
      "SKU",
      "Description",
      "Category",
      "Size or rating",
      "Unit",
      "Unit cost",
      "Sell price",
      "Actions",
    ]);
    expect(skus(t)).toEqual(["ANL-30", "CU-16-RED", "LAB-STD", "LUG-16-M8"]);
    const cableRow = within(t).getByRole("row", { name: /CU-16-RED/ });
    expect([...cableRow.querySelectorAll("td")].map((td) => td.textContent).slice(0, 6)).toEqual([
      "16 mm² tinned battery cable, red",
      "Cable",
      "16 mm² copper, single",
      "per m",
      "$12.50",
      "—",
    ]);
    const fuseRow = within(t).getByRole("row", { name: /ANL-30/ });
    expect(fuseRow.textContent).toContain("30 A");
    expect(fuseRow.textContent).toContain("$4.50");
    expect(fuseRow.textContent).toContain("$9.00");
    expect(within(t).getByRole("row", { name: /LUG-16-M8/ }).textContent).toContain("$0.85");
    expect(screen.getByRole("link", { name: "Export CSV" }).getAttribute("href")).toBe("/api/price-list/export.csv");

    fireEvent.click(within(t).getByRole("button", { name: "Unit cost" }));
    await waitFor(() => expect(skus(screen.getByRole("table", { name: "Price list" }))).toEqual(["LUG-16-M8", "ANL-30", "CU-16-RED", "LAB-STD"]));
    expect(router.state.location.search).toBe("?sort=cost");
    fireEvent.click(within(screen.getByRole("table", { name: "Price list" })).getByRole("button", { name: "Unit cost" }));
    await waitFor(() => expect(skus(screen.getByRole("table", { name: "Price list" }))).toEqual(["LAB-STD", "CU-16-RED", "ANL-30", "LUG-16-M8"]));
    expect(screen.getByRole("columnheader", { name: /Unit cost/ }).getAttribute("aria-sort")).toBe("descending");

    fireEvent.change(screen.getByRole("searchbox", { name: "Search the price list" }), { target: { value: "16 mm" } });
    await waitFor(() => expect(skus(screen.getByRole("table", { name: "Price list" }))).toEqual(["CU-16-RED", "LUG-16-M8"]));
    fireEvent.change(screen.getByRole("combobox", { name: "Category" }), { target: { value: "termination" } });
    await waitFor(() => expect(skus(screen.getByRole("table", { name: "Price list" }))).toEqual(["LUG-16-M8"]));
    expect(screen.getByText(/1 of 4 items/)).toBeTruthy();
    const query = new URLSearchParams(router.state.location.search);
    expect([query.get("search"), query.get("category")]).toEqual(["16 mm", "termination"]);

    fireEvent.change(screen.getByRole("combobox", { name: "Category" }), { target: { value: "labour" } });
    expect(await screen.findByText(/No items match “16 mm” in Labour/)).toBeTruthy();
    fireEvent.click(screen.getByRole("button", { name: "Show every item" }));
    await waitFor(() => expect(skus(screen.getByRole("table", { name: "Price list" }))).toHaveLength(4));
    expect(api.callsTo(LIST)).toHaveLength(1);
    expect(api.unexpected).toEqual([]);
  });

  it("shows an empty state with Add item and Import CSV when there are no items", async () => {
    open({ [LIST]: list([]) });
    expect(await screen.findByRole("heading", { name: "Your price list is empty" })).toBeTruthy();
    expect(screen.getByText(/never carries a silent zero/)).toBeTruthy();
    expect(screen.getAllByRole("button", { name: "Add item" })).toHaveLength(1);
    expect(screen.getByRole("button", { name: "Import CSV" })).toBeTruthy();
    expect(screen.queryByRole("table")).toBeNull();
    expect(screen.queryByRole("searchbox")).toBeNull();
  });

  it("says when the list could not be loaded and tries again", async () => {
    let attempts = 0;
    open({
      [LIST]: () => {
        attempts += 1;
        return attempts === 1 ? apiError(503, "service_unavailable", "The database is not answering.") : list();
      },
    });
    expect(await screen.findByText(/The price list could not be loaded. The database is not answering./)).toBeTruthy();
    expect(screen.queryByRole("table")).toBeNull();
    fireEvent.click(screen.getByRole("button", { name: "Try again" }));
    expect(skus(await table())).toHaveLength(4);
  });

  it("shows that the list is loading", async () => {
    open({ [LIST]: list() });
    expect(await screen.findByText("Loading the price list…")).toBeTruthy();
    await table();
    expect(screen.queryByText("Loading the price list…")).toBeNull();
  });

  it("adds a cable: checks the form first, then sends the prices in cents and the size as its label", async () => {
    let created = false;
    const added = item("1d0e7c4a-0b1f-4c2d-8e3f-4a5b6c7d8e05", "CU-25-TW", "25 mm² twin cable", { category: "cable", unit: "m", unitCostMinor: 1250, cableSize: "25 mm2", cableMaterial: "copper", conductors: 2 });
    const { api } = open({
      [LIST]: () => list(created ? [...ITEMS, added] : ITEMS),
      "POST /api/price-list": (call) => {
        created = true;
        return { status: 201, body: { ...added, ...(call.body as object) } };
      },
    });
    await table();
    fireEvent.click(screen.getByRole("button", { name: "Add item" }));
    const dialog = screen.getByRole("dialog", { name: "Add a price list item" });
    expect(document.activeElement).toBe(field(dialog, "SKU"));
    expect(field(dialog, "Category").value).toBe("cable");
    expect(field(dialog, "Unit").value).toBe("m");
    expect(within(dialog).queryByLabelText("Rating (A)")).toBeNull();

    type(dialog, "Unit cost", "12.505");
    fireEvent.click(within(dialog).getByRole("button", { name: "Add item" }));
    await waitFor(() => expect(field(dialog, "SKU").getAttribute("aria-invalid")).toBe("true"));
    expect(errorOf(field(dialog, "SKU"))).toContain("SKU is required");
    expect(errorOf(field(dialog, "Unit cost"))).toContain("unit cost must be an amount in USD, such as 12.50");
    expect(errorOf(field(dialog, "Conductor size"))).toContain("size is required for cable");
    expect(api.callsTo("POST /api/price-list")).toHaveLength(0);

    type(dialog, "SKU", "CU-25-TW");
    type(dialog, "Description", "25 mm² twin cable");
    type(dialog, "Conductor size", "25");
    fireEvent.change(field(dialog, "Conductors"), { target: { value: "2" } });
    type(dialog, "Unit cost", "12.50");
    fireEvent.click(within(dialog).getByRole("button", { name: "Add item" }));
    await waitFor(() => expect(screen.queryByRole("dialog")).toBeNull());
    expect(api.callsTo("POST /api/price-list").map((c) => c.body)).toEqual([
      {
        sku: "CU-25-TW",
        description: "25 mm² twin cable",
        category: "cable",
        unit: "m",
        unitCostMinor: 1250,
        sellPriceMinor: null,
        cableSize: "25 mm2",
        cableMaterial: "copper",
        conductors: 2,
        ratingA: null,
      },
    ]);
    await waitFor(() => expect(skus(screen.getByRole("table", { name: "Price list" }))).toContain("CU-25-TW"));
  });

  it("shows a fuse's rating instead of the cable fields and sends only what the category uses", async () => {
    const { api } = open({ [LIST]: list(), "POST /api/price-list": (call) => ({ status: 201, body: { ...fuse, ...(call.body as object) } }) });
    await table();
    fireEvent.click(screen.getByRole("button", { name: "Add item" }));
    const dialog = screen.getByRole("dialog", { name: "Add a price list item" });
    type(dialog, "Conductor size", "16");
    fireEvent.change(field(dialog, "Category"), { target: { value: "fuse" } });
    expect(within(dialog).queryByLabelText("Conductor size")).toBeNull();
    expect(within(dialog).queryByLabelText("Material")).toBeNull();
    expect(field(dialog, "Unit").value).toBe("each");
    type(dialog, "SKU", "ANL-40");
    type(dialog, "Description", "ANL fuse 40 A");
    type(dialog, "Rating (A)", "40");
    type(dialog, "Unit cost", "4.5");
    type(dialog, "Sell price", "$9.00");
    fireEvent.click(within(dialog).getByRole("button", { name: "Add item" }));
    await waitFor(() => expect(api.callsTo("POST /api/price-list")).toHaveLength(1));
    expect(api.callsTo("POST /api/price-list")[0].body).toEqual({
      sku: "ANL-40",
      description: "ANL fuse 40 A",
      category: "fuse",
      unit: "each",
      unitCostMinor: 450,
      sellPriceMinor: 900,
      cableSize: null,
      cableMaterial: null,
      conductors: null,
      ratingA: 40,
    });
  });

  it("puts the server's field errors beside their fields: a SKU already taken (409), then the unit cost", async () => {
    let attempts = 0;
    const { api } = open({
      [LIST]: list(),
      "POST /api/price-list": () => {
        attempts += 1;
        return attempts === 1
          ? apiError(409, "conflict", 'sku: an item with SKU "anl-30" is already in the price list', { field: "sku", fields: { sku: "this SKU is already in the price list" } })
          : apiError(400, "invalid_input", "unit cost is too large", { fields: { unitCostMinor: "unit cost is too large" } });
      },
    });
    await table();
    fireEvent.click(screen.getByRole("button", { name: "Add item" }));
    const dialog = screen.getByRole("dialog", { name: "Add a price list item" });
    fireEvent.change(field(dialog, "Category"), { target: { value: "fuse" } });
    type(dialog, "SKU", "anl-30");
    type(dialog, "Description", "Another 30 A fuse");
    type(dialog, "Unit cost", "5");
    fireEvent.click(within(dialog).getByRole("button", { name: "Add item" }));
    await waitFor(() => expect(field(dialog, "SKU").getAttribute("aria-invalid")).toBe("true"));
    expect(errorOf(field(dialog, "SKU"))).toContain("this SKU is already in the price list");
    expect(document.activeElement).toBe(field(dialog, "SKU"));

    type(dialog, "SKU", "ANL-30B");
    fireEvent.click(within(dialog).getByRole("button", { name: "Add item" }));
    await waitFor(() => expect(field(dialog, "Unit cost").getAttribute("aria-invalid")).toBe("true"));
    expect(errorOf(field(dialog, "Unit cost"))).toContain("unit cost is too large");
    expect(field(dialog, "SKU").getAttribute("aria-invalid")).toBe("false");
    expect(screen.getByRole("dialog", { name: "Add a price list item" })).toBeTruthy();
    expect(api.callsTo("POST /api/price-list").map((c) => (c.body as { sku: string }).sku)).toEqual(["anl-30", "ANL-30B"]);
  });

  it("opens the add form filled in from a missing-price link, once", async () => {
    const { api, router } = open(
      { [LIST]: list(), "POST /api/price-list": (call) => ({ status: 201, body: { ...cable, ...(call.body as object) } }) },
      { path: "/price-list?add=cable&size=35%20mm2&material=aluminum" },
    );
    const dialog = await screen.findByRole("dialog", { name: "Add a price list item" });
    expect(field(dialog, "Category").value).toBe("cable");
    expect(field(dialog, "Conductor size").value).toBe("35 mm²");
    expect(field(dialog, "Material").value).toBe("aluminum");
    expect(field(dialog, "Description").value).toBe("35 mm² aluminium cable");
    await waitFor(() => expect(router.state.location.search).toBe(""));

    type(dialog, "SKU", "AL-35");
    type(dialog, "Unit cost", "7.20");
    fireEvent.click(within(dialog).getByRole("button", { name: "Add item" }));
    await waitFor(() => expect(screen.queryByRole("dialog")).toBeNull());
    expect(api.callsTo("POST /api/price-list")[0].body).toMatchObject({ sku: "AL-35", category: "cable", cableSize: "35 mm2", cableMaterial: "aluminum", unitCostMinor: 720 });
  });

  it("fills a fuse's rating from the link", async () => {
    open({ [LIST]: list() }, { path: "/price-list?add=fuse&rating=40" });
    const dialog = await screen.findByRole("dialog", { name: "Add a price list item" });
    expect(field(dialog, "Category").value).toBe("fuse");
    expect(field(dialog, "Rating (A)").value).toBe("40");
    expect(field(dialog, "Description").value).toBe("40 A fuse");
  });

  it("edits an item with its prices in dollars and sends the change in cents", async () => {
    const { api } = open({ [LIST]: list(), [`PATCH /api/price-list/${fuse.id}`]: (call) => ({ body: { ...fuse, ...(call.body as object) } }) });
    const row = within(await table()).getByRole("row", { name: /ANL-30/ });
    fireEvent.click(within(row).getByRole("button", { name: "Edit" }));
    const dialog = screen.getByRole("dialog", { name: "Edit ANL-30" });
    expect(field(dialog, "Unit cost").value).toBe("4.50");
    expect(field(dialog, "Sell price").value).toBe("9.00");
    expect(field(dialog, "Rating (A)").value).toBe("30");
    type(dialog, "Sell price", "");
    type(dialog, "Unit cost", "4.75");
    fireEvent.click(within(dialog).getByRole("button", { name: "Save item" }));
    await waitFor(() => expect(screen.queryByRole("dialog")).toBeNull());
    expect(api.callsTo(`PATCH /api/price-list/${fuse.id}`)[0].body).toMatchObject({ unitCostMinor: 475, sellPriceMinor: null, ratingA: 30, category: "fuse" });
  });

  it("deletes an item after asking", async () => {
    let deleted = false;
    const { api } = open({
      [LIST]: () => list(deleted ? ITEMS.filter((i) => i !== lug) : ITEMS),
      [`DELETE /api/price-list/${lug.id}`]: () => {
        deleted = true;
        return { status: 204 };
      },
    });
    const row = within(await table()).getByRole("row", { name: /LUG-16-M8/ });
    fireEvent.click(within(row).getByRole("button", { name: "Delete" }));
    const confirm = screen.getByRole("dialog", { name: "Delete LUG-16-M8?" });
    fireEvent.click(within(confirm).getByRole("button", { name: "Cancel" }));
    expect(api.callsTo(`DELETE /api/price-list/${lug.id}`)).toHaveLength(0);
    fireEvent.click(within(row).getByRole("button", { name: "Delete" }));
    fireEvent.click(within(screen.getByRole("dialog", { name: "Delete LUG-16-M8?" })).getByRole("button", { name: "Delete item" }));
    await waitFor(() => expect(skus(screen.getByRole("table", { name: "Price list" }))).toEqual(["ANL-30", "CU-16-RED", "LAB-STD"]));
    expect(api.callsTo(`DELETE /api/price-list/${lug.id}`)).toHaveLength(1);
  });

  it("previews a CSV import, then applies it with apply=1 and reads the list again", async () => {
    let applied = false;
    const preview = {
      added: [{ sku: "CU-25-RED", description: "25 mm² battery cable, red" }],
      changed: [{ sku: "ANL-30", description: "ANL fuse 30 A", fields: ["unit_cost", "sell_price"] }],
      unchanged: 3,
    };
    const { api } = open({
      [LIST]: () => list(applied ? [...ITEMS, item("1d0e7c4a-0b1f-4c2d-8e3f-4a5b6c7d8e06", "CU-25-RED", "25 mm² battery cable, red", { category: "cable", unit: "m", cableSize: "25 mm2", cableMaterial: "copper" })] : ITEMS),
      [PREVIEW]: { body: { ...preview, applied: false } },
      [APPLY]: () => {
        applied = true;
        return { body: { ...preview, applied: true } };
      },
    });
    await table();
    const file = new File(["sku,description\n"], "prices.csv", { type: "text/csv" });
    fireEvent.change(screen.getByLabelText("Price list CSV file"), { target: { files: [file] } });
    const dialog = await screen.findByRole("dialog", { name: "Import prices.csv?" });
    expect(dialog.textContent).toContain("1 item to add, 1 item to change, 3 unchanged.");
    expect(within(dialog).getByRole("region", { name: "Items to add" }).textContent).toContain("CU-25-RED — 25 mm² battery cable, red");
    expect(within(dialog).getByRole("region", { name: "Items to change" }).textContent).toContain("ANL-30 — ANL fuse 30 A: unit cost, sell price");
    expect(api.callsTo(APPLY)).toHaveLength(0);
    expect(api.callsTo(LIST)).toHaveLength(1);

    fireEvent.click(within(dialog).getByRole("button", { name: "Apply import" }));
    await waitFor(() => expect(screen.queryByRole("dialog")).toBeNull());
    expect(await screen.findByRole("status", { name: "Imported prices.csv: 1 item added, 1 item changed, 3 unchanged." })).toBeTruthy();
    await waitFor(() => expect(skus(screen.getByRole("table", { name: "Price list" }))).toContain("CU-25-RED"));
    expect(api.calls.filter((c) => c.url.startsWith("/api/price-list/import.csv")).map((c) => `${c.method} ${c.url}`)).toEqual([PREVIEW, APPLY]);
    const [previewForm, applyForm] = [...formsSentTo("/api/price-list/import.csv"), ...formsSentTo("/api/price-list/import.csv?apply=1")];
    expect((previewForm.get("file") as File).name).toBe("prices.csv");
    expect((applyForm.get("file") as File).name).toBe("prices.csv");
    expect(api.callsTo(APPLY)[0].headers.get("X-Runwright-Request")).toBe("1");
  });

  it("cancelling the preview saves nothing", async () => {
    const { api } = open({ [LIST]: list(), [PREVIEW]: { body: { added: [{ sku: "X-1", description: "Spare" }], changed: [], unchanged: 0, applied: false } } });
    await table();
    fireEvent.change(screen.getByLabelText("Price list CSV file"), { target: { files: [new File(["x"], "spare.csv", { type: "text/csv" })] } });
    const dialog = await screen.findByRole("dialog", { name: "Import spare.csv?" });
    fireEvent.click(within(dialog).getByRole("button", { name: "Cancel" }));
    await waitFor(() => expect(screen.queryByRole("dialog")).toBeNull());
    expect(api.callsTo(APPLY)).toHaveLength(0);
    expect(api.unexpected).toEqual([]);
  });

  it("lists the bad rows of a refused CSV, line and column each", async () => {
    const { api } = open({
      [LIST]: list(),
      [PREVIEW]: apiError(400, "invalid_input", "2 rows of the CSV have problems; nothing was saved.", {
        rows: [
          { line: 4, column: "unit_cost", message: "unit cost must be an amount such as 12.50" },
          { line: 9, column: "size", message: 'size "17 mm2" is not a conductor size' },
        ],
      }),
    });
    await table();
    fireEvent.change(screen.getByLabelText("Price list CSV file"), { target: { files: [new File(["x"], "bad.csv", { type: "text/csv" })] } });
    const rows = await screen.findByRole("list", { name: "Rows with problems" });
    expect(within(rows).getAllByRole("listitem").map((li) => li.textContent)).toEqual([
      "Line 4, column unit_cost: unit cost must be an amount such as 12.50",
      'Line 9, column size: size "17 mm2" is not a conductor size',
    ]);
    expect(rows.closest("[role='alert']")!.textContent).toContain("2 rows of the CSV have problems; nothing was saved.");
    expect(screen.queryByRole("dialog")).toBeNull();
    expect(api.callsTo(APPLY)).toHaveLength(0);
  });

  it("is read-only for installers: no Add, Import, Edit or Delete, and a missing-price link only says who can add it", async () => {
    const { api, router } = open({ [LIST]: list() }, { role: "installer", path: "/price-list?add=fuse&rating=40" });
    const t = await table();
    expect(within(t).getAllByRole("columnheader").map((th) => th.textContent)).not.toContain("Actions");
    expect(within(t).queryByRole("button", { name: "Edit" })).toBeNull();
    expect(within(t).queryByRole("button", { name: "Delete" })).toBeNull();
    expect(screen.queryByRole("button", { name: "Add item" })).toBeNull();
    expect(screen.queryByRole("button", { name: "Import CSV" })).toBeNull();
    expect(screen.queryByLabelText("Price list CSV file")).toBeNull();
    expect(screen.getByRole("link", { name: "Export CSV" })).toBeTruthy();
    expect(screen.getByText(/Owners and Estimators keep it current/)).toBeTruthy();
    expect(screen.queryByRole("dialog")).toBeNull();
    expect(screen.getByRole("alert").textContent).toContain("An estimate needs a price for a 40 A fuse. Only an Owner or an Estimator can add it");
    await waitFor(() => expect(router.state.location.search).toBe(""));
    expect(api.unexpected).toEqual([]);
  });
});
