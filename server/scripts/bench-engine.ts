// npm run bench:engine [-- --slow]: a benchmark of the engine, not a test. It prints figures and
// never fails on a missed target (the exit code is 0 unless the script itself breaks).
//
// What it measures, for a few generated networks (deterministic; written as network files to a
// temporary folder that is removed at the end):
//  - in-process solve: solveSystem(doc) on an already-parsed object (no file reading, no JSON),
//    median and min of at least 5 runs after at least 2 warm-up runs (more on small networks, so
//    that they run optimised code), twice: in this process (the engine loaded
//    through tsx, as the server loads it) and in a child node process that loads an esbuild bundle
//    of shared/engine (as the CLI runs it; tsx compiles with keepNames, which costs time wherever
//    the engine creates closures in a loop). Also the Newton iterations of the first case;
//  - where the time goes (in the bundle child): JSON.parse of the file, parseSystem (zod and
//    references), compileSystem, the Newton solve alone (solvePrepared), solveCompiled without and
//    with the available-fault-current pass, JSON.stringify of the result;
//  - peak memory: the maximum resident set size of one whole CLI process
//    (`node server/scripts/engine.mjs solve <file>`), by /usr/bin/time when it is installed, else by
//    the child's own process.resourceUsage().maxRSS after the CLI's main() has returned;
//  - the whole-process wall time of that CLI (median of 3, stdout to /dev/null), and once the time
//    through `npm run --silent solve -- <file>`;
//  - the whole-process wall time of `ngspice -b` on the same network as a SPICE netlist (the
//    engine's own per-conductor resistances; .op, written as an ASCII raw file), and the largest
//    |ΔV| between its point voltages and the engine's. Constant-power loads are B-sources
//    I = P/max(V, 0.5·Vnom), the form tests/shared/engine/ngspice.test.ts uses: with plain I = P/V
//    ngspice starts from 0 V and falls into gmin/source stepping (over 400 s for 2,000 loads on the
//    machine this was written on), so the plain form runs only on the 500-load network, and with
//    --slow on the 2,000- and 5,000-load ones;
//  - autosize(doc, costs) on a 525-run system (25 branches × 20 fixtures + 25 feeders), once in
//    AWG sizes (which have ampacities, so the whole search runs) and once in metric sizes (no
//    ampacities in the reference table, so auto-size only upsizes them).
// The figures are for the machine it runs on (CPU, other load, disk cache); compare them only with
// figures taken on the same machine.
import { spawnSync, type SpawnSyncReturns } from "node:child_process";
import { existsSync, mkdtempSync, readdirSync, readFileSync, rmSync, statSync, writeFileSync } from "node:fs";
import os from "node:os";
import path from "node:path";
import { performance } from "node:perf_hooks";
import { pathToFileURL } from "node:url";
import { autosize } from "../../shared/engine/autosize.js";
import type { SystemInput } from "../../shared/engine/schema.js";
import { compileSystem, parseSystem, solveCompiled, solveSystem, type CompiledSystem, type SolveSuccess } from "../../shared/engine/system.js";
import { mulberry32 as rng } from "../../tests/support/random-systems.js";
import { projectRoot } from "./project-root.js";

const SLOW = process.argv.includes("--slow");
const NGSPICE = "/usr/bin/ngspice";
const NGSPICE_TIMEOUT_S = 120;
const GNU_TIME = "/usr/bin/time";
const CLI = path.join(projectRoot, "server", "scripts", "engine.mjs");
/** The CLI's own esbuild bundle (engine.mjs builds it on its first run). */
const CLI_BUNDLE = path.join(projectRoot, "node_modules", ".cache", "runwright", "engine-cli.mjs");

// ---------------------------------------------------------------------------------------------
// Generated networks

type Point = SystemInput["points"][number];
type Run = SystemInput["runs"][number];
type Load = SystemInput["loads"][number];

interface FixtureOptions {
  branches: number;
  perBranch: number;
  /** Branches per sub-panel: the battery feeds each sub-panel, each sub-panel its distribution points. */
  groupSize: number;
  model: "constantPower" | "constantResistance";
  watts: [number, number];
  fixtureRunM: [number, number];
  branchSize: string;
  /** Battery → sub-panel feeders, fused at the battery. */
  mainFeeder: { size: string; parallel: number; lengthM: [number, number]; fuseA: number };
  subFeeder: { size: string; lengthM: [number, number] };
  /** Where the feeder lands on the daisy chain. */
  feedAt: "middle" | "end";
  seed: number;
}

/** A site: a 48 V battery bank, a feeder backbone (battery → sub-panels → distribution points,
 *  one feeder run per branch) and per branch a daisy chain of short runs, one fixture per point. */
