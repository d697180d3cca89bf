// The System editor's results against real engine answers: the loads table (rows, statuses, worst
// case, limit, order, selection), the runs and points tables, the findings, and the path helper.
import { cleanup, fireEvent, render, screen, within } from "@testing-library/react";
import { afterEach, describe, expect, it, vi } from "vitest";
import cabinFile from "../../shared/engine/examples/cabin-24v.json";
import gardenFile from "../../shared/engine/examples/garden-12v.json";
import telecomFile from "../../shared/engine/examples/telecom-48v.json";
import { solveSystem } from "../../shared/engine";
import type { SystemInput } from "../../shared/engine/schema";
import type { SolveSuccess } from "../../shared/engine/system";
import { DropChart, PathVoltageChart } from "../../src/features/system-editor/components/results-charts";
import { ResultsFindings } from "../../src/features/system-editor/components/results-findings";
import { ResultsLoadsTable } from "../../src/features/system-editor/components/results-loads-table";
import { ResultsPointsTable } from "../../src/features/system-editor/components/results-points-table";
import { ResultsRunsTable } from "../../src/features/system-editor/components/results-runs-table";
import { limitVoltage, pathToLoad, selectionForId, statusSummary, voltageAlongPath } from "../../src/features/system-editor/lib/results";

afterEach(cleanup);

const copy = (file: unknown) => structuredClone(file) as SystemInput;
const solved = (doc: SystemInput): SolveSuccess => {
  const result = solveSystem(doc);
  if (!result.ok) throw new Error(`does not solve: ${result.errors.map((e) => e.message).join("; ")}`);
  return result;
};
const withSizes = (doc: SystemInput, sizes: Record<string, string>): SystemInput => ({ ...doc, runs: doc.runs.map((r) => (sizes[r.id] ? { ...r, size: sizes[r.id] } : r)) });

const cabin = copy(cabinFile);
const cabinResult = solved(cabin);
/** Larger pump feeders: the pump comes down to Near limit, the studio lights stay over. */
const cabinBetter = withSizes(cabin, { "feed-shed": "50 mm2", "shed-pump": "50 mm2" });
const cabinBetterResult = solved(cabinBetter);

const rowOf = (id: string) => document.querySelector<HTMLTableRowElement>(`tr[data-load-id="${id}"]`)!;
const cells = (row: HTMLTableRowElement) => [...row.querySelectorAll("td")].map((td) => td.textContent ?? "");
const loadOrder = () => [...document.querySelectorAll("tr[data-load-id]")].map((tr) => tr.getAttribute("data-load-id"));

