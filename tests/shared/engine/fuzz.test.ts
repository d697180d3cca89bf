// Fuzz of the network document through the engine's entry point, solveSystem(): thousands of
// generated documents — valid, near-valid (one to three mutations the engine must refuse naming
// the field) and broken (junk, NaN/±Infinity as real numbers, 0 m runs, 50,000-element arrays,
// values nested 10,000 deep, duplicate ids, dangling references, wrong types) — and large,
// densely meshed or collapsing networks against the work budget. Every answer must be a value:
// no throw, a well-formed result or errors naming the field, and no hang.
// The documents come from tests/support/fuzz-documents.ts (shared with the API's fuzz,
// tests/server/hostile/fuzz-solve.test.ts). Reproduce a run with FUZZ_SEED=<seed> (fast-check
// prints the seed and the path of a failure); FUZZ_ENGINE_RUNS changes the number of documents.
import fc from "fast-check";
import { performance } from "node:perf_hooks";
import { describe, expect, it } from "vitest";
import { API_WORK_LIMITS, SYSTEM_LIMITS } from "../../../shared/engine/schema.js";
import { solveSystem, type SolveResult } from "../../../shared/engine/system.js";
import { bigNetwork, describeCase, fuzzCase, problemsWith, type FuzzCase, type Shape } from "../../support/fuzz-documents.js";

const SEED = Number(process.env.FUZZ_SEED ?? 20_261_202);
const RUNS = Number(process.env.FUZZ_ENGINE_RUNS ?? 8000);
/** A solve that takes longer than this is a hang (documents here solve in milliseconds; the
 *  50,000-element ones in about 0.1 s). Wall time, so a loaded machine gets the same margin. */
const HANG_MS = Number(process.env.FUZZ_HANG_MS ?? 5000);

const counts = { valid: 0, "near-valid": 0, extreme: 0, broken: 0, big: 0 };
const outcomes = { solved: 0, refused: 0, validSolved: 0 };
let slowest = { ms: 0, what: "" };

function timedSolve(doc: unknown, limits?: typeof API_WORK_LIMITS): { result: SolveResult; ms: number; cpuMs: number } {
  const cpu0 = process.cpuUsage();
  const t0 = performance.now();
  const result = solveSystem(doc, limits);
  const ms = performance.now() - t0;
  const cpu = process.cpuUsage(cpu0);
  return { result, ms, cpuMs: (cpu.user + cpu.system) / 1000 };
}

describe("fuzz: generated documents through solveSystem()", () => {
  it(`answers ${RUNS} generated documents with a value: a result, or errors naming the field; never a throw or a hang`, () => {
    fc.assert(
      fc.property(fuzzCase(), (c: FuzzCase) => {
        counts[c.kind]++;
        const { result, ms } = timedSolve(c.doc);
        if (ms > slowest.ms) slowest = { ms, what: describeCase(c).slice(0, 200) };
        if (ms > HANG_MS) throw new Error(`solveSystem took ${Math.round(ms)} ms (limit ${HANG_MS} ms)`);
        if (result.ok) outcomes.solved++;
        else outcomes.refused++;
        if (c.kind === "valid" && result.ok) outcomes.validSolved++;
        const problems = problemsWith(result, c);
        if (problems.length > 0) throw new Error(problems.slice(0, 5).join("\n"));
      }),
      { numRuns: RUNS, seed: SEED },
    );
    const total = counts.valid + counts["near-valid"] + counts.extreme + counts.broken;
    console.info(`engine fuzz (seed ${SEED}): ${total} documents — ${counts.valid} valid (${outcomes.validSolved} solved), ${counts["near-valid"]} near-valid, ${counts.extreme} extreme, ${counts.broken} broken; ${outcomes.solved} solved, ${outcomes.refused} refused; slowest ${Math.round(slowest.ms)} ms (${slowest.what.split("\n")[0]})`);
    // The count actually run, and a mix that exercises every kind.
    expect(total).toBe(RUNS);
    expect(counts.valid).toBeGreaterThan(RUNS * 0.2);
    expect(counts["near-valid"]).toBeGreaterThan(RUNS * 0.3);
    expect(counts.extreme).toBeGreaterThan(RUNS * 0.05);
    expect(counts.broken).toBeGreaterThan(RUNS * 0.1);
    // The generator's valid documents are mostly solvable (not all collapses): it tests solving too.
    expect(outcomes.validSolved).toBeGreaterThan(counts.valid * 0.5);
  });
});

// ---------------------------------------------------------------------------------------------
// Large networks against the size and work budgets.

