// Auto-size: the cheapest run sizes (from the priced sizes) for which every load passes every
// case and every run passes its ampacity and fuse rules.
//
// The algorithm, in four steps; every candidate layout is checked by a full solve of every case,
// so the estimates below only steer the search and never decide that a layout passes:
//  1. Floor: each run starts at the smallest priced size whose ampacity carries the run's largest
//     current and its fuse (fuse ≤ ampacity, NFPA 70 240.4(D) for small conductors); repeated
//     until the currents stop changing (constant-power loads draw more as voltage falls).
//  2. Upsize: while some load fails, estimate for every run how much one step up would cut the
//     drop of each failing load whose path to its source goes through the run (the run's current
//     × the fall in resistance of both conductors), capped at what that load still needs, and
//     divide by the step's extra cost. Take the best run, lower the predicted needs, and keep
//     picking until the predictions say every load passes; then solve again and repeat.
//  3. Downsize: try each run one step down, the largest saving first (skipped when the estimate
//     already says a load downstream would fail); keep the step when a full solve still passes.
//  4. Guard: the layouts "every run k steps up from the floor" (k = 0, 1, 2, …, the first that
//     passes) are solved too, and their cheapest is kept if it beats steps 2–3, so the proposal
//     is never worse than uniformly upsizing everything.
import { z } from "zod";
import { ampacity, conductorResistance, METRES_PER_FOOT, normalizeSize, sizeInfo, smallConductorFuseLimit, type Material } from "./conductors.js";
import { type CompiledSystem, compileSystem, parseSystem, schemaErrors, solveCompiled, type EngineError, type SolveSuccess } from "./system.js";
import { onlyOnArrays, onlyOnStrings, type SystemInput } from "./schema.js";

export const costsSchema = z.strictObject({
  format: z.literal("runwright-costs/1"),
  currency: z.string().regex(/^[A-Z]{3}$/, "must be a three-letter currency code").optional(),
  /** The cost is per metre ("m") or per foot ("ft") of one conductor. */
  per: z.enum(["m", "ft"]),
  items: z.array(z.strictObject({
    material: z.enum(["copper", "aluminum"]).default("copper"),
    size: z.string().min(1, onlyOnStrings("must not be empty")).max(40, onlyOnStrings("must be at most 40 characters")),
    cost: z.number().refine((v) => Number.isFinite(v) && v >= 0, "must be 0 or more"),
  })).min(1, onlyOnArrays("give at least one priced size")),
});
export type Costs = z.output<typeof costsSchema>;

export interface AutosizeRun { id: string; before: string; after: string; costBefore: number | null; costAfter: number; changed: boolean }
export interface AutosizeLoad {
  id: string;
  before: { dropPercent: number; status: string; worstCase: string } | null;
  after: { dropPercent: number; status: string; worstCase: string };
}
export interface AutosizeSuccess {
  ok: true;
  /** True when every load passes every case with the proposal. */
  passes: boolean;
  runs: AutosizeRun[];
  loads: AutosizeLoad[];
  costBefore: number | null;
  costAfter: number;
  costDifference: number | null;
  currency?: string;
  /** The network file with the proposed sizes (apply it as a normal save). */
  system: SystemInput;
  stats: { solves: number; milliseconds: number; method: "greedy" | "uniform" };
  messages: string[];
}
export type AutosizeResult = AutosizeSuccess | { ok: false; errors: EngineError[] };

interface Ctx {
  c: CompiledSystem;
  allowed: string[][]; // per run, priced sizes of its material, ascending
  costPerM: Map<string, number>; // `${material}|${size}` → cost per metre of one conductor
  lengthConductorM: number[]; // per run: metres of conductor (2 × length × parallel)
  locked: boolean[];
  /** Cross-section (mm²) of each run's size as designed. */
  chosenArea: number[];
  solves: number;
}

const key = (material: Material, size: string) => `${material}|${size}`;

function runCost(ctx: Ctx, i: number, size: string): number {
  const run = ctx.c.system.runs[i];
  return (ctx.costPerM.get(key(run.material, size)) ?? NaN) * ctx.lengthConductorM[i];
}

