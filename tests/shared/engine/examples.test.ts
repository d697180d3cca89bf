// The example network files in shared/engine/examples/ (invented scenarios) solve, and the
// command line reads them: the off-grid cabin fails its 3 % critical limit at low battery on a hot
// day and auto-size fixes it; the 48 V cabinet passes.
import { execFileSync } from "node:child_process";
import { readFileSync } from "node:fs";
import path from "node:path";
import { describe, expect, it } from "vitest";
import { autosize } from "../../../shared/engine/autosize.js";
import { solveSystem } from "../../../shared/engine/system.js";

const root = path.resolve(import.meta.dirname, "..", "..", "..");
const example = (name: string) => path.join(root, "shared", "engine", "examples", name);
const read = (name: string): unknown => JSON.parse(readFileSync(example(name), "utf8"));

describe("example network files", () => {
  it.each(["cabin-24v.json", "garden-12v.json", "telecom-48v.json"])("%s solves in every case", (name) => {
    const r = solveSystem(read(name));
    expect(r.ok).toBe(true);
    if (r.ok) {
      expect(r.cases.length).toBe(2);
      expect(r.loads.length).toBeGreaterThan(0);
      expect(r.cautions.length).toBe(3);
    }
  });

  it("the cabin's well pump is over its critical limit at low battery, and auto-size brings every load within limits", () => {
    const before = solveSystem(read("cabin-24v.json"));
    if (!before.ok) throw new Error("cabin example does not solve");
    const pump = before.loads.find((l) => l.id === "well-pump")!;
    expect(pump.status).toBe("over");
    expect(pump.worstCase).toBe("Low battery, hot day");
    const proposal = autosize(read("cabin-24v.json"), read("costs-metric.json"));
    if (!proposal.ok) throw new Error(JSON.stringify(proposal.errors));
    expect(proposal.passes).toBe(true);
    expect(proposal.costDifference!).toBeGreaterThan(0);
    const after = solveSystem(proposal.system);
    expect(after.ok && after.loads.every((l) => l.status !== "over")).toBe(true);
  });

  it("the command line solves an example and auto-sizes it", () => {
    const out = execFileSync(process.execPath, ["server/scripts/engine.mjs", "solve", example("telecom-48v.json"), "--case", "On rectifier"], { cwd: root, encoding: "utf8" });
    const r = JSON.parse(out);
    expect(r.ok).toBe(true);
    expect(r.cases.map((c: { name: string }) => c.name)).toEqual(["On rectifier"]);
    const sized = JSON.parse(execFileSync(process.execPath, ["server/scripts/engine.mjs", "autosize", example("garden-12v.json"), example("costs-imperial.json")], { cwd: root, encoding: "utf8" }));
    expect(sized.ok).toBe(true);
    expect(sized.passes).toBe(true);
  });
});