describe("the loads table", () => {
  it("shows every load in its worst case with voltage, drop, current, status and the limit it was checked against", () => {
    render(<ResultsLoadsTable doc={cabin} result={cabinResult} selection={null} onSelect={() => {}} />);
    expect(document.querySelectorAll("tr[data-load-id]")).toHaveLength(4);

    const pump = cabinResult.loads.find((l) => l.id === "well-pump")!;
    const pumpInCase = cabinResult.cases.find((c) => c.name === pump.worstCase)!.loads.find((l) => l.id === "well-pump")!;
    expect(pump.worstCase).toBe("Low battery, hot day");
    const [name, volts, drop, worstCase, current, status, limit] = cells(rowOf("well-pump"));
    expect(name).toBe("Well pump (DC drive)well-pump");
    expect(volts).toBe(pump.voltage.toFixed(2));
    expect(drop).toBe(pump.dropPercent.toFixed(2));
    expect(worstCase).toBe("Low battery, hot day");
    expect(current).toBe(pumpInCase.current.toFixed(2));
    expect(status).toBe("Over limit");
    expect(limit).toBe("3 % critical");

    // The studio lights are checked against the branch limit; the fridge against the total.
    expect(cells(rowOf("studio-lights"))[5]).toBe("Over limit");
    expect(cells(rowOf("studio-lights"))[6]).toMatch(/^3 % branch\d+\.\d\d % on the branch$/);
    expect(cells(rowOf("fridge"))[5]).toBe("Within limit");
    expect(cells(rowOf("fridge"))[6]).toBe("5 % total");
  });

  it("marks over-limit rows with an icon, bold text and the brick colour, and says the count above", () => {
    render(<ResultsLoadsTable doc={cabin} result={cabinResult} selection={null} onSelect={() => {}} />);
    const over = rowOf("well-pump");
    expect(over.className).toContain("font-bold");
    expect(over.className).toContain("text-over-700");
    expect(over.querySelector("svg[aria-hidden='true']")).not.toBeNull();
    expect(rowOf("fridge").className).not.toContain("font-bold");
    expect(screen.getByRole("status").textContent).toBe("2 over limit, 0 near, 2 within");
  });

  it("sorts worst first: over before near before within, further into the limit first", () => {
    render(<ResultsLoadsTable doc={cabin} result={cabinResult} selection={null} onSelect={() => {}} />);
    // The pump is 9.77 % against 3 % (critical), the studio 3.46 % branch against 3 %.
    expect(loadOrder()).toEqual(["well-pump", "studio-lights", "cabin-lights", "fridge"]);
    cleanup();

    render(<ResultsLoadsTable doc={cabinBetter} result={cabinBetterResult} selection={null} onSelect={() => {}} />);
    expect(cells(rowOf("well-pump"))[5]).toBe("Near limit");
    expect(loadOrder()).toEqual(["studio-lights", "well-pump", "cabin-lights", "fridge"]);
    expect(screen.getByRole("status").textContent).toBe("1 over limit, 1 near, 2 within");
    expect(statusSummary(cabinBetterResult.loads)).toBe("1 over limit, 1 near, 2 within");
  });

  it("selects the load when its row is clicked, and marks the selected row", () => {
    const onSelect = vi.fn();
    const { rerender } = render(<ResultsLoadsTable doc={cabin} result={cabinResult} selection={null} onSelect={onSelect} />);
    fireEvent.click(within(rowOf("fridge")).getByText("5 % total"));
    expect(onSelect).toHaveBeenLastCalledWith({ kind: "load", id: "fridge" });
    fireEvent.click(within(rowOf("well-pump")).getByRole("button"));
    expect(onSelect).toHaveBeenLastCalledWith({ kind: "load", id: "well-pump" });
    expect(onSelect).toHaveBeenCalledTimes(2);
    rerender(<ResultsLoadsTable doc={cabin} result={cabinResult} selection={{ kind: "load", id: "fridge" }} onSelect={onSelect} />);
    expect(within(rowOf("fridge")).getByRole("button").getAttribute("aria-current")).toBe("true");
    expect(within(rowOf("well-pump")).getByRole("button").getAttribute("aria-current")).toBeNull();
  });
});