function setSizes(ctx: Ctx, sizes: string[]) {
  sizes.forEach((s, i) => {
    if (ctx.locked[i]) return;
    ctx.c.runData[i].plusSize = s;
    ctx.c.runData[i].minusSize = s;
  });
}

function solve(ctx: Ctx, sizes: string[]) {
  setSizes(ctx, sizes);
  ctx.solves++;
  return solveCompiled(ctx.c, { skipFaultCurrent: true });
}

/** Does the layout pass? Loads within or near limit, no under-voltage, runs within ampacity,
 *  fuses no larger than the conductor allows. */
function passes(ctx: Ctx, r: ReturnType<typeof solveCompiled>): boolean {
  if (!r.ok) return false;
  if (r.loads.some((l) => l.status === "over")) return false;
  return !r.findings.some((f) => f.code === "AMPACITY_EXCEEDED" || f.code === "FUSE_TOO_LARGE");
}

/** Smallest priced size of run i with ampacity ≥ amps and a fuse the conductor allows. Where the
 *  ampacity table has no value (metric, 18/16 AWG), nothing says a smaller conductor would carry
 *  the current or be protected by its fuse, so the floor is the size the designer chose. */
function floorSize(ctx: Ctx, i: number, amps: number): string {
  const run = ctx.c.system.runs[i];
  const list = ctx.allowed[i];
  const chosen = ctx.chosenArea[i];
  for (const s of list) {
    const amp = ampacity(s, run.material, run.insulationC);
    if (amp === undefined && sizeInfo(s)!.areaMm2 < chosen * (1 - 1e-9)) continue;
    const small = smallConductorFuseLimit(s, run.material) ?? Infinity;
    const needed = Math.max(amps, run.fuseA ?? 0);
    if (amp !== undefined && amp < needed) continue;
    if (run.fuseA !== undefined && run.fuseA > small) continue;
    return s;
  }
  return list[list.length - 1];
}

function stepUp(ctx: Ctx, i: number, size: string, steps = 1): string | undefined {
  const list = ctx.allowed[i];
  const at = list.indexOf(size);
  const to = at + steps;
  return to < list.length ? list[to] : undefined;
}

function maxRunCurrents(r: SolveSuccess): number[] {
  const out = r.cases[0].runs.map(() => 0);
  for (const cr of r.cases) cr.runs.forEach((rr, i) => { out[i] = Math.max(out[i], Math.abs(rr.current), Math.abs(rr.returnCurrent)); });
  return out;
}

/** Per point: the run that leads from it toward its source, and the point at its other end
 *  (a breadth-first tree from the source points). */
function pathTree(c: CompiledSystem) {
  const { system } = c;
  const idx = new Map(system.points.map((p, i) => [p.id, i]));
  const adj: [number, number][][] = system.points.map(() => []);
  system.runs.forEach((r, i) => {
    adj[idx.get(r.from)!].push([idx.get(r.to)!, i]);
    adj[idx.get(r.to)!].push([idx.get(r.from)!, i]);
  });
  const upRun = new Int32Array(system.points.length).fill(-1);
  const upPoint = new Int32Array(system.points.length).fill(-1);
  const seen = new Uint8Array(system.points.length);
  const queue: number[] = [];
  for (const s of system.sources) { const p = idx.get(s.point)!; if (!seen[p]) { seen[p] = 1; queue.push(p); } }
  for (let h = 0; h < queue.length; h++) {
    const v = queue[h];
    for (const [u, r] of adj[v]) if (!seen[u]) { seen[u] = 1; upRun[u] = r; upPoint[u] = v; queue.push(u); }
  }
  return { upRun, upPoint, loadPoint: system.loads.map((l) => idx.get(l.point)!) };
}

/** One conductor's resistance of run i if it had `size`, at the temperature of the last solve
 *  (scaled from the present element value; the temperature factor cancels in the ratio). */