const bigSpec = fc.record({
  shape: fc.constantFrom<Shape>("grid", "dense", "chain", "star"),
  size: fc.integer({ min: 200, max: 3600 }),
  watts: fc.constantFrom(0.01, 0.5, 5, 50),
  cases: fc.constantFrom(1, 5, 20),
  cp: fc.boolean(),
});

describe("fuzz: large networks against the work budget", () => {
  it("a large, meshed or collapsing network is solved or refused with TOO_LARGE within the API's budget, on CPU time", () => {
    // CPU time of this process (not wall time), so other processes on the machine do not count.
    // The API budget is about 0.5 s of solving on the quiet project machine; 6 s leaves room for
    // zod, compiling the netlist and building the results of a 1 MB network.
    const CPU_LIMIT_MS = 6000;
    const seen = { ok: 0, tooLarge: 0, other: 0 };
    fc.assert(
      fc.property(bigSpec, (spec) => {
        counts.big++;
        const doc = bigNetwork(spec);
        const { result, cpuMs } = timedSolve(doc, API_WORK_LIMITS);
        if (cpuMs > CPU_LIMIT_MS) throw new Error(`${JSON.stringify(spec)}: ${Math.round(cpuMs)} ms of CPU`);
        if (result.ok) seen.ok++;
        else if (result.errors[0].code === "TOO_LARGE") {
          seen.tooLarge++;
          expect(result.errors[0].message).toMatch(/too large to solve within the engine's work budget .*Split it/);
        } else seen.other++;
        const problems = problemsWith(result, { kind: "broken", doc, applied: [] });
        if (problems.length > 0) throw new Error(`${JSON.stringify(spec)}: ${problems.join("; ")}`);
      }),
      { numRuns: Number(process.env.FUZZ_BIG_RUNS ?? 24), seed: SEED },
    );
    console.info(`large networks: ${seen.ok} solved, ${seen.tooLarge} TOO_LARGE, ${seen.other} other errors`);
    expect(seen.ok).toBeGreaterThan(0);
    expect(seen.tooLarge).toBeGreaterThan(0);
  });

  it("the budgets stop what used to run for seconds to minutes, and let a 3,600-point grid through", () => {
    // A 60 × 60 grid whose constant-power loads collapse: 177 s (20 cases) before the budget.
    const collapsing = bigNetwork({ shape: "grid", size: 3600, watts: 5, cases: 20, cp: true });
    // 1,000 points joined by 8,000 runs at random: 19 s, most of it in ordering and fill.
    const meshed = bigNetwork({ shape: "dense", size: 1000, watts: 1, cases: 1, cp: false });
    for (const [name, doc] of [["collapsing grid", collapsing], ["dense mesh", meshed]] as const) {
      const api = timedSolve(doc, API_WORK_LIMITS);
      expect(api.result.ok, name).toBe(false);
      if (!api.result.ok) expect(api.result.errors[0].code, name).toBe("TOO_LARGE");
      expect(api.cpuMs, name).toBeLessThan(6000);
    }
    // The command line's (default) budget is larger but still a budget.
    const cli = timedSolve(meshed);
    expect(cli.result.ok).toBe(false);
    if (!cli.result.ok) expect(cli.result.errors[0]).toMatchObject({ code: "TOO_LARGE" });
    expect(cli.cpuMs).toBeLessThan(20_000);
    // Within the size limits and the budget: a 3,600-point grid with resistive loads solves.
    const grid = timedSolve(bigNetwork({ shape: "grid", size: 3600, watts: 1, cases: 1, cp: false }), API_WORK_LIMITS);
    expect(grid.result.ok).toBe(true);
    counts.big += 4;
  });

  it("a run shorter than SYSTEM_LIMITS.minRunLength is refused (5e-324 m made its conductors 0 Ω and the merge check quadratic)", () => {
    const doc = bigNetwork({ shape: "chain", size: 3, watts: 1, cases: 1, cp: false });
    for (const length of [5e-324, 1e-9, SYSTEM_LIMITS.minRunLength / 2]) {
      doc.runs[1].length = length;
      const r = solveSystem(doc);
      expect(r.ok).toBe(false);
      if (!r.ok) expect(r.errors[0]).toMatchObject({ code: "ZERO_LENGTH_RUN", path: "runs[1].length" });
    }
    doc.runs[1].length = SYSTEM_LIMITS.minRunLength;
    expect(solveSystem(doc).ok).toBe(true);
    counts.big += 4;
  });
});
