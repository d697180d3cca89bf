// The System editor screen through the app's router, against stubbed endpoints that answer with
// the real engine: solve on load, debounced solves of the edited document, the last good results
// kept when a layout does not solve, save with the version, the 409 dialog, auto-size, read-only,
// the CSV import's row errors; and the one-line diagram's layout, selection and zoom.
import dagre from "@dagrejs/dagre";
import { act, cleanup, fireEvent, render, screen, waitFor, within } from "@testing-library/react";
import { afterEach, beforeAll, describe, expect, it, vi } from "vitest";
import cabinFile from "../../shared/engine/examples/cabin-24v.json";
import metricCosts from "../../shared/engine/examples/costs-metric.json";
import { autosize, CAUTIONS, solveSystem } from "../../shared/engine";
import type { SystemInput } from "../../shared/engine/schema";
import { paths } from "../../src/config/paths";
import { OneLineDiagram } from "../../src/features/system-editor/components/one-line-diagram";
import { DAGRE_NODE_LIMIT, layoutDiagram, topologyOf } from "../../src/features/system-editor/lib/diagram-layout";
import { apiError, healthUp, sessionAs, stubApi, type ApiCall, type Reply } from "./api-stub";
import { renderAt } from "./render-app";

// The screen's module (with recharts and dagre) is transformed once here, not inside the first test's timeout.
beforeAll(async () => {
  await import("../../src/app/routes/system");
}, 60_000);

afterEach(() => {
  cleanup();
  vi.unstubAllGlobals();
  vi.restoreAllMocks();
});

const JOB_ID = "3c0f4f3e-2a51-4a8e-9d1c-7b2f6e8a4c10";
const SYSTEM_ID = "9e1d2c3b-4a5f-4e6d-8c7b-1a2b3c4d5e6f";
const PROFILE_ID = "6b7c8d9e-0f1a-4b2c-8d3e-4f5a6b7c8d9e";
const cabin = structuredClone(cabinFile) as SystemInput;

const record = {
  id: SYSTEM_ID,
  jobId: JOB_ID,
  name: "Cabin house bank",
  nominalVoltage: 24,
  units: "metric",
  limitProfileId: null,
  document: cabin,
  version: 3,
  updatedAt: "2026-11-30T08:00:00.000Z",
  updatedBy: { id: "0b6f3c1e-8a47-4d2b-9e15-7c3a5f8d1e22", name: "Ada Quill" },
};
const job = {
  id: JOB_ID,
  title: "Lakeside cabin off-grid",
  status: "quoted",
  siteAddress: null,
  client: { id: "2d3e4f5a-6b7c-4d8e-9f0a-1b2c3d4e5f6a", name: "Orla Penhallow" },
  systemCount: 1,
  worstStatus: "over",
  createdAt: "2026-11-20T08:00:00.000Z",
  updatedAt: "2026-11-30T08:00:00.000Z",
  notes: null,
  createdBy: null,
  systems: [],
  attachments: [],
};
const profiles = {
  items: [
    {
      id: PROFILE_ID,
      name: "Marine — 3 % critical, 10 % other",
      branchPercent: 10,
      totalPercent: 10,
      criticalPercent: 3,
      nearFraction: 0.8,
      notes: null,
      builtIn: true,
      systemCount: 0,
      updatedAt: "2026-11-01T08:00:00.000Z",
    },
  ],
  total: 1,
  page: 1,
  pageSize: 100,
};

const SYSTEM = `/api/systems/${SYSTEM_ID}`;
const documentOf = (call: ApiCall) => (call.body as { document: SystemInput }).document;
/** The server's answer: the real engine on the posted document. */
const engineSolve: Reply = (call) => ({ body: solveSystem(documentOf(call)) });

function editorApi(overrides: Record<string, Reply> = {}, role: "owner" | "estimator" | "installer" = "estimator") {
  return stubApi({
    "GET /api/auth/session": sessionAs(role),
    "GET /api/health": healthUp,
    [`GET ${SYSTEM}`]: { body: record },
    [`GET /api/jobs/${JOB_ID}`]: { body: job },
    "GET /api/limit-profiles?sort=name&pageSize=100": { body: profiles },
    [`POST ${SYSTEM}/solve`]: engineSolve,
    ...overrides,
  });
}