function fixtureSite(name: string, o: FixtureOptions): SystemInput {
  const rand = rng(o.seed);
  const between = ([lo, hi]: [number, number]) => Math.round((lo + (hi - lo) * rand()) * 100) / 100;
  const points: Point[] = [{ id: "bus" }];
  const runs: Run[] = [];
  const loads: Load[] = [];
  const groups = o.branches / o.groupSize;
  if (!Number.isInteger(groups)) throw new Error(`${name}: branches must be a multiple of groupSize`);
  for (let g = 0; g < groups; g++) {
    const sp = `sp${g}`;
    points.push({ id: sp });
    runs.push({
      id: `feed.${sp}`, from: "bus", to: sp, length: between(o.mainFeeder.lengthM), size: o.mainFeeder.size,
      material: "copper", parallel: o.mainFeeder.parallel, kind: "feeder", fuseA: o.mainFeeder.fuseA, fuseInterruptingA: 100_000,
    });
    for (let j = 0; j < o.groupSize; j++) {
      const b = g * o.groupSize + j;
      // The first branch of a group starts at the sub-panel itself; the others at a distribution point.
      let origin = sp;
      if (j > 0) {
        origin = `dp${b}`;
        points.push({ id: origin });
        runs.push({ id: `feed.${origin}`, from: sp, to: origin, length: between(o.subFeeder.lengthM), size: o.subFeeder.size, material: "copper", parallel: 1, kind: "feeder" });
      }
      const n = o.perBranch;
      const entry = o.feedAt === "middle" ? Math.floor(n / 2) : 0;
      for (let k = 0; k < n; k++) {
        const pid = `b${b}.f${k}`;
        points.push({ id: pid });
        const from = k === entry ? origin : k < entry ? `b${b}.f${k + 1}` : `b${b}.f${k - 1}`;
        runs.push({ id: `b${b}.r${k}`, from, to: pid, length: between(o.fixtureRunM), size: o.branchSize, material: "copper", parallel: 1, kind: "branch" });
        const watts = between(o.watts);
        loads.push(o.model === "constantPower"
          ? { id: `b${b}.l${k}`, point: pid, model: "constantPower", watts }
          : { id: `b${b}.l${k}`, point: pid, model: "constantResistance", watts });
      }
    }
  }
  return {
    format: "runwright-system/1", name, units: "metric", nominalVoltage: 48, conductorTemperatureC: 60,
    points,
    sources: [{ id: "bank", type: "battery", point: "bus", voltage: 51.2, internalResistanceOhm: 0.001 }],
    runs, loads,
  };
}

const siteDefaults = {
  groupSize: 10,
  watts: [1, 2] as [number, number],
  fixtureRunM: [1, 1.5] as [number, number],
  branchSize: "10 mm2",
  mainFeeder: { size: "240 mm2", parallel: 1, lengthM: [10, 30] as [number, number], fuseA: 250 },
  subFeeder: { size: "35 mm2", lengthM: [5, 40] as [number, number] },
  feedAt: "middle" as const,
};

/** A meshed grid: n × n points, a run to each right and lower neighbour, a constant-resistance
 *  load at every point and batteries at the four corners and the four edge midpoints. */
function meshGrid(name: string, n: number): SystemInput {
  const rand = rng(7);
  const pid = (r: number, c: number) => `g${r}.${c}`;
  const points: Point[] = [];
  const runs: Run[] = [];
  const loads: Load[] = [];
  for (let r = 0; r < n; r++) {
    for (let c = 0; c < n; c++) {
      points.push({ id: pid(r, c) });
      loads.push({ id: `l${r}.${c}`, point: pid(r, c), model: "constantResistance", watts: Math.round((1 + rand()) * 100) / 100 });
      if (c + 1 < n) runs.push({ id: `h${r}.${c}`, from: pid(r, c), to: pid(r, c + 1), length: 3, size: "16 mm2", material: "copper", parallel: 1 });
      if (r + 1 < n) runs.push({ id: `v${r}.${c}`, from: pid(r, c), to: pid(r + 1, c), length: 3, size: "16 mm2", material: "copper", parallel: 1 });
    }
  }
  const m = Math.floor(n / 2);
  const at: [number, number][] = [[0, 0], [0, n - 1], [n - 1, 0], [n - 1, n - 1], [0, m], [m, 0], [n - 1, m], [m, n - 1]];
  return {
    format: "runwright-system/1", name, units: "metric", nominalVoltage: 48, conductorTemperatureC: 60,
    points,
    sources: at.map(([r, c], i) => ({ id: `bank${i}`, type: "battery" as const, point: pid(r, c), voltage: 51.2, internalResistanceOhm: 0.003 })),
    runs, loads,
  };
}

/** AWG sizes with their area in kcmil (NFPA 70 Chapter 9 Table 8), for the made-up prices. */
const AWG_KCMIL: [string, number][] = [
  ["14 AWG", 4.11], ["12 AWG", 6.53], ["10 AWG", 10.38], ["8 AWG", 16.51], ["6 AWG", 26.24], ["4 AWG", 41.74], ["3 AWG", 52.62],
  ["2 AWG", 66.36], ["1 AWG", 83.69], ["1/0 AWG", 105.6], ["2/0 AWG", 133.1], ["3/0 AWG", 167.8], ["4/0 AWG", 211.6],
];
const MM2_PER_KCMIL = 0.506707;

/** A costs file: per metre of one copper conductor, made-up but monotone prices (0.60 + 0.22/mm²). */
function costsFile(kind: "metric" | "awg") {
  const sizes: [string, number][] = kind === "metric"
    ? [1.5, 2.5, 4, 6, 10, 16, 25, 35, 50, 70, 95, 120, 150, 185, 240].map((a) => [`${a} mm2`, a])
    : AWG_KCMIL.map(([size, kcmil]) => [size, kcmil * MM2_PER_KCMIL]);
  return {
    format: "runwright-costs/1",
    per: "m",
    items: sizes.map(([size, mm2]) => ({ material: "copper", size, cost: Math.round((0.6 + 0.22 * mm2) * 100) / 100 })),
  };
}