describe("the runs table", () => {
  const telecom = copy(telecomFile);
  const telecomResult = solved(telecom);

  it("shows from → to, size, length, current, drop, loss and the ampacity use of every run in the chosen case", () => {
    const kase = telecomResult.cases[1];
    render(<ResultsRunsTable doc={telecom} kase={kase} findings={telecomResult.findings} selection={null} onSelect={() => {}} />);
    const row = document.querySelector<HTMLTableRowElement>('tr[data-run-id="bdfb-radio"]')!;
    const rr = kase.runs.find((r) => r.id === "bdfb-radio")!;
    const [id, fromTo, size, length, current, drop, loss, use, fuse] = cells(row);
    expect([id, fromTo, size, length]).toEqual(["bdfb-radio", "bdfb → radio", "6 AWG", "25"]);
    expect(current).toBe(Math.abs(rr.current).toFixed(2));
    expect(drop).toBe(rr.dropV.toFixed(3));
    expect(loss).toBe(rr.lossW.toFixed(1));
    expect(rr.utilizationPercent).not.toBeNull();
    expect(use).toBe(`${Math.round(rr.utilizationPercent!)} %`);
    expect(fuse).toBe("OK");
    expect(screen.getByRole("columnheader", { name: "Length (ft)" })).toBeTruthy();
  });

  it('shows "—" for ampacity where the table has no value (metric sizes), and the fuse message of a run', () => {
    render(<ResultsRunsTable doc={cabin} kase={cabinResult.cases[0]} findings={cabinResult.findings} selection={null} onSelect={() => {}} />);
    const row = document.querySelector<HTMLTableRowElement>('tr[data-run-id="shed-pump"]')!;
    expect(cells(row)[2]).toBe("16 mm²");
    expect(cells(row)[7]).toBe("—");
    cleanup();

    const smallFuse: SystemInput = { ...telecom, runs: telecom.runs.map((r) => (r.id === "bdfb-radio" ? { ...r, fuseA: 25 } : r)) };
    const result = solved(smallFuse);
    render(<ResultsRunsTable doc={smallFuse} kase={result.cases[0]} findings={result.findings} selection={null} onSelect={() => {}} />);
    const finding = result.findings.find((f) => f.code === "FUSE_TOO_SMALL")!;
    expect(finding.ids[0]).toBe("bdfb-radio");
    expect(cells(document.querySelector<HTMLTableRowElement>('tr[data-run-id="bdfb-radio"]')!)[8]).toBe(finding.message);
    expect(cells(document.querySelector<HTMLTableRowElement>('tr[data-run-id="bdfb-cam"]')!)[8]).toBe("OK");
  });

  it("selects the run when its row is clicked", () => {
    const onSelect = vi.fn();
    render(<ResultsRunsTable doc={telecom} kase={telecomResult.cases[0]} findings={telecomResult.findings} selection={null} onSelect={onSelect} />);
    fireEvent.click(document.querySelector('tr[data-run-id="bdfb-cam"] td:nth-child(5)')!);
    expect(onSelect).toHaveBeenCalledWith({ kind: "run", id: "bdfb-cam" });
  });
});

describe("the points table and the findings", () => {
  it("shows each point's voltage and fault current (kA from 1000 A), and an interrupting rating it exceeds", () => {
    const telecom = copy(telecomFile);
    const weak: SystemInput = { ...telecom, points: telecom.points.map((p) => (p.id === "bdfb" ? { ...p, fuseInterruptingA: 1000 } : p)) };
    const result = solved(weak);
    const kase = result.cases[0];
    render(<ResultsPointsTable doc={weak} kase={kase} findings={result.findings} selection={null} onSelect={() => {}} />);
    const rect = kase.points.find((p) => p.id === "rect")!;
    const cam = kase.points.find((p) => p.id === "cam")!;
    expect(rect.faultCurrentA!).toBeGreaterThan(1000);
    expect(cam.faultCurrentA!).toBeLessThan(1000);
    const row = (id: string) => cells(document.querySelector<HTMLTableRowElement>(`tr[data-point-id="${id}"]`)!);
    expect(row("rect")[1]).toBe(rect.voltage.toFixed(2));
    expect(row("rect")[2]).toBe(`${(rect.faultCurrentA! / 1000).toFixed(1)} kA`);
    expect(row("cam")[2]).toBe(`${Math.round(cam.faultCurrentA!)} A`);
    const over = result.findings.find((f) => f.code === "FAULT_OVER_INTERRUPTING" && f.ids.includes("bdfb"))!;
    expect(row("bdfb")[3]).toContain(over.message);
  });

  it("lists the findings, errors first, and Show selects what a finding is about", () => {
    const onSelect = vi.fn();
    render(<ResultsFindings doc={cabin} findings={cabinResult.findings} onSelect={onSelect} />);
    const items = screen.getAllByRole("listitem");
    expect(items).toHaveLength(cabinResult.findings.length);
    expect(items[0].textContent).toContain("Load well-pump is over limit");
    expect(items[0].textContent).toContain("Error");
    expect(items[items.length - 1].textContent).toContain("Ampacity is not checked");
    fireEvent.click(within(items[0]).getByRole("button", { name: "Show" }));
    expect(onSelect).toHaveBeenCalledWith({ kind: "load", id: "well-pump" });
  });

  it("prefers the kind a finding is about when a load and a point share an id", () => {
    const telecom = copy(telecomFile);
    expect(selectionForId(telecom, "radio", "DROP_OVER_LIMIT")).toEqual({ kind: "load", id: "radio" });
    expect(selectionForId(telecom, "radio", "FAULT_OVER_INTERRUPTING")).toEqual({ kind: "point", id: "radio" });
    expect(selectionForId(telecom, "radio")).toEqual({ kind: "load", id: "radio" });
    expect(selectionForId(telecom, "bdfb", "FAULT_OVER_INTERRUPTING")).toEqual({ kind: "point", id: "bdfb" });
    expect(selectionForId(telecom, "nowhere")).toBeNull();
  });
});