const open = () => renderAt(paths.system.getHref(JOB_ID, SYSTEM_ID));
const loadRow = (id: string) => document.querySelector<HTMLTableRowElement>(`tr[data-load-id="${id}"]`);
const resultsSection = () => screen.getByRole("heading", { level: 2, name: "Results" }).closest("section")!;
const nominalVoltage = () => screen.getByLabelText("Nominal voltage (V)") as HTMLInputElement;
const setNominalVoltage = (value: string) => {
  fireEvent.change(nominalVoltage(), { target: { value } });
  fireEvent.blur(nominalVoltage());
};

describe("the System editor", () => {
  it("opens solved: the job link, the header, statuses per load, and the safety cautions", async () => {
    const api = editorApi();
    open();
    expect(await screen.findByRole("link", { name: "← Lakeside cabin off-grid" }, { timeout: 3000 })).toBeTruthy();
    expect((screen.getByLabelText("System name") as HTMLInputElement).value).toBe("Cabin house bank");
    expect(nominalVoltage().value).toBe("24");
    expect(screen.getByRole("heading", { name: "Safety cautions" })).toBeTruthy();
    for (const caution of CAUTIONS) expect(screen.getByText(caution)).toBeTruthy();

    await waitFor(() => expect(loadRow("well-pump")).not.toBeNull());
    expect(within(loadRow("well-pump")!).getByText("Over limit")).toBeTruthy();
    expect(within(loadRow("fridge")!).getByText("Within limit")).toBeTruthy();
    expect(within(resultsSection()).getByText("2 over limit, 0 near, 2 within")).toBeTruthy();
    // Solved once, at once, with the document as loaded.
    expect(api.callsTo(`POST ${SYSTEM}/solve`).map(documentOf)).toEqual([cabin]);
    expect(screen.getByText("Saved")).toBeTruthy();
    expect((screen.getByRole("button", { name: "Save" }) as HTMLButtonElement).disabled).toBe(true);
    expect(screen.getByRole("link", { name: "Export runs CSV" }).getAttribute("href")).toBe(`${SYSTEM}/runs.csv`);
    // The diagram labels the load with its figures and status.
    expect(screen.getByRole("button", { name: "Load well-pump, Over limit" })).toBeTruthy();
    expect(api.unexpected).toEqual([]);
  });

  it("solves the edited document after a pause, marking the shown results as updating meanwhile", async () => {
    const api = editorApi();
    open();
    await waitFor(() => expect(loadRow("well-pump")).not.toBeNull());
    expect(resultsSection().getAttribute("aria-busy")).toBe("false");

    setNominalVoltage("12");
    // Not yet sent: the edit waits for the pause; the old figures are dimmed and say so.
    expect(api.callsTo(`POST ${SYSTEM}/solve`)).toHaveLength(1);
    expect(within(resultsSection()).getByText("Updating…")).toBeTruthy();
    expect(resultsSection().getAttribute("aria-busy")).toBe("true");
    expect(screen.getByText("Unsaved changes")).toBeTruthy();

    await waitFor(() => expect(api.callsTo(`POST ${SYSTEM}/solve`)).toHaveLength(2));
    expect(documentOf(api.callsTo(`POST ${SYSTEM}/solve`)[1])).toEqual({ ...cabin, nominalVoltage: 12 });
    await waitFor(() => expect(resultsSection().getAttribute("aria-busy")).toBe("false"));
    expect(within(resultsSection()).queryByText("Updating…")).toBeNull();
  });

  it("sends only the last of quick edits, and shows only the latest answer", async () => {
    const answers: Array<(reply: Response) => void> = [];
    const api = editorApi();
    const original = globalThis.fetch;
    // Hold the solve answers back to answer them out of order.
    vi.stubGlobal(
      "fetch",
      vi.fn(async (input: RequestInfo | URL, init?: RequestInit) => {
        const response = await original(input, init);
        if (!String(input).endsWith("/solve") || api.callsTo(`POST ${SYSTEM}/solve`).length === 1) return response;
        return new Promise<Response>((resolve) => answers.push(() => resolve(response)));
      }),
    );
    open();
    await waitFor(() => expect(loadRow("well-pump")).not.toBeNull());
    setNominalVoltage("12");
    setNominalVoltage("48");
    await waitFor(() => expect(api.callsTo(`POST ${SYSTEM}/solve`)).toHaveLength(2));
    expect(documentOf(api.callsTo(`POST ${SYSTEM}/solve`)[1]).nominalVoltage).toBe(48);
    setNominalVoltage("36");
    await waitFor(() => expect(api.callsTo(`POST ${SYSTEM}/solve`)).toHaveLength(3));
    // The answer for 36 V arrives first, then the late one for 48 V: 36 V's stays.
    await act(async () => answers[1](new Response()));
    await waitFor(() => expect(resultsSection().getAttribute("aria-busy")).toBe("false"));
    const at36 = solveSystem({ ...cabin, nominalVoltage: 36 });
    if (!at36.ok) throw new Error("36 V does not solve");
    const pumpAt36 = at36.loads.find((l) => l.id === "well-pump")!.dropPercent.toFixed(2);
    expect(loadRow("well-pump")!.textContent).toContain(pumpAt36);
    await act(async () => answers[0](new Response()));
    expect(loadRow("well-pump")!.textContent).toContain(pumpAt36);
    expect(resultsSection().getAttribute("aria-busy")).toBe("false");
  });

  it("keeps the last good results, marked, when the layout stops solving, and lists the errors to select", async () => {
    let call = 0;
    editorApi({
      [`POST ${SYSTEM}/solve`]: (c) => {
        call += 1;
        if (call === 1) return { body: solveSystem(documentOf(c)) };
        // The server solves what it is sent: here a run with a size that does not exist.
        const broken = { ...documentOf(c), runs: documentOf(c).runs.map((r) => (r.id === "shed-pump" ? { ...r, size: "7 mm2" } : r)) };
        return { body: solveSystem(broken) };
      },
    });
    open();
    await waitFor(() => expect(loadRow("well-pump")).not.toBeNull());
    setNominalVoltage("25");
    expect(await screen.findByText("Results are from the last valid layout")).toBeTruthy();
    // The old figures stay on screen.
    expect(within(loadRow("well-pump")!).getByText("Over limit")).toBeTruthy();
    const problem = within(resultsSection()).getByRole("button", { name: /runs\[1\]\.size: "7 mm2" is not a conductor size we know/ });
    fireEvent.click(problem);
    // The run is selected everywhere: the diagram shows it pressed.
    await waitFor(() => expect(screen.getByRole("button", { name: /^Run shed-pump,/ }).getAttribute("aria-pressed")).toBe("true"));
  });

  it("saves with the version it loaded, then with the one the server answered (Ctrl+S too)", async () => {
    let version = 3;
    const api = editorApi({
      [`PUT ${SYSTEM}`]: (c) => {
        version += 1;
        return { body: { ...record, ...(c.body as object), version } };
      },
    });
    open();
    await waitFor(() => expect(loadRow("well-pump")).not.toBeNull());
    fireEvent.change(screen.getByLabelText("System name"), { target: { value: "Cabin bank, revised" } });
    expect(screen.getByText("Unsaved changes")).toBeTruthy();
    fireEvent.click(screen.getByRole("button", { name: "Save" }));
    expect(await screen.findByText("Saved")).toBeTruthy();
    expect(api.callsTo(`PUT ${SYSTEM}`).map((c) => c.body)).toEqual([{ version: 3, name: "Cabin bank, revised", limitProfileId: null, document: cabin }]);

    fireEvent.change(screen.getByLabelText("Limit profile"), { target: { value: PROFILE_ID } });
    expect(screen.getByText(/The results use the saved limit profile/)).toBeTruthy();
    fireEvent.keyDown(window, { key: "s", ctrlKey: true });
    await waitFor(() => expect(api.callsTo(`PUT ${SYSTEM}`)).toHaveLength(2));
    expect(api.callsTo(`PUT ${SYSTEM}`)[1].body).toMatchObject({ version: 4, limitProfileId: PROFILE_ID });
    expect(await screen.findByText("Saved")).toBeTruthy();
  });

  it("on a 409 asks, and Overwrite with mine saves again with the current version", async () => {
    const api = editorApi({
      [`PUT ${SYSTEM}`]: (c) =>
        (c.body as { version: number }).version === 3
          ? apiError(409, "conflict", "This system was saved by someone else.", { currentVersion: 7, updatedAt: "2026-12-01T09:30:00.000Z", updatedBy: "Bea Lund" })
          : { body: { ...record, ...(c.body as object), version: 8 } },
    });
    open();
    await waitFor(() => expect(loadRow("well-pump")).not.toBeNull());
    setNominalVoltage("24.5");
    fireEvent.click(screen.getByRole("button", { name: "Save" }));
    const dialog = await screen.findByRole("dialog", { name: "This system was changed by someone else" });
    expect(dialog.textContent).toContain("Bea Lund");
    expect(within(dialog).getByRole("button", { name: "Reload their version" })).toBeTruthy();
    fireEvent.click(within(dialog).getByRole("button", { name: "Overwrite with mine" }));
    await waitFor(() => expect(screen.queryByRole("dialog")).toBeNull());
    const puts = api.callsTo(`PUT ${SYSTEM}`).map((c) => c.body as { version: number; document: SystemInput });
    expect(puts.map((b) => b.version)).toEqual([3, 7]);
    expect(puts[1].document.nominalVoltage).toBe(24.5);
    expect(screen.getByText("Saved")).toBeTruthy();
  });

  it("on a 409, Reload their version replaces the local edits with theirs", async () => {
    let reads = 0;
    const theirs = { ...record, name: "Their name", version: 7, document: { ...cabin, nominalVoltage: 48 } };
    editorApi({
      [`GET ${SYSTEM}`]: () => {
        reads += 1;
        return { body: reads === 1 ? record : theirs };
      },
      [`PUT ${SYSTEM}`]: apiError(409, "conflict", "This system was saved by someone else.", { currentVersion: 7, updatedAt: "2026-12-01T09:30:00.000Z", updatedBy: null }),
    });
    open();
    await waitFor(() => expect(loadRow("well-pump")).not.toBeNull());
    setNominalVoltage("30");
    fireEvent.click(screen.getByRole("button", { name: "Save" }));
    const dialog = await screen.findByRole("dialog", { name: "This system was changed by someone else" });
    fireEvent.click(within(dialog).getByRole("button", { name: "Reload their version" }));
    await waitFor(() => expect(screen.queryByRole("dialog")).toBeNull());
    expect(nominalVoltage().value).toBe("48");
    expect((screen.getByLabelText("System name") as HTMLInputElement).value).toBe("Their name");
    expect(screen.getByText("Saved")).toBeTruthy();
  });

  it("sends a refused document's field errors back to the layout (not saved)", async () => {
    editorApi({
      [`PUT ${SYSTEM}`]: apiError(400, "invalid_input", "document.runs[1].size: unknown size", { fields: { "document.runs[1].size": "unknown size", name: "name is required" } }),
    });
    open();
    await waitFor(() => expect(loadRow("well-pump")).not.toBeNull());
    setNominalVoltage("26");
    fireEvent.click(screen.getByRole("button", { name: "Save" }));
    expect(await screen.findByText("Not saved: document.runs[1].size: unknown size")).toBeTruthy();
    expect(screen.getByText("name is required")).toBeTruthy();
    expect(screen.getByText("Unsaved changes")).toBeTruthy();
  });

  it("auto-sizes: shows the proposal, and Apply proposal replaces the document as an unsaved edit", async () => {
    const api = editorApi({
      [`POST ${SYSTEM}/autosize`]: (c) => {
        const answer = autosize(documentOf(c), metricCosts);
        return { body: { ...answer, costSource: "default-prices", costNote: "from default prices per size; add your price list for your own prices" } };
      },
      [`PUT ${SYSTEM}`]: (c) => ({ body: { ...record, ...(c.body as object), version: 4 } }),
    });
    open();
    await waitFor(() => expect(loadRow("well-pump")).not.toBeNull());
    fireEvent.click(screen.getByRole("button", { name: "Auto-size" }));
    const dialog = await screen.findByRole("dialog", { name: "Auto-size proposal" });
    const expected = autosize(cabin, metricCosts);
    if (!expected.ok) throw new Error("auto-size failed");
    const changed = expected.runs.filter((r) => r.changed);
    expect(changed.length).toBeGreaterThan(0);
    for (const r of changed) expect(dialog.textContent).toContain(`${r.id}: ${r.before.replace("mm2", "mm²")} → ${r.after.replace("mm2", "mm²")}`);
    expect(dialog.textContent).toContain("from default prices per size; add your price list for your own prices");
    expect(dialog.querySelectorAll("tr[data-load-id]")).toHaveLength(cabin.loads.length);
    expect(api.callsTo(`POST ${SYSTEM}/autosize`).map(documentOf)).toEqual([cabin]);

    fireEvent.click(within(dialog).getByRole("button", { name: "Apply proposal" }));
    expect(screen.queryByRole("dialog")).toBeNull();
    expect(screen.getByText("Unsaved changes")).toBeTruthy();
    await waitFor(() => expect(api.callsTo(`POST ${SYSTEM}/solve`)).toHaveLength(2));
    expect(documentOf(api.callsTo(`POST ${SYSTEM}/solve`)[1])).toEqual(expected.system);
    fireEvent.click(screen.getByRole("button", { name: "Save" }));
    await waitFor(() => expect(api.callsTo(`PUT ${SYSTEM}`)).toHaveLength(1));
    expect((api.callsTo(`PUT ${SYSTEM}`)[0].body as { document: unknown }).document).toEqual(expected.system);
  });

  it("asks before leaving with unsaved changes, and stays when told to", async () => {
    editorApi();
    const router = open();
    await waitFor(() => expect(loadRow("well-pump")).not.toBeNull());
    setNominalVoltage("12");
    fireEvent.click(screen.getByRole("link", { name: "← Lakeside cabin off-grid" }));
    const dialog = await screen.findByRole("dialog", { name: "Leave without saving?" });
    fireEvent.click(within(dialog).getByRole("button", { name: "Stay" }));
    await waitFor(() => expect(screen.queryByRole("dialog")).toBeNull());
    expect(router.state.location.pathname).toBe(paths.system.getHref(JOB_ID, SYSTEM_ID));
  });

  it("lists the bad rows of a refused runs CSV, sending the file with the version and the CSRF header", async () => {
    const api = editorApi({
      [`POST ${SYSTEM}/runs.csv`]: apiError(400, "invalid_input", "Line 4: unknown size", {
        rows: [
          { line: 4, column: "size", message: "unknown size" },
          { line: 7, column: "length", message: "must be greater than 0" },
        ],
      }),
    });
    open();
    await waitFor(() => expect(loadRow("well-pump")).not.toBeNull());
    const file = new File(["id,from,to\n"], "runs.csv", { type: "text/csv" });
    fireEvent.change(screen.getByLabelText("Runs CSV file"), { target: { files: [file] } });
    const alert = await screen.findByText("Line 4, column size: unknown size");
    expect(alert.closest("[role='alert']")!.textContent).toContain("Line 7, column length: must be greater than 0");
    const [upload] = api.callsTo(`POST ${SYSTEM}/runs.csv`);
    expect(upload.headers.get("X-Runwright-Request")).toBe("1");
    const init = vi.mocked(fetch).mock.calls.find(([url]) => String(url).endsWith("/runs.csv"))![1]!;
    const form = init.body as FormData;
    expect(form.get("version")).toBe("3");
    expect((form.get("file") as File).name).toBe("runs.csv");
  });

  it("is read-only for installers: no Save, Auto-size or Import", async () => {
    const api = editorApi({}, "installer");
    open();
    await waitFor(() => expect(loadRow("well-pump")).not.toBeNull());
    expect(screen.queryByRole("button", { name: "Save" })).toBeNull();
    expect(screen.queryByRole("button", { name: "Auto-size" })).toBeNull();
    expect(screen.queryByRole("button", { name: "Import runs CSV" })).toBeNull();
    expect(screen.getByRole("link", { name: "Export runs CSV" })).toBeTruthy();
    expect((screen.getByLabelText("System name") as HTMLInputElement).readOnly).toBe(true);
    expect(nominalVoltage().disabled).toBe(true);
    expect((screen.getByLabelText("Limit profile") as HTMLSelectElement).disabled).toBe(true);
    expect(api.unexpected).toEqual([]);
  });

  it("says when the system does not exist, with the way back to Jobs", async () => {
    editorApi({ [`GET ${SYSTEM}`]: apiError(404, "not_found", "No such system.") });
    open();
    expect(await screen.findByRole("heading", { name: "System not found" })).toBeTruthy();
    expect(screen.getByRole("link", { name: "Back to Jobs" }).getAttribute("href")).toBe(paths.jobs.getHref());
  });

  it("shows a failed load with a way to try again", async () => {
    editorApi({ [`GET ${SYSTEM}`]: apiError(503, "service_unavailable", "The database is not reachable.") });
    open();
    expect(await screen.findByText("The database is not reachable.")).toBeTruthy();
    expect(screen.getByRole("button", { name: "Try again" })).toBeTruthy();
  });
});