interface Network {
  name: string;
  doc: SystemInput;
  /** Also run ngspice with plain I = P/V constant-power sources. */
  plainSpice: boolean;
  costs?: ReturnType<typeof costsFile>;
}

/** The benchmark networks (exported for profiling one phase by hand). */
export function networks(): Network[] {
  const cp = (branches: number, groupSize: number, seed: number) =>
    fixtureSite(`fixtures-cp ${branches}×200`, { ...siteDefaults, groupSize, branches, perBranch: 200, model: "constantPower", seed });
  const list: Network[] = [
    { name: "fixtures-cp", doc: cp(100, 10, 1), plainSpice: false },
    { name: "fixtures-cr", doc: fixtureSite("fixtures-cr 100×200", { ...siteDefaults, branches: 100, perBranch: 200, model: "constantResistance", seed: 1 }), plainSpice: false },
    { name: "fixtures-cp-2000", doc: cp(10, 10, 2), plainSpice: SLOW },
  ];
  if (SLOW) list.push({ name: "fixtures-cp-5000", doc: cp(25, 5, 3), plainSpice: true });
  list.push({ name: "mesh", doc: meshGrid("mesh 100×100", 100), plainSpice: false });
  // Auto-size: 25 branches × 20 fixtures, fed at the end of each chain, so that about a fifth of
  // the loads are over their limit as designed. AWG sizes have ampacities, so auto-size runs its
  // whole search (floor, upsizing, downsizing); metric sizes have none in the reference table, so
  // on the metric twin it only upsizes (it never goes below the designed size there).
  const autosizeSite = (branchSize: string, subSize: string, mainSize: string) => fixtureSite(`autosize 25×20 (${branchSize})`, {
    branches: 25, perBranch: 20, groupSize: 5, model: "constantPower",
    watts: [4, 9], fixtureRunM: [1.5, 2.5], branchSize,
    mainFeeder: { size: mainSize, parallel: 1, lengthM: [10, 30], fuseA: 40 },
    subFeeder: { size: subSize, lengthM: [5, 25] },
    feedAt: "end", seed: 4,
  });
  list.push({ name: "autosize-500", doc: autosizeSite("14 AWG", "10 AWG", "6 AWG"), plainSpice: true, costs: costsFile("awg") });
  list.push({ name: "autosize-500-metric", doc: autosizeSite("2.5 mm2", "6 mm2", "16 mm2"), plainSpice: false, costs: costsFile("metric") });
  return list;
}

// ---------------------------------------------------------------------------------------------
// Measuring

const median = (xs: number[]) => {
  const s = [...xs].sort((a, b) => a - b);
  const h = s.length >> 1;
  return s.length % 2 ? s[h] : (s[h - 1] + s[h]) / 2;
};

interface Timing { median: number; min: number }

/** Times fn: at least `warmup` untimed runs (more, up to 50, until 1 s has gone by, so that small
 *  networks get optimised code too), then at least `runs` timed ones (more, up to 25, until 0.5 s
 *  has gone by). setup() runs untimed before each. */
function timeIt<S, T>(setup: () => S, fn: (s: S) => T, runs = 5, warmup = 2): Timing & { last: T; runs: number } {
  let last!: T;
  let spent = 0;
  for (let i = 0; i < 50 && (i < warmup || spent < 1000); i++) {
    const s = setup();
    const t0 = performance.now();
    last = fn(s);
    spent += performance.now() - t0;
  }
  const ms: number[] = [];
  for (let i = 0; i < 25 && (i < runs || ms.reduce((a, b) => a + b, 0) < 500); i++) {
    const s = setup();
    const t0 = performance.now();
    last = fn(s);
    ms.push(performance.now() - t0);
  }
  return { median: median(ms), min: Math.min(...ms), last, runs: ms.length };
}

interface ChildRun { ms: number; result: SpawnSyncReturns<Buffer> }

function runChild(cmd: string, args: string[], opts: { stdout?: "ignore" | "pipe"; timeoutS?: number } = {}): ChildRun {
  const t0 = performance.now();
  const result = spawnSync(cmd, args, {
    cwd: projectRoot,
    stdio: ["ignore", opts.stdout ?? "ignore", "pipe"],
    timeout: opts.timeoutS ? opts.timeoutS * 1000 : undefined,
    killSignal: "SIGKILL",
    maxBuffer: 256 * 1024 * 1024,
  });
  return { ms: performance.now() - t0, result };
}

function checkExit(what: string, r: SpawnSyncReturns<Buffer>) {
  if (r.status !== 0) throw new Error(`${what} exited with ${r.status ?? r.signal}: ${r.stderr?.toString().slice(0, 500)}`);
}

const haveGnuTime = existsSync(GNU_TIME);

/** Newest modification time of the CLI's sources (the test engine.mjs uses to rebuild). */
function newestEngineSource(): number {
  let newest = statSync(path.join(projectRoot, "server", "scripts", "engine-cli.ts")).mtimeMs;
  const dir = path.join(projectRoot, "shared", "engine");
  for (const name of readdirSync(dir)) newest = Math.max(newest, statSync(path.join(dir, name)).mtimeMs);
  return newest;
}

/** True when engine.mjs would rebuild its bundle on the next run. */
function cliBundleStale(): boolean {
  return !existsSync(CLI_BUNDLE) || statSync(CLI_BUNDLE).mtimeMs < newestEngineSource();
}