function ohms(ctx: Ctx, i: number, size: string): number {
  const run = ctx.c.system.runs[i];
  const present = (ctx.c.netlist.elements[ctx.c.runPlus[i]] as { ohms: number }).ohms;
  // No closure here: this runs hundreds of thousands of times, and tsx's keepNames wraps every
  // closure it creates (measured: auto-size of a 525-run system 1.79 s → 0.95 s without it).
  const now = conductorResistance(ctx.c.runData[i].plusSize, run.material, 20, run.stranding)!.ohmPerMetre;
  const next = conductorResistance(size, run.material, 20, run.stranding)!.ohmPerMetre;
  return (present * next) / now;
}

/** Drop (% of nominal) each failing load still needs to lose, per case. */
function needs(ctx: Ctx, r: SolveSuccess): { caseIdx: number; load: number; need: number }[] {
  const out: { caseIdx: number; load: number; need: number }[] = [];
  const vn = ctx.c.system.nominalVoltage;
  r.cases.forEach((cr, ci) => cr.loads.forEach((lr, li) => {
    if (lr.status !== "over") return;
    let need = 0;
    const shown = lr.governingLimit === "branch" ? lr.branchDropPercent : lr.dropPercent;
    need = Math.max(need, shown - lr.limitPercent);
    const minV = ctx.c.system.loads[li].minVoltage;
    if (minV !== undefined && lr.voltage < minV) need = Math.max(need, ((minV - lr.voltage) / vn) * 100);
    out.push({ caseIdx: ci, load: li, need: need * 1.0001 + 1e-9 });
  }));
  return out;
}