describe("the one-line diagram", () => {
  const solvedCabin = solveSystem(cabin);
  if (!solvedCabin.ok) throw new Error("cabin does not solve");

  it("draws sources, points, runs and loads as focusable elements; click and Enter select", () => {
    const onSelect = vi.fn();
    const { rerender } = render(<OneLineDiagram doc={cabin} result={solvedCabin} caseName="Low battery, hot day" selection={null} onSelect={onSelect} />);
    const pump = screen.getByRole("button", { name: "Load well-pump, Over limit" });
    expect(pump.getAttribute("tabindex")).toBe("0");
    expect(pump.textContent).toContain(`${solvedCabin.loads.find((l) => l.id === "well-pump")!.voltage.toFixed(2)} V`);
    expect(pump.textContent).toContain("Over limit");
    const current = Math.abs(solvedCabin.cases[1].runs.find((r) => r.id === "shed-pump")!.current).toFixed(1);
    const run = screen.getByRole("button", { name: `Run shed-pump, 16 mm² · 22 m · ${current} A` });
    expect(screen.getByRole("button", { name: /^Source bank, / })).toBeTruthy();
    expect(screen.getByRole("button", { name: /^Point shed, / })).toBeTruthy();
    fireEvent.click(run);
    expect(onSelect).toHaveBeenLastCalledWith({ kind: "run", id: "shed-pump" });
    fireEvent.keyDown(pump, { key: "Enter" });
    expect(onSelect).toHaveBeenLastCalledWith({ kind: "load", id: "well-pump" });
    rerender(<OneLineDiagram doc={cabin} result={solvedCabin} caseName="Low battery, hot day" selection={{ kind: "load", id: "well-pump" }} onSelect={onSelect} />);
    expect(screen.getByRole("button", { name: "Load well-pump, Over limit" }).getAttribute("aria-pressed")).toBe("true");
    expect(screen.getByRole("button", { name: "Load fridge, Within limit" }).getAttribute("aria-pressed")).toBe("false");
  });

  it("zooms with the buttons and Fit, and pans with the arrow keys", () => {
    render(<OneLineDiagram doc={cabin} result={solvedCabin} caseName={null} selection={null} onSelect={() => {}} />);
    const svg = document.querySelector("svg[aria-roledescription='diagram']")!;
    const box = () => svg.getAttribute("viewBox")!.split(" ").map(Number);
    const fitted = box();
    fireEvent.click(screen.getByRole("button", { name: "Zoom in" }));
    expect(box()[2]).toBeCloseTo(fitted[2] / 1.25, 6);
    fireEvent.click(screen.getByRole("button", { name: "Zoom out" }));
    fireEvent.click(screen.getByRole("button", { name: "Zoom out" }));
    expect(box()[2]).toBeCloseTo(fitted[2] * 1.25, 6);
    fireEvent.keyDown(svg, { key: "ArrowRight" });
    expect(box()[0]).toBeGreaterThan(fitted[0]);
    fireEvent.click(screen.getByRole("button", { name: "Fit" }));
    expect(box()).toEqual(fitted);
  });

  it("does not lay the diagram out again when only a figure changes", () => {
    const layout = vi.spyOn(dagre, "layout");
    const { rerender } = render(<OneLineDiagram doc={cabin} result={solvedCabin} caseName={null} selection={null} onSelect={() => {}} />);
    expect(layout).toHaveBeenCalledTimes(1);
    const longer = { ...cabin, runs: cabin.runs.map((r) => (r.id === "shed-pump" ? { ...r, length: 40 } : r)) };
    rerender(<OneLineDiagram doc={longer} result={solvedCabin} caseName={null} selection={null} onSelect={() => {}} />);
    expect(screen.getByRole("button", { name: /^Run shed-pump, 16 mm² · 40 m/ })).toBeTruthy();
    expect(layout).toHaveBeenCalledTimes(1);
    const moved = { ...longer, loads: longer.loads.map((l) => (l.id === "fridge" ? { ...l, point: "studio" } : l)) };
    rerender(<OneLineDiagram doc={moved} result={solvedCabin} caseName={null} selection={null} onSelect={() => {}} />);
    expect(layout).toHaveBeenCalledTimes(2);
  });

  /** A daisy chain of n loads, each on its own point: dagre's worst case. */
  const chain = (n: number): SystemInput => ({
    format: "runwright-system/1",
    units: "metric",
    nominalVoltage: 24,
    points: [{ id: "bus" }, ...Array.from({ length: n }, (_, i) => ({ id: `p${i}` }))],
    sources: [{ id: "bank", type: "battery", point: "bus", voltage: 25.6 }],
    runs: Array.from({ length: n }, (_, i) => ({ id: `r${i}`, from: i === 0 ? "bus" : `p${i - 1}`, to: `p${i}`, length: 5, size: "6 mm2" })),
    loads: Array.from({ length: n }, (_, i) => ({ id: `l${i}`, point: `p${i}`, model: "constantCurrent" as const, amps: 0.1 })),
  });

  it("lays out 500 loads in columns (dagre takes seconds there), every element placed, without console noise", () => {
    const errors = vi.spyOn(console, "error");
    const warnings = vi.spyOn(console, "warn");
    const layout = layoutDiagram(topologyOf(chain(500)));
    expect(layout.method).toBe("columns");
    expect(layout.nodes).toHaveLength(1 + 501 + 500);
    expect(layout.edges).toHaveLength(1 + 500 + 500);
    expect(layout.nodes.every((n) => Number.isFinite(n.x) && Number.isFinite(n.y))).toBe(true);
    expect(new Set(layout.nodes.map((n) => `${n.x},${n.y}`)).size).toBe(layout.nodes.length);
    // Under the limit, dagre.
    expect(layoutDiagram(topologyOf(chain(100))).method).toBe("dagre");
    expect(layoutDiagram(topologyOf(cabin)).method).toBe("dagre");
    expect(errors).not.toHaveBeenCalled();
    expect(warnings).not.toHaveBeenCalled();
  });

  it("draws a system over the dagre limit in columns, every load a button", () => {
    const doc = chain(130);
    expect(1 + 131 + 130).toBeGreaterThan(DAGRE_NODE_LIMIT);
    const layout = vi.spyOn(dagre, "layout");
    render(<OneLineDiagram doc={doc} result={null} caseName={null} selection={null} onSelect={() => {}} />);
    expect(layout).not.toHaveBeenCalled();
    expect(document.querySelector("svg[data-layout='columns']")).not.toBeNull();
    expect(screen.getByText("Large system: drawn in columns by distance from the source.")).toBeTruthy();
    // (A query by selector: role queries over hundreds of SVG elements are slow in jsdom.)
    const loads = [...document.querySelectorAll("[role='button'][aria-label^='Load ']")];
    expect(loads).toHaveLength(130);
    expect(loads.every((el) => /^Load l\d+, not solved yet$/.test(el.getAttribute("aria-label")!))).toBe(true);
  });
});