/** Runs the CLI once, untimed, when its bundle needs a rebuild (someone edited the engine). */
function warmCli(smallFile: string): boolean {
  if (!cliBundleStale()) return false;
  checkExit("CLI warm-up", runChild(process.execPath, [CLI, "solve", smallFile]).result);
  return true;
}

/** Peak RSS (MB) of one whole CLI process solving the file. */
function cliPeakRssMb(file: string, dir: string): { mb: number; how: string } {
  if (haveGnuTime) {
    const out = path.join(dir, "time.txt");
    const r = runChild(GNU_TIME, ["-f", "%M", "-o", out, process.execPath, CLI, "solve", file]);
    checkExit("CLI under /usr/bin/time", r.result);
    return { mb: Number(readFileSync(out, "utf8").trim().split("\n").pop()) / 1024, how: "/usr/bin/time (%M, max RSS) of the whole `node server/scripts/engine.mjs solve <file>` process" };
  }
  // No GNU time: the child reports its own peak after the CLI's main() has written the result.
  const script = `const { main } = await import(${JSON.stringify(pathToFileURL(CLI_BUNDLE).href)});
const code = await main(["solve", ${JSON.stringify(file)}]);
process.stderr.write("MAXRSS " + process.resourceUsage().maxRSS + "\\n"); process.exitCode = code;`;
  const r = runChild(process.execPath, ["--input-type=module", "-e", script]);
  checkExit("CLI bundle child", r.result);
  const kb = Number(/MAXRSS (\d+)/.exec(r.result.stderr.toString())?.[1]);
  return { mb: kb / 1024, how: "process.resourceUsage().maxRSS of a node child that runs the CLI bundle's main([\"solve\", file]) (/usr/bin/time is not installed)" };
}

// The child that times the engine as an esbuild bundle (no keepNames), like the CLI runs it. It
// prints one line of JSON. Plain JavaScript, written to the temporary folder next to the bundle.
const BUNDLE_CHILD = `
import { readFileSync } from "node:fs";
import { performance } from "node:perf_hooks";
import { autosize, compileSystem, parseSystem, solveCompiled, solvePrepared, solveSystem } from "./engine.mjs";
const [file, costsFile] = process.argv.slice(2);
const text = readFileSync(file, "utf8");
const median = (xs) => { const s = [...xs].sort((a, b) => a - b); const h = s.length >> 1; return s.length % 2 ? s[h] : (s[h - 1] + s[h]) / 2; };
// Same protocol as timeIt in bench-engine.ts.
function timeIt(setup, fn, runs = 5, warmup = 2) {
  let last;
  let spent = 0;
  for (let i = 0; i < 50 && (i < warmup || spent < 1000); i++) { const s = setup(); const t0 = performance.now(); last = fn(s); spent += performance.now() - t0; }
  const ms = [];
  for (let i = 0; i < 25 && (i < runs || ms.reduce((a, b) => a + b, 0) < 500); i++) { const s = setup(); const t0 = performance.now(); last = fn(s); ms.push(performance.now() - t0); }
  return { median: median(ms), min: Math.min(...ms), last };
}
const out = {};
const solve = timeIt(() => JSON.parse(text), (doc) => solveSystem(doc));
if (!solve.last.ok) throw new Error(solve.last.errors[0].message);
out.solve = { median: solve.median, min: solve.min };
// Phases: at least 3 runs after at least 1 warm-up each (the mesh takes seconds per solve).
const p = (setup, fn) => timeIt(setup, fn, 3, 1);
const freshSystem = () => { const r = parseSystem(JSON.parse(text)); if (!r.ok) throw new Error("parse"); return r.system; };
const compiled = p(freshSystem, (s) => compileSystem(s));
const c = compiled.last;
if ("ok" in c) throw new Error("compile");
// The re-solve of a compiled system is the editor's figure: 15 runs after 3 warm-ups where a run
// is short (garbage collection makes 3-run medians of it swing by ±50 %).
const many = solve.median < 500 ? (setup, fn) => timeIt(setup, fn, 15, 3) : p;
const noFault = many(() => null, () => solveCompiled(c, { skipFaultCurrent: true }));
const full = many(() => null, () => solveCompiled(c));
out.phases = {
  "JSON.parse": p(() => null, () => JSON.parse(text)).median,
  parseSystem: p(() => JSON.parse(text), (doc) => parseSystem(doc)).median,
  compileSystem: compiled.median,
  "Newton (solvePrepared)": p(() => null, () => solvePrepared(c.prepared)).median,
  "solveCompiled w/o fault": noFault.median,
  "fault current": full.median - noFault.median,
  "solveCompiled": full.median,
  "JSON.stringify": p(() => null, () => JSON.stringify(solve.last)).median,
};
if (costsFile) {
  const costs = JSON.parse(readFileSync(costsFile, "utf8"));
  const a = timeIt(() => JSON.parse(text), (doc) => autosize(doc, costs), 5, 1);
  if (!a.last.ok) throw new Error(a.last.errors[0].message);
  out.autosize = { median: a.median, min: a.min, solves: a.last.stats.solves };
}
console.log(JSON.stringify(out));
`;

interface BundleFigures { solve: Timing; phases: Record<string, number>; autosize?: Timing & { solves: number } }