describe("the voltage along the path", () => {
  it("returns the points from the source to the load in order, with cumulative one-way lengths and each voltage", () => {
    expect(pathToLoad(cabin, "well-pump").map((s) => [s.id, s.distance])).toEqual([
      ["bus", 0],
      ["shed", 8],
      ["pump", 30],
    ]);
    expect(pathToLoad(cabin, "studio-lights").map((s) => [s.id, s.distance, s.runId])).toEqual([
      ["bus", 0, undefined],
      ["cabin", 6, "feed-cabin"],
      ["studio", 24, "cabin-studio"],
    ]);
    const kase = cabinResult.cases[1];
    const path = voltageAlongPath(cabin, kase, "well-pump");
    expect(path.map((p) => p.kind)).toEqual(["point", "point", "point", "load"]);
    expect(path[1].voltage).toBe(kase.points.find((p) => p.id === "shed")!.voltage);
    expect(path[3]).toMatchObject({ id: "well-pump", distance: 30, voltage: kase.loads.find((l) => l.id === "well-pump")!.voltage });
    // Voltage falls along the way.
    expect(path[0].voltage!).toBeGreaterThan(path[1].voltage!);
    expect(path[1].voltage!).toBeGreaterThan(path[2].voltage!);
  });

  it("follows a daisy chain in feet, and runs entered backwards", () => {
    const garden = copy(gardenFile);
    expect(pathToLoad(garden, "lamp03").map((s) => [s.id, s.distance])).toEqual([
      ["xfmr", 0],
      ["j0", 50],
      ["f01", 60],
      ["f02", 70],
      ["f03", 80],
    ]);
    const reversed: SystemInput = { ...garden, runs: garden.runs.map((r) => (r.id === "r02" ? { ...r, from: r.to, to: r.from } : r)) };
    expect(pathToLoad(reversed, "lamp03").map((s) => s.id)).toEqual(["xfmr", "j0", "f01", "f02", "f03"]);
    expect(pathToLoad(garden, "no-such-load")).toEqual([]);
  });

  it("puts the limit line where the load would sit exactly at its limit", () => {
    const kase = cabinResult.cases[1];
    const pump = kase.loads.find((l) => l.id === "well-pump")!;
    const bus = kase.points.find((p) => p.id === "bus")!;
    // Critical limit 3 % of 24 V below the source's terminals.
    expect(pump.governingLimit).toBe("critical");
    expect(limitVoltage(pump, 24)).toBeCloseTo(bus.voltage - 0.72, 9);
  });
});

