// The engine's command line: node server/scripts/engine.mjs solve|autosize (server/scripts/engine-cli.ts).
// Exit 0 + JSON with ok:true on success; exit 2 + { ok:false, errors } on stdout + a one-line message
// on stderr for bad input; exit 1 for a usage error.
import { execFile } from "node:child_process";
import { mkdtempSync, rmSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import path from "node:path";
import { fileURLToPath } from "node:url";
import { afterAll, beforeAll, describe, expect, it } from "vitest";

const root = fileURLToPath(new URL("../../../", import.meta.url));
const script = path.join("server", "scripts", "engine.mjs");
let dir = "";

interface Run { code: number | null; stdout: string; stderr: string }
function cli(...args: string[]): Promise<Run> {
  return new Promise((resolve) => {
    execFile(process.execPath, [script, ...args], { cwd: root, timeout: 60_000, maxBuffer: 64 * 1024 * 1024 }, (error, stdout, stderr) => {
      const code = error ? (typeof error.code === "number" ? error.code : null) : 0;
      resolve({ code, stdout, stderr });
    });
  });
}
function file(name: string, content: unknown): string {
  const p = path.join(dir, name);
  writeFileSync(p, typeof content === "string" ? content : JSON.stringify(content));
  return p;
}
function json(r: Run) {
  return JSON.parse(r.stdout);
}
function expectBadInput(r: Run, code: string) {
  expect(r.code, r.stderr).toBe(2);
  const out = json(r);
  expect(out.ok).toBe(false);
  expect(Array.isArray(out.errors)).toBe(true);
  expect(out.errors[0].code).toBe(code);
  const lines = r.stderr.trimEnd().split("\n");
  expect(lines, r.stderr).toHaveLength(1);
  expect(lines[0]).toMatch(/^runwright: \S/);
  return out;
}
function expectUsage(r: Run) {
  expect(r.code).toBe(1);
  expect(r.stdout).toBe("");
  expect(r.stderr).toMatch(/^usage: /);
}

/** The network file example of the brief: 24 V metric, a 600 W pump 40 m away on 16 mm2. */
function metric(length: number | string = 40): Record<string, unknown> {
  return {
    format: "runwright-system/1", units: "metric", nominalVoltage: 24, conductorTemperatureC: 60,
    points: [{ id: "bus" }, { id: "pump" }],
    sources: [{ id: "bank", type: "battery", point: "bus", voltage: 25.6, internalResistanceOhm: 0.01 }],
    runs: [{ id: "r1", from: "bus", to: "pump", length, size: "16 mm2", material: "copper", parallel: 1 }],
    loads: [{ id: "p1", point: "pump", model: "constantPower", watts: 600, critical: true, minVoltage: 20 }],
    cases: [{ name: "full" }, { name: "low", sourceVoltages: { bank: 24.0 } }],
  };
}
/** Example A of the trade-license exam prep lesson (tradelicenseprep.com): 120 V, 20 A, 12 AWG. */
function imperial(length: number | string = 130): Record<string, unknown> {
  return {
    format: "runwright-system/1", units: "imperial", nominalVoltage: 120, conductorTemperatureC: 75,
    points: [{ id: "panel" }, { id: "outlet" }],
    sources: [{ id: "utility", type: "supply", point: "panel", voltage: 120, internalResistanceOhm: 0 }],
    runs: [{ id: "branch", from: "panel", to: "outlet", length, size: "12 AWG" }],
    loads: [{ id: "heater", point: "outlet", model: "constantCurrent", amps: 20 }],
  };
}
const costs = {
  format: "runwright-costs/1",
  per: "m",
  items: [
    { material: "copper", size: "16 mm2", cost: 4.2 },
    { material: "copper", size: "25 mm2", cost: 6.5 },
    { material: "copper", size: "35 mm2", cost: 9.1 },
    { material: "copper", size: "50 mm2", cost: 12.8 },
  ],
};

beforeAll(async () => {
  dir = mkdtempSync(path.join(tmpdir(), "runwright-cli-"));
  // The first run bundles the CLI with esbuild; do it once before the concurrent tests.
  const r = await cli("solve", file("warmup.json", metric()));
  expect(r.code, r.stderr).toBe(0);
}, 120_000);
afterAll(() => {
  if (dir) rmSync(dir, { recursive: true, force: true });
});

describe.concurrent("engine CLI: solve", () => {
  it("exit 0 and the result contract as JSON", async () => {
    const r = await cli("solve", file("ok.json", metric()));
    expect(r.code, r.stderr).toBe(0);
    const out = json(r);
    expect(out.ok).toBe(true);
    expect(out.cases.map((c: { name: string }) => c.name)).toEqual(["full", "low"]);
    expect(out.cautions).toHaveLength(3);
    expect(r.stderr).toBe("");
  });

  it("--case NAME solves only that case", async () => {
    const r = await cli("solve", file("case.json", metric()), "--case", "low");
    expect(r.code, r.stderr).toBe(0);
    const out = json(r);
    expect(out.cases.map((c: { name: string }) => c.name)).toEqual(["low"]);
    expect(out.cases[0].sources[0].id).toBe("bank");
  });

  it("--case with an unknown name: exit 2, UNKNOWN_CASE", async () => {
    expectBadInput(await cli("solve", file("nocase.json", metric()), "--case", "nope"), "UNKNOWN_CASE");
  });

  it("a bad file (unknown size): exit 2, { ok:false, errors } on stdout, one line on stderr", async () => {
    const doc = metric();
    (doc.runs as Record<string, unknown>[])[0].size = "17 mm2";
    const out = expectBadInput(await cli("solve", file("badsize.json", doc)), "UNKNOWN_SIZE");
    expect(out.errors[0].path).toBe("runs[0].size");
  });

  it("invalid JSON: exit 2, INVALID_JSON", async () => {
    const r = await cli("solve", file("broken.json", '{ "format": "runwright-system/1", '));
    const out = expectBadInput(r, "INVALID_JSON");
    expect(out.errors[0].message).toContain("broken.json");
  });

  it("a missing file: exit 2, CANNOT_READ naming the file", async () => {
    const missing = path.join(dir, "does-not-exist.json");
    const out = expectBadInput(await cli("solve", missing), "CANNOT_READ");
    expect(out.errors[0].message).toContain("does-not-exist.json");
  });

  it("a file that is valid JSON but not a system: exit 2, INVALID_FIELD", async () => {
    expectBadInput(await cli("solve", file("array.json", "[1, 2, 3]")), "INVALID_FIELD");
  });

  it("usage errors: exit 1", async () => {
    const f = file("usage.json", metric());
    const runs = await Promise.all([
      cli(),
      cli("frobnicate", f),
      cli("solve"),
      cli("solve", f, f),
      cli("solve", f, "--case"),
      cli("solve", f, "--verbose"),
    ]);
    for (const r of runs) expectUsage(r);
  });
});

describe.concurrent("engine CLI: lengths given as text", () => {
  const dropV = (r: Run) => {
    expect(r.code, r.stderr).toBe(0);
    return json(r).cases[0].runs[0].dropV as number;
  };

  it("\"130 ft\" in an imperial system is the same as 130", async () => {
    const [text, num] = await Promise.all([cli("solve", file("i-text.json", imperial("130 ft"))), cli("solve", file("i-num.json", imperial(130)))]);
    const a = dropV(text);
    const b = dropV(num);
    expect(a).toBe(b);
    // and it is the handbook figure: 2·20 A·130 ft·1.98 Ω/kft / 1000 (NFPA 70 Ch. 9 Table 8, electrical-design-tutor.com)
    expect(Math.abs(b - (2 * 20 * 130 * 1.98) / 1000) / b).toBeLessThan(1e-9);
  });

  it("\"39.624 m\" in an imperial system is 130 ft", async () => {
    const [text, num] = await Promise.all([cli("solve", file("i-metres.json", imperial("39.624 m"))), cli("solve", file("i-130.json", imperial(130)))]);
    expect(Math.abs(dropV(text) - dropV(num)) / dropV(num)).toBeLessThan(1e-9);
  });

  it("\"40 m\" in a metric system is the same as 40", async () => {
    const [text, num] = await Promise.all([cli("solve", file("m-text.json", metric("40 m"))), cli("solve", file("m-num.json", metric(40)))]);
    expect(text.code, text.stderr).toBe(0);
    expect(json(text).cases).toEqual(json(num).cases);
  });

  it("\"131.2336 ft\" in a metric system is 40 m (within 1e-6)", async () => {
    const [text, num] = await Promise.all([cli("solve", file("m-feet.json", metric("131.2336 ft"))), cli("solve", file("m-40.json", metric(40)))]);
    expect(Math.abs(dropV(text) - dropV(num)) / dropV(num)).toBeLessThan(1e-6);
  });

  it("a length that is not a length: exit 2, INVALID_FIELD at runs[0].length", async () => {
    for (const [name, length] of [["forty.json", "forty metres"], ["kg.json", "40 kg"]]) {
      const out = expectBadInput(await cli("solve", file(name, metric(length))), "INVALID_FIELD");
      expect(out.errors[0].path).toBe("runs[0].length");
    }
  });
});

describe.concurrent("engine CLI: autosize", () => {
  it("exit 0 and a proposal with ok:true", async () => {
    const r = await cli("autosize", file("as-sys.json", metric()), file("as-costs.json", costs));
    expect(r.code, r.stderr).toBe(0);
    const out = json(r);
    expect(out.ok).toBe(true);
    expect(typeof out.passes).toBe("boolean");
    expect(out.runs).toHaveLength(1);
    expect(out.runs[0].id).toBe("r1");
    expect(costs.items.map((i) => i.size)).toContain(out.runs[0].after);
    expect(out.system.format).toBe("runwright-system/1");
    // cost = cost per metre of one conductor × 2 conductors × 40 m
    const per = costs.items.find((i) => i.size === out.runs[0].after)!.cost;
    expect(out.costAfter).toBeCloseTo(per * 2 * 40, 9);
    expect(out.costBefore).toBeCloseTo(4.2 * 2 * 40, 9);
  });

  it("a text length is converted before auto-sizing too", async () => {
    const [text, num] = await Promise.all([
      cli("autosize", file("as-text.json", metric("40 m")), file("as-costs2.json", costs)),
      cli("autosize", file("as-num.json", metric(40)), file("as-costs3.json", costs)),
    ]);
    expect(text.code, text.stderr).toBe(0);
    expect(json(text).runs).toEqual(json(num).runs);
    expect(json(text).costAfter).toBe(json(num).costAfter);
  });

  it("bad costs (unknown size): exit 2, UNKNOWN_SIZE at costs.items[0].size", async () => {
    const bad = { ...costs, items: [{ material: "copper", size: "17 mm2", cost: 1 }] };
    const out = expectBadInput(await cli("autosize", file("bc-sys.json", metric()), file("bad-costs.json", bad)), "UNKNOWN_SIZE");
    expect(out.errors[0].path).toBe("costs.items[0].size");
  });

  it("a costs file of the wrong format: exit 2, INVALID_FIELD", async () => {
    const out = expectBadInput(await cli("autosize", file("wf-sys.json", metric()), file("wf-costs.json", { ...costs, format: "prices/9" })), "INVALID_FIELD");
    expect(out.errors[0].path).toMatch(/^costs\./);
  });

  it("a missing costs file or invalid JSON: exit 2", async () => {
    const sys = file("mc-sys.json", metric());
    expectBadInput(await cli("autosize", sys, path.join(dir, "no-costs.json")), "CANNOT_READ");
    expectBadInput(await cli("autosize", sys, file("bad-json-costs.json", "{ per: m }")), "INVALID_JSON");
  });

  it("a bad system file: exit 2", async () => {
    const doc = metric();
    (doc.runs as Record<string, unknown>[])[0].size = "17 mm2";
    expectBadInput(await cli("autosize", file("as-bad.json", doc), file("as-costs4.json", costs)), "UNKNOWN_SIZE");
  });

  it("usage errors: exit 1", async () => {
    const sys = file("u-sys.json", metric());
    const c = file("u-costs.json", costs);
    const runs = await Promise.all([cli("autosize"), cli("autosize", sys), cli("autosize", sys, c, c), cli("autosize", sys, "--fast")]);
    for (const r of runs) expectUsage(r);
  });
});