async function buildEngineBundle(dir: string): Promise<string> {
  const { build } = await import("esbuild");
  // zod is bundled in (the temporary folder has no node_modules to resolve it from at run time).
  await build({
    entryPoints: [path.join(projectRoot, "shared", "engine", "index.ts")],
    outfile: path.join(dir, "engine.mjs"),
    bundle: true, platform: "node", format: "esm", target: "node20", logLevel: "error",
  });
  const child = path.join(dir, "bundle-child.mjs");
  writeFileSync(child, BUNDLE_CHILD);
  return child;
}

function runBundleChild(child: string, file: string, costs?: string): BundleFigures {
  const r = runChild(process.execPath, [child, file, ...(costs ? [costs] : [])], { stdout: "pipe" });
  checkExit(`bundle child on ${path.basename(file)}`, r.result);
  return JSON.parse(r.result.stdout.toString()) as BundleFigures;
}

// ---------------------------------------------------------------------------------------------
// SPICE

type PowerForm = "floor" | "plain";

/** The compiled netlist as SPICE: node k is SPICE node k (0 is ground). */
function toSpice(title: string, c: CompiledSystem, rawFile: string, form: PowerForm): string {
  const num = (v: number) => v.toExponential(12);
  const floorV = num(0.5 * c.system.nominalVoltage);
  const lines = [`* ${title} (generated by server/scripts/bench-engine.ts)`];
  c.netlist.elements.forEach((el, i) => {
    switch (el.kind) {
      case "resistor":
        lines.push(`R${i} ${el.a} ${el.b} ${num(el.ohms)}`);
        break;
      case "voltageSource": // EMF between an internal node and −, internal resistance from there to +
        if ((el.seriesOhms ?? 0) > 0) lines.push(`V${i} s${i} ${el.minus} DC ${num(el.volts)}`, `RS${i} s${i} ${el.plus} ${num(el.seriesOhms!)}`);
        else lines.push(`V${i} ${el.plus} ${el.minus} DC ${num(el.volts)}`);
        break;
      case "currentSource": // amps out of `from`, through the source, into `to`
        lines.push(`I${i} ${el.from} ${el.to} DC ${num(el.amps)}`);
        break;
      case "constantCurrent": // amps into + and out of −
        lines.push(`I${i} ${el.plus} ${el.minus} DC ${num(el.amps)}`);
        break;
      case "constantPower": {
        const v = `V(${el.plus},${el.minus})`;
        lines.push(`B${i} ${el.plus} ${el.minus} I=${num(el.watts)}/${form === "plain" ? v : `max(${v},${floorV})`}`);
        break;
      }
    }
  });
  lines.push(".control", "set filetype=ascii", "op", `write ${rawFile}`, "quit", ".endc", ".end", "");
  return lines.join("\n");
}

/** Node voltages from an ASCII raw file: "v(12)" → volts. */
function readRaw(text: string): Map<string, number> {
  const lines = text.split("\n");
  const names: string[] = [];
  let i = lines.findIndex((l) => l.startsWith("Variables:")) + 1;
  for (; i < lines.length && !lines[i].startsWith("Values:"); i++) {
    const parts = lines[i].trim().split(/\s+/);
    names[Number(parts[0])] = parts[1].toLowerCase();
  }
  const values = lines.slice(i + 1).join(" ").trim().split(/\s+/).slice(1).map(Number);
  return new Map(names.map((n, k) => [n, values[k]]));
}

interface SpiceFigures { seconds: number[]; note: string; maxDeltaV?: number }

function runNgspice(net: Network, form: PowerForm, dir: string, engine: SolveSuccess): SpiceFigures {
  const parsed = parseSystem(structuredClone(net.doc));
  if (!parsed.ok) throw new Error(`${net.name}: ${parsed.errors[0].message}`);
  const c = compileSystem(parsed.system);
  if ("ok" in c) throw new Error(`${net.name}: ${c.errors[0].message}`);
  const raw = path.join(dir, `${net.name}.${form}.raw`);
  const cir = path.join(dir, `${net.name}.${form}.cir`);
  writeFileSync(cir, toSpice(net.name, c, raw, form));
  const seconds: number[] = [];
  for (let k = 0; k < 3; k++) {
    rmSync(raw, { force: true });
    const r = runChild(NGSPICE, ["-b", cir], { stdout: "pipe", timeoutS: NGSPICE_TIMEOUT_S });
    if ((r.result.error as NodeJS.ErrnoException | undefined)?.code === "ETIMEDOUT" || r.result.signal === "SIGKILL") {
      return { seconds, note: `did not finish in ${NGSPICE_TIMEOUT_S} s` };
    }
    if (!existsSync(raw)) {
      const text = `${r.result.stdout?.toString() ?? ""}${r.result.stderr?.toString() ?? ""}`;
      const err = text.split("\n").find((l) => /error|no convergence|abort/i.test(l)) ?? `exit ${r.result.status}`;
      return { seconds, note: `failed: ${err.trim().slice(0, 100)}` };
    }
    seconds.push(r.ms / 1000);
    if (r.ms > 10_000) break; // one run is enough for a slow one
  }
  // Compare the point voltages (V+ − V−) with the engine's.
  try {
    const v = readRaw(readFileSync(raw, "utf8"));
    const node = (k: number) => {
      if (k === 0) return 0;
      const x = v.get(`v(${k})`);
      if (x === undefined || !Number.isFinite(x)) throw new Error(`no voltage for node ${k}`);
      return x;
    };
    let maxDeltaV = 0;
    engine.cases[0].points.forEach((p, i) => {
      maxDeltaV = Math.max(maxDeltaV, Math.abs(node(c.plusNode[i]) - node(c.minusNode[i]) - p.voltage));
    });
    return { seconds, note: "", maxDeltaV };
  } catch (error) {
    return { seconds, note: `raw file not compared (${(error as Error).message})` };
  }
}