describe("the charts", () => {
  it("draw nothing at zero width (jsdom) but list their figures for screen readers: the path in order, the drops by status", () => {
    const kase = cabinResult.cases[1];
    render(
      <>
        <PathVoltageChart doc={cabin} kase={kase} loadId="well-pump" />
        <DropChart doc={cabinBetter} result={cabinBetterResult} />
      </>,
    );
    expect(document.querySelector(".recharts-wrapper")).toBeNull();
    const path = screen.getByRole("table", { name: "Voltage at each point from the source to Well pump (DC drive)" });
    const rows = within(path).getAllByRole("row").slice(1).map((tr) => [...tr.querySelectorAll("td")].map((td) => td.textContent));
    const volts = (id: string) => kase.points.find((p) => p.id === id)!.voltage.toFixed(2);
    expect(rows).toEqual([
      ["Battery bus bar", "0.0", volts("bus")],
      ["Pump shed junction box", "8.0", volts("shed")],
      ["Well pump controller", "30.0", volts("pump")],
      ["Load Well pump (DC drive)", "30.0", kase.loads.find((l) => l.id === "well-pump")!.voltage.toFixed(2)],
    ]);
    const drops = screen.getByRole("table", { name: "Drop per load against its limit" });
    const dropRows = within(drops).getAllByRole("row").slice(1).map((tr) => [...tr.querySelectorAll("td")].map((td) => td.textContent));
    expect(dropRows.map((r) => [r[0], r[3]])).toEqual([
      ["Studio LED drivers", "Over limit"],
      ["Well pump (DC drive)", "Near limit"],
      ["Cabin LED drivers", "Within limit"],
      ["Fridge compressor", "Within limit"],
    ]);
    expect(dropRows[0][2]).toBe("3 % branch");
    expect(dropRows[1][2]).toBe("3 % critical");
  });
});

describe("long results tables", () => {
  // 120 fixtures on one bus: constant-current loads of 0.2 … 2.58 A on runs of 5 … 64.5 m.
  const many: SystemInput = {
    format: "runwright-system/1",
    units: "metric",
    nominalVoltage: 24,
    points: [{ id: "bus" }, ...Array.from({ length: 120 }, (_, i) => ({ id: `f${i}` }))],
    sources: [{ id: "bank", type: "battery", point: "bus", voltage: 25.6 }],
    runs: Array.from({ length: 120 }, (_, i) => ({ id: `r${i}`, from: "bus", to: `f${i}`, length: 5 + i * 0.5, size: "2.5 mm2" })),
    loads: Array.from({ length: 120 }, (_, i) => ({ id: `l${i}`, point: `f${i}`, model: "constantCurrent" as const, amps: 0.2 + i * 0.02 })),
  };
  const manyResult = solved(many);

  it("draws the worst 50 loads, keeps a selected one beyond them, and shows all on request", () => {
    const { rerender } = render(<ResultsLoadsTable doc={many} result={manyResult} selection={null} onSelect={() => {}} />);
    expect(loadOrder()).toHaveLength(50);
    // Worst first: the longest run with the largest current is l119.
    expect(loadOrder()[0]).toBe("l119");
    expect(screen.getByText("Showing the first 50 of 120 loads.")).toBeTruthy();
    rerender(<ResultsLoadsTable doc={many} result={manyResult} selection={{ kind: "load", id: "l0" }} onSelect={() => {}} />);
    expect(loadOrder()).toHaveLength(51);
    expect(loadOrder().at(-1)).toBe("l0");
    fireEvent.click(screen.getByRole("button", { name: "Show all 120 loads" }));
    expect(loadOrder()).toHaveLength(120);
    fireEvent.click(screen.getByRole("button", { name: "Show the first 50" }));
    expect(loadOrder()).toHaveLength(51);
  });

  it("caps the runs table the same way", () => {
    render(<ResultsRunsTable doc={many} kase={manyResult.cases[0]} findings={manyResult.findings} selection={{ kind: "run", id: "r100" }} onSelect={() => {}} />);
    const ids = [...document.querySelectorAll("tr[data-run-id]")].map((tr) => tr.getAttribute("data-run-id"));
    expect(ids).toHaveLength(51);
    expect(ids).toContain("r100");
    expect(screen.getByRole("button", { name: "Show all 120 runs" })).toBeTruthy();
  });
});