export function autosize(input: unknown, costsInput: unknown): AutosizeResult {
  const started = performance.now();
  const parsedCosts = costsSchema.safeParse(costsInput);
  if (!parsedCosts.success) return { ok: false, errors: schemaErrors(parsedCosts.error).map((e) => ({ ...e, path: `costs.${e.path}`, message: `costs.${e.message}` })) };
  const costs = parsedCosts.data;
  const costErrors: EngineError[] = [];
  const costPerM = new Map<string, number>();
  costs.items.forEach((item, i) => {
    const s = normalizeSize(item.size);
    if (!s) costErrors.push({ code: "UNKNOWN_SIZE", path: `costs.items[${i}].size`, message: `costs.items[${i}].size: "${item.size}" is not a conductor size we know` });
    else costPerM.set(key(item.material, s), costs.per === "m" ? item.cost : item.cost / METRES_PER_FOOT);
  });
  if (costErrors.length) return { ok: false, errors: costErrors };

  const parsed = parseSystem(input);
  if (!parsed.ok) return { ok: false, errors: parsed.errors };
  const original = structuredClone(parsed.system);
  const c = compileSystem(parsed.system);
  if ("ok" in c) return { ok: false, errors: c.errors };
  const system = c.system;
  const lengthFactor = system.units === "imperial" ? METRES_PER_FOOT : 1;
  const allowed = system.runs.map((r) => [...costPerM.keys()]
    .filter((k) => k.startsWith(`${r.material}|`))
    .map((k) => k.slice(r.material.length + 1))
    .sort((a, b) => sizeInfo(a)!.areaMm2 - sizeInfo(b)!.areaMm2));
  const unpriced = system.runs.filter((r, i) => !r.locked && allowed[i].length === 0).map((r) => r.id);
  if (unpriced.length) {
    return { ok: false, errors: [{ code: "UNKNOWN_SIZE", path: "costs.items", ids: unpriced, message: `costs.items: no ${system.runs.find((r) => r.id === unpriced[0])!.material} size is priced, so runs ${unpriced.slice(0, 6).join(", ")} cannot be sized` }] };
  }
  const ctx: Ctx = {
    c, allowed, costPerM,
    lengthConductorM: system.runs.map((r) => 2 * (r.length as number) * lengthFactor * r.parallel),
    locked: system.runs.map((r) => r.locked === true),
    chosenArea: system.runs.map((r) => sizeInfo(r.size)!.areaMm2),
    solves: 0,
  };
  const messages: string[] = [];
  const unrated = system.runs.filter((r) => !r.locked && ampacity(r.size, r.material, r.insulationC) === undefined).map((r) => r.id);
  if (unrated.length > 0) {
    messages.push(`Runs ${unrated.slice(0, 6).join(", ")}${unrated.length > 6 ? " …" : ""} use sizes with no ampacity in the reference table (metric or 18/16 AWG), so auto-size only makes them larger, never smaller than designed.`);
  }
  const lockedSizes = system.runs.map((r) => r.size);
  const before = solveCompiled(c, { skipFaultCurrent: true });
  ctx.solves++;
  const totalCost = (sizes: string[]) => sizes.reduce((sum, s, i) => sum + (ctx.locked[i] ? 0 : runCost(ctx, i, s)), 0);

  // 1. Floor from ampacity and fuses.
  let sizes = system.runs.map((_, i) => (ctx.locked[i] ? lockedSizes[i] : allowed[i][0]));
  let result = solve(ctx, sizes);
  for (let round = 0; round < 6; round++) {
    const currents = result.ok ? maxRunCurrents(result) : sizes.map(() => 0);
    const next = sizes.map((s, i) => (ctx.locked[i] ? s : floorSize(ctx, i, currents[i])));
    const changed = next.some((s, i) => s !== sizes[i]);
    sizes = next;
    if (!changed && result.ok) break;
    result = solve(ctx, sizes);
    if (!result.ok) {
      // Too small to solve (a constant-power load collapses): step everything up and retry.
      const up = sizes.map((s, i) => (ctx.locked[i] ? s : stepUp(ctx, i, s) ?? s));
      if (up.every((s, i) => s === sizes[i])) break;
      sizes = up;
      result = solve(ctx, sizes);
    }
  }
  const floor = [...sizes];

  // 4 (computed first; it also bounds the greedy search). Uniform steps up from the floor.
  let uniform: { sizes: string[]; cost: number } | null = null;
  const maxSteps = Math.max(...allowed.map((a) => a.length));
  for (let k = 0; k <= maxSteps; k++) {
    const cand = floor.map((s, i) => (ctx.locked[i] ? s : stepUp(ctx, i, s, k) ?? allowed[i][allowed[i].length - 1]));
    const r = solve(ctx, cand);
    if (passes(ctx, r)) { uniform = { sizes: cand, cost: totalCost(cand) }; break; }
    if (k > 0 && cand.every((s, i) => ctx.locked[i] || s === allowed[i][allowed[i].length - 1])) break;
  }

  // 2. Greedy upsizing.
  const tree = pathTree(c);
  sizes = [...floor];
  result = solve(ctx, sizes);
  let guard = 0;
  while (!passes(ctx, result) && guard++ < 10_000) {
    if (!result.ok) {
      const up = sizes.map((s, i) => (ctx.locked[i] ? s : stepUp(ctx, i, s) ?? s));
      if (up.every((s, i) => s === sizes[i])) break;
      sizes = up;
      result = solve(ctx, sizes);
      continue;
    }
    const r = result;
    // Ampacity failures first: bump those runs to their floor for the new currents.
    const currents = maxRunCurrents(r);
    let bumped = false;
    sizes = sizes.map((s, i) => {
      if (ctx.locked[i]) return s;
      const f = floorSize(ctx, i, currents[i]);
      if (allowed[i].indexOf(f) > allowed[i].indexOf(s)) { bumped = true; return f; }
      return s;
    });
    if (bumped) { result = solve(ctx, sizes); continue; }
    const want = needs(ctx, r);
    if (want.length === 0) break;
    const vn = system.nominalVoltage;
    const planned = [...sizes];
    let picks = 0;
    for (;;) {
      // Score each run: Σ over failing loads on its path of min(need, gain) / extra cost.
      const gainTotal = new Float64Array(system.runs.length);
      const runGain = (ri: number, caseIdx: number): number => {
        const next = stepUp(ctx, ri, planned[ri]);
        if (!next) return 0;
        const current = Math.max(Math.abs(r.cases[caseIdx].runs[ri].current), Math.abs(r.cases[caseIdx].runs[ri].returnCurrent));
        const rNow = ohms(ctx, ri, planned[ri]);
        const rNext = ohms(ctx, ri, next);
        return ((current * 2 * (rNow - rNext)) / vn) * 100;
      };
      let any = false;
      for (const w of want) {
        if (w.need <= 0) continue;
        any = true;
        for (let p = tree.loadPoint[w.load]; tree.upRun[p] >= 0; p = tree.upPoint[p]) {
          const ri = tree.upRun[p];
          if (ctx.locked[ri]) continue;
          gainTotal[ri] += Math.min(w.need, runGain(ri, w.caseIdx));
        }
      }
      if (!any) break;
      let best = -1;
      let bestScore = 0;
      for (let ri = 0; ri < gainTotal.length; ri++) {
        if (gainTotal[ri] <= 0) continue;
        const next = stepUp(ctx, ri, planned[ri])!;
        const extra = Math.max(1e-9, runCost(ctx, ri, next) - runCost(ctx, ri, planned[ri]));
        const score = gainTotal[ri] / extra;
        if (score > bestScore) { bestScore = score; best = ri; }
      }
      if (best < 0) break;
      // Lower the predicted needs of the loads it serves, then take the step.
      for (const w of want) {
        if (w.need <= 0) continue;
        for (let p = tree.loadPoint[w.load]; tree.upRun[p] >= 0; p = tree.upPoint[p]) {
          if (tree.upRun[p] === best) { w.need -= runGain(best, w.caseIdx); break; }
        }
      }
      planned[best] = stepUp(ctx, best, planned[best])!;
      if (++picks > system.runs.length * 4) break;
    }
    if (planned.every((s, i) => s === sizes[i])) {
      // Nothing on the failing paths can grow (all at the largest priced size): give up here.
      break;
    }
    sizes = planned;
    result = solve(ctx, sizes);
  }
  let greedy: { sizes: string[]; cost: number } | null = passes(ctx, result) ? { sizes: [...sizes], cost: totalCost(sizes) } : null;

  // 3. Downsize pass on whichever passing layouts we have.
  const downsize = (start: { sizes: string[]; cost: number }) => {
    let cur = [...start.sizes];
    let curResult = solve(ctx, cur);
    for (let pass = 0; pass < 3; pass++) {
      let changed = false;
      const order = cur
        .map((s, i) => ({ i, saving: ctx.locked[i] || allowed[i].indexOf(s) <= 0 ? -1 : runCost(ctx, i, s) - runCost(ctx, i, allowed[i][allowed[i].indexOf(s) - 1]) }))
        .filter((x) => x.saving > 0)
        .sort((a, b) => b.saving - a.saving);
      for (const { i } of order) {
        const at = allowed[i].indexOf(cur[i]);
        if (at <= 0) continue;
        const down = allowed[i][at - 1];
        if (ampacity(down, system.runs[i].material, system.runs[i].insulationC) === undefined && sizeInfo(down)!.areaMm2 < ctx.chosenArea[i] * (1 - 1e-9)) continue;
        // Estimate: the step down must not push any load on this run's path over its limit.
        if (curResult.ok && !slackAllows(ctx, curResult, tree, i, cur[i], down)) continue;
        const trial = [...cur];
        trial[i] = down;
        const r = solve(ctx, trial);
        if (passes(ctx, r)) { cur = trial; curResult = r; changed = true; }
      }
      if (!changed) break;
    }
    return { sizes: cur, cost: totalCost(cur) };
  };
  if (greedy) greedy = downsize(greedy);
  let chosen = greedy;
  let method: "greedy" | "uniform" = "greedy";
  if (uniform && (!chosen || uniform.cost < chosen.cost - 1e-9)) {
    const u = downsize(uniform);
    if (!chosen || u.cost < chosen.cost - 1e-9) { chosen = u; method = "uniform"; }
  }
  let ok = true;
  if (!chosen) {
    ok = false;
    const last = solve(ctx, sizes);
    const fuseIds = last.ok ? last.findings.filter((f) => f.code === "FUSE_TOO_LARGE").flatMap((f) => f.ids) : [];
    const ampIds = last.ok ? last.findings.filter((f) => f.code === "AMPACITY_EXCEEDED").flatMap((f) => f.ids) : [];
    const loadsOver = last.ok ? last.loads.some((l) => l.status === "over") : true;
    if (loadsOver) messages.push("No priced sizes bring every load within its limits; the proposal uses the largest priced size on the failing paths. Consider a higher system voltage, a shorter route or parallel conductors.");
    if (fuseIds.length) messages.push(`The fuses on ${fuseIds.slice(0, 6).join(", ")} are larger than the largest priced size may carry; choose a smaller fuse or price a larger size.`);
    if (ampIds.length) messages.push(`Runs ${ampIds.slice(0, 6).join(", ")} carry more than the ampacity of the largest priced size; price a larger size or use parallel sets.`);
    chosen = { sizes, cost: totalCost(sizes) };
  }

  // Final: full solve (with fault current) of the proposal, and the before/after per load.
  setSizes(ctx, chosen.sizes);
  const after = solveCompiled(c);
  ctx.solves++;
  const proposalDoc = structuredClone(input as SystemInput);
  proposalDoc.runs = proposalDoc.runs.map((r, i) => {
    if (ctx.locked[i] || chosen!.sizes[i] === original.runs[i].size) return r;
    const { returnSize: _drop, ...rest } = r;
    return { ...rest, size: chosen!.sizes[i] };
  });
  const runs: AutosizeRun[] = system.runs.map((r, i) => {
    const beforeSize = original.runs[i].size;
    const cb = ctx.locked[i] ? 0 : runCost(ctx, i, beforeSize);
    return {
      id: r.id,
      before: beforeSize,
      after: chosen!.sizes[i],
      costBefore: Number.isFinite(cb) ? cb : null,
      costAfter: ctx.locked[i] ? 0 : runCost(ctx, i, chosen!.sizes[i]),
      changed: chosen!.sizes[i] !== beforeSize,
    };
  });
  const costBefore = runs.some((r) => r.costBefore === null) ? null : runs.reduce((s, r) => s + (r.costBefore ?? 0), 0);
  if (costBefore === null) messages.push("Some of the present sizes are not in the price list, so the cost before is not known.");
  const costAfter = runs.reduce((s, r) => s + r.costAfter, 0);
  const loads: AutosizeLoad[] = system.loads.map((l, li) => ({
    id: l.id,
    before: before.ok ? { dropPercent: before.loads[li].dropPercent, status: before.loads[li].status, worstCase: before.loads[li].worstCase } : null,
    after: after.ok
      ? { dropPercent: after.loads[li].dropPercent, status: after.loads[li].status, worstCase: after.loads[li].worstCase }
      : { dropPercent: NaN, status: "over", worstCase: "" },
  }));
  return {
    ok: true,
    passes: ok && passes(ctx, after),
    runs,
    loads,
    costBefore,
    costAfter,
    costDifference: costBefore === null ? null : costAfter - costBefore,
    currency: costs.currency,
    system: proposalDoc,
    stats: { solves: ctx.solves, milliseconds: performance.now() - started, method },
    messages,
  };
}

/** Estimate whether stepping run i down from `from` to `to` keeps every load on paths through it
 *  within its limit (using the present currents). Optimistic estimates are caught by the solve. */
function slackAllows(ctx: Ctx, r: SolveSuccess, tree: ReturnType<typeof pathTree>, i: number, from: string, to: string): boolean {
  const vn = ctx.c.system.nominalVoltage;
  const rFrom = ohms(ctx, i, from);
  const rTo = ohms(ctx, i, to);
  for (const cr of r.cases) {
    const current = Math.max(Math.abs(cr.runs[i].current), Math.abs(cr.runs[i].returnCurrent));
    const rise = ((current * 2 * (rTo - rFrom)) / vn) * 100;
    for (let li = 0; li < cr.loads.length; li++) {
      let onPath = false;
      for (let p = tree.loadPoint[li]; tree.upRun[p] >= 0; p = tree.upPoint[p]) if (tree.upRun[p] === i) { onPath = true; break; }
      if (!onPath) continue;
      const lr = cr.loads[li];
      const shown = lr.governingLimit === "branch" ? lr.branchDropPercent : lr.dropPercent;
      if (shown + rise > lr.limitPercent * 1.02) return false;
    }
  }
  return true;
}