// ---------------------------------------------------------------------------------------------
// Output helpers

function table(head: string[], rows: string[][], leftColumns = 1): string {
  const w = head.map((h, i) => Math.max(h.length, ...rows.map((r) => r[i].length)));
  const fmt = (r: string[]) => r.map((cell, i) => (i < leftColumns ? cell.padEnd(w[i]) : cell.padStart(w[i]))).join("  ").trimEnd();
  return [fmt(head), w.map((n) => "-".repeat(n)).join("  "), ...rows.map(fmt)].join("\n");
}
const f1 = (x: number) => x.toFixed(1);
const f2 = (x: number) => x.toFixed(2);
const f3 = (x: number) => x.toFixed(3);
const timing = (t: Timing) => `${f1(t.median)} (${f1(t.min)})`;
const spiceMedian = (s: SpiceFigures | null) => (s && s.seconds.length ? median(s.seconds) : null);

// ---------------------------------------------------------------------------------------------

interface Row {
  net: Network;
  points: number;
  loads: number;
  tsx: Timing;
  bundle: BundleFigures;
  newton: number;
  rssMb: number;
  cliS: number;
  spice: SpiceFigures | null;
  plain: SpiceFigures | null;
  drops: { over: number; near: number; maxDrop: number };
}

async function main() {
  const dir = mkdtempSync(path.join(os.tmpdir(), "runwright-bench-"));
  // Ctrl-C reaches the running child too; once it has gone, remove the folder before leaving.
  process.once("SIGINT", () => {
    rmSync(dir, { recursive: true, force: true });
    process.exit(130);
  });
  try {
    await run(dir);
  } finally {
    rmSync(dir, { recursive: true, force: true });
  }
}

async function run(dir: string) {
  const haveNgspice = existsSync(NGSPICE);
  const cpu = os.cpus();
  console.log(`Runwright engine benchmark${SLOW ? " (--slow)" : ""}: node ${process.version}, ${cpu.length} × ${cpu[0]?.model ?? "unknown CPU"}, ${os.platform()} ${os.release()}`);
  console.log(haveNgspice ? `ngspice: ${NGSPICE} (${spawnSync(NGSPICE, ["-v"]).stdout.toString().match(/ngspice-\d+/)?.[0] ?? "version unknown"})` : `ngspice: not found at ${NGSPICE}; its columns stay empty`);
  const git = (args: string[]) => spawnSync("git", args, { cwd: projectRoot, encoding: "utf8" }).stdout?.trim() ?? "";
  const edited = git(["status", "--porcelain", "--", "shared/engine", "server/scripts/engine-cli.ts"]);
  const engineState = () => `engine at ${git(["rev-parse", "--short", "HEAD"]) || "unknown commit"}${edited ? ` with uncommitted changes (${edited.split("\n").length} files)` : ""}`;
  console.log(`${engineState()}. The figures are for this machine only.\n`);
  const engineAtStart = newestEngineSource();

  const nets = networks();
  const files = new Map<string, string>();
  for (const net of nets) {
    const file = path.join(dir, `${net.name}.json`);
    writeFileSync(file, JSON.stringify(net.doc));
    files.set(net.name, file);
  }
  const costFiles = new Map<string, string>();
  for (const net of nets) {
    if (!net.costs) continue;
    const file = path.join(dir, `${net.name}.costs.json`);
    writeFileSync(file, JSON.stringify(net.costs));
    costFiles.set(net.name, file);
  }
  const child = await buildEngineBundle(dir);
  // The first CLI run after an engine change rebuilds the CLI's esbuild bundle: do it untimed
  // (and again before each timed series if the engine is edited while this runs).
  const small = files.get("autosize-500")!;
  checkExit("CLI warm-up", runChild(process.execPath, [CLI, "solve", small]).result);
  let rebuilt = 0;
  // Baseline: the CLI with nothing to do (node start-up, loading the bundle and zod, usage message).
  const idle = median([0, 1, 2].map(() => runChild(process.execPath, [CLI]).ms / 1000));

  const rows: Row[] = [];
  let rssHow = "";
  for (const net of nets) {
    const file = files.get(net.name)!;
    const text = readFileSync(file, "utf8");
    process.stderr.write(`${net.name}: in-process…`);
    const tsx = timeIt(() => JSON.parse(text) as unknown, (doc) => solveSystem(doc));
    if (!tsx.last.ok) throw new Error(`${net.name}: ${tsx.last.errors.map((e) => e.message).join("; ")}`);
    const result = tsx.last;
    process.stderr.write(" bundle…");
    const bundle = runBundleChild(child, file, costFiles.get(net.name));

    process.stderr.write(" CLI…");
    if (warmCli(small)) rebuilt++;
    const cli = [0, 1, 2].map(() => {
      const r = runChild(process.execPath, [CLI, "solve", file]);
      checkExit(`${net.name} CLI`, r.result);
      return r.ms / 1000;
    });
    const rss = cliPeakRssMb(file, dir);
    rssHow = rss.how;

    let spice: SpiceFigures | null = null;
    let plain: SpiceFigures | null = null;
    if (!haveNgspice) spice = { seconds: [], note: "ngspice not installed" };
    else {
      process.stderr.write(" ngspice…");
      spice = runNgspice(net, "floor", dir, result);
      if (net.plainSpice) plain = runNgspice(net, "plain", dir, result);
    }
    process.stderr.write(" done\n");

    const worst = result.loads;
    rows.push({
      net, points: net.doc.points.length, loads: net.doc.loads.length,
      tsx: { median: tsx.median, min: tsx.min }, bundle,
      newton: result.cases[0].newtonIterations,
      rssMb: rss.mb, cliS: median(cli), spice, plain,
      drops: {
        over: worst.filter((w) => w.status === "over").length,
        near: worst.filter((w) => w.status === "near").length,
        maxDrop: Math.max(...worst.map((w) => w.dropPercent)),
      },
    });
  }
  if (warmCli(small)) rebuilt++;
  const npmFile = files.get("fixtures-cp")!;
  const npmRun = runChild("npm", ["run", "--silent", "solve", "--", npmFile]);
  checkExit("npm run solve", npmRun.result);

  // Auto-size in this process (tsx) and through the CLI; the bundle child timed it above.
  const autosizes = rows.filter((r) => r.net.costs).map((r) => {
    const net = r.net;
    process.stderr.write(`${net.name}: autosize in-process…`);
    const tsx = timeIt(() => JSON.parse(JSON.stringify(net.doc)) as unknown, (doc) => autosize(doc, net.costs), 3, 1);
    if (!tsx.last.ok) throw new Error(`autosize: ${tsx.last.errors.map((e) => e.message).join("; ")}`);
    process.stderr.write(" CLI…\n");
    if (warmCli(small)) rebuilt++;
    const cli = runChild(process.execPath, [CLI, "autosize", files.get(net.name)!, costFiles.get(net.name)!]);
    checkExit("CLI autosize", cli.result);
    return { row: r, tsx, result: tsx.last, bundle: r.bundle.autosize!, cliS: cli.ms / 1000 };
  });

  // The table.
  console.log(table(
    ["network", "points", "loads", "solve ms tsx: median (min)", "solve ms bundle: median (min)", "Newton it.", "peak RSS MB", "CLI s", "ngspice s", "CLI/ngspice", "ngspice I=P/V s"],
    rows.map((r) => {
      const s = spiceMedian(r.spice);
      const p = spiceMedian(r.plain);
      return [
        r.net.name, String(r.points), String(r.loads), timing(r.tsx), timing(r.bundle.solve), String(r.newton), f1(r.rssMb), f3(r.cliS),
        s !== null ? f3(s) : "—", s !== null ? f3(r.cliS / s) : "—",
        p !== null ? f3(p) : r.plain ? (r.plain.note.startsWith("did not") ? `> ${NGSPICE_TIMEOUT_S}` : "failed") : "not run",
      ];
    }),
  ));
  console.log(`
solve ms: solveSystem(doc) on a parsed object, ≥ 5 runs (until 0.5 s) after ≥ 2 warm-ups (until 1 s); "tsx" in this process (engine loaded through tsx,
  as the server loads it), "bundle" in a child node process on an esbuild bundle of shared/engine (as the CLI runs it).
peak RSS: ${rssHow}.
CLI s: node ${path.relative(projectRoot, CLI)} solve <file>, wall time, median of 3, stdout to /dev/null. The CLI with nothing to
  do (usage message: node start-up + loading the bundle and zod) takes ${f3(idle)} s; npm run --silent solve -- fixtures-cp.json
  took ${f3(npmRun.ms / 1000)} s once (npm's own start-up included).
ngspice s: ngspice -b, .control op + write (ASCII raw file), whole process, median of 3 (1 when a run takes over 10 s), timeout
  ${NGSPICE_TIMEOUT_S} s, default tolerances; constant-power loads as I=P/max(V, 0.5·Vnom). "ngspice I=P/V s": the same with plain
  I=P/V (only where marked; on the larger networks only with --slow).`);

  console.log("\nngspice against the engine (max |ΔV| over points, V+ − V−, first case):");
  const nameWidth = Math.max(...rows.map((r) => r.net.name.length));
  for (const r of rows) {
    const show = (label: string, s: SpiceFigures | null) => {
      if (!s) return;
      const agree = s.maxDeltaV !== undefined ? `max |ΔV| ${s.maxDeltaV.toExponential(2)} V` : "";
      console.log(`  ${r.net.name.padEnd(nameWidth)}  ${label.padEnd(18)}   ${[agree, s.note].filter(Boolean).join("; ")}`);
    };
    show("I=P/max(V, Vnom/2)", r.spice);
    show("I=P/V", r.plain);
  }

  console.log("\nWhere the in-process time goes (bundle child; ms, median of ≥ 3 after ≥ 1 warm-up each; solveSystem ≈ parseSystem +");
  console.log("compileSystem + solveCompiled w/o fault + fault current; the Newton solve is part of solveCompiled), and the drops:");
  const phaseNames = Object.keys(rows[0].bundle.phases);
  console.log(table(["network", ...phaseNames, "loads over / near / max drop %"], rows.map((r) => [
    r.net.name, ...phaseNames.map((k) => f1(r.bundle.phases[k])), `${r.drops.over} / ${r.drops.near} / ${f2(r.drops.maxDrop)}`,
  ])));

  for (const { row: r, tsx, result: a, bundle, cliS } of autosizes) {
    const doc = r.net.doc;
    const over = (pick: (l: (typeof a.loads)[number]) => string | undefined) => a.loads.filter((l) => pick(l) === "over").length;
    console.log(`\n${r.net.name} (${doc.runs.length} runs: ${doc.loads.length} branch runs + ${doc.runs.length - doc.loads.length} feeders, branches of ${doc.runs[1].size}; ${r.net.costs!.items.length} priced sizes):`);
    console.log(`  autosize(doc, costs): tsx median ${f1(tsx.median)} ms (min ${f1(tsx.min)}, ${tsx.runs} runs after ≥ 1 warm-up); bundle median ${f1(bundle.median)} ms (min ${f1(bundle.min)}, ≥ 5 runs after ≥ 1)`);
    console.log(`  ${a.stats.solves} solves, method ${a.stats.method}, passes ${a.passes}; loads over limit before ${over((l) => l.before?.status)}, after ${over((l) => l.after.status)}; ${a.runs.filter((x) => x.changed).length} runs changed; cost ${a.costBefore?.toFixed(2) ?? "—"} → ${a.costAfter.toFixed(2)}`);
    console.log(`  CLI whole process (node ${path.relative(projectRoot, CLI)} autosize): ${f3(cliS)} s once`);
  }

  // Targets.
  const row = (name: string) => rows.find((r) => r.net.name === name)!;
  const ratioTarget = (name: string): [string, boolean | null] => {
    const r = row(name);
    const s = spiceMedian(r.spice);
    return s === null ? [r.spice?.note ?? "—", null] : [`CLI ${f3(r.cliS)} s / ngspice ${f3(s)} s = ${f3(r.cliS / s)}`, r.cliS / s <= 0.5];
  };
  const cp = row("fixtures-cp");
  const plain2000 = row("fixtures-cp-2000").plain;
  const targets: [string, string, boolean | null][] = [
    ["20,000 CP fixtures in-process ≤ 50 ms (warm), tsx", `${f1(cp.tsx.median)} ms`, cp.tsx.median <= 50],
    ["20,000 CP fixtures in-process ≤ 50 ms (warm), bundle", `${f1(cp.bundle.solve.median)} ms`, cp.bundle.solve.median <= 50],
    ["  re-solve of the compiled system (solveCompiled, with fault current), bundle", `${f1(cp.bundle.phases["solveCompiled"])} ms`, cp.bundle.phases["solveCompiled"] <= 50],
    ["  (the Newton solve alone, solvePrepared)", `${f1(cp.bundle.phases["Newton (solvePrepared)"])} ms`, cp.bundle.phases["Newton (solvePrepared)"] <= 50],
    ["20,000 CP fixtures CLI ≤ 1 s whole process", `${f3(cp.cliS)} s`, cp.cliS <= 1],
    ["CLI ≤ ½ ngspice, 20,000 CR fixtures", ...ratioTarget("fixtures-cr")],
    ["CLI ≤ ½ ngspice, 2,000 CP fixtures (I=P/max(V, Vnom/2))", ...ratioTarget("fixtures-cp-2000")],
  ];
  if (plain2000) {
    const p = spiceMedian(plain2000);
    const c = row("fixtures-cp-2000").cliS;
    targets.push(["CLI ≤ ½ ngspice, 2,000 CP fixtures (plain I=P/V)", p === null ? plain2000.note : `${f3(c / p)}`, p === null ? (plain2000.note.startsWith("did not") ? true : null) : c / p <= 0.5]);
  }
  targets.push(
    ...autosizes.flatMap(({ row: r, tsx, bundle }): [string, string, boolean][] => [
      [`autosize of the 500-run system ≤ 2 s, tsx (${r.net.name})`, `${f1(tsx.median)} ms`, tsx.median <= 2000],
      [`autosize of the 500-run system ≤ 2 s, bundle (${r.net.name})`, `${f1(bundle.median)} ms`, bundle.median <= 2000],
    ]),
    ["peak memory ≤ 300 MB at 20,000 fixtures (CP)", `${f1(cp.rssMb)} MB`, cp.rssMb <= 300],
    ["peak memory ≤ 300 MB at 20,000 fixtures (CR)", `${f1(row("fixtures-cr").rssMb)} MB`, row("fixtures-cr").rssMb <= 300],
  );
  if (rebuilt > 0 || newestEngineSource() !== engineAtStart) {
    console.log(`\nWARNING: shared/engine or engine-cli.ts changed while this ran (the CLI bundle was rebuilt ${rebuilt} time(s) between\n  series); the figures mix engine versions. Run it again on a quiet checkout.`);
  }
  const verdict = (ok: boolean | null) => (ok === null ? "not measured" : ok ? "met" : "MISSED");
  console.log(`\nTargets:\n${table(["target", "measured", "verdict"], targets.map(([t, m, ok]) => [t, m, verdict(ok)]), 1)}`);
}

// Run only as a script, so that networks() can be imported.
if (process.argv[1] && import.meta.url === pathToFileURL(path.resolve(process.argv[1])).href) await main();
