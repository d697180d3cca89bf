// Generated network documents for the fuzz tests (tests/shared/engine/fuzz.test.ts through the
// engine's entry point, tests/server/hostile/fuzz-solve.test.ts through POST /systems/:id/solve).
//
// Three kinds of case, drawn by fuzzCase():
//  - valid: a document the schema and the reference checks accept, with every field the format
//    has (all load models including constant power, PV arrays, cases, limit profiles, optional
//    fields present or left to their defaults) and values a contractor could type. It may still
//    fail to solve (voltage collapse, two ideal sources in parallel): those are results too.
//  - near-valid: a valid document with one to three "strict" mutations, each of which the engine
//    must refuse naming the field (or its entity): a missing required field, a dangling
//    reference, a duplicate id, NaN/±Infinity, a number outside the field's range, a 0 m run, a
//    wrong type, an unknown field, a size, id or enum nobody knows, a value nested 10,000 deep, an
//    array of 50,000 elements where one value belongs, an array over its size limit.
//  - extreme: a valid document with numbers at the schema's bounds (5e-324 Ω, 1e5 m, a load
//    factor of 100): the engine may refuse it, but a result must hold only finite numbers.
//  - broken: anything else: several mutations including ones that need not be refused (random
//    doubles, junk values from a recursive arbitrary (fc.letrec) with objects such as
//    {"length": {"valueOf": 0, "toString": 0}} that cannot be converted to a number, deleted
//    optional fields, 50,000-element arrays of points/runs/loads), or the whole document replaced
//    by junk.
// Each mutation is drawn as plain numbers (which op, which field, which bad value) and applied to
// the built document, so fast-check can shrink a failure to a small document and one mutation.
import fc from "fast-check";
import { AWG_SIZES, ALUMINUM_AWG_SIZES, METRIC_SIZES, mulberry32 } from "./random-systems.js";

export type Doc = Record<string, any>;
export type PathPart = string | number;

/** A value the server cannot receive as such in JSON; the HTTP test writes it as raw text. */
export class RawJson {
  constructor(readonly text: string, readonly label: string) {}
}

/** The values nested() made, with their depth: JSON.stringify overflows the stack on them, so the
 *  HTTP test writes them as text. */
export const NESTED_VALUES = new WeakMap<object, { depth: number; kind: "array" | "object" }>();

/** Nested arrays (or objects) `depth` deep, built without recursion. */
export function nested(depth: number, kind: "array" | "object"): unknown {
  let v: unknown = kind === "array" ? [] : {};
  for (let i = 0; i < depth; i++) v = kind === "array" ? [v] : { k: v };
  NESTED_VALUES.set(v as object, { depth, kind });
  return v;
}

// ---------------------------------------------------------------------------------------------
// Valid documents

const idPrefix = fc.oneof(
  { weight: 6, arbitrary: fc.constantFrom("p", "pt-", "Bus.", "a:b_") },
  { weight: 1, arbitrary: fc.stringMatching(/^[A-Za-z0-9_.:-]{1,70}[A-Za-z_.:-]$/) },
);
const optional = <T>(arb: fc.Arbitrary<T>, freq = 2) => fc.option(arb, { nil: undefined, freq });
const between = (min: number, max: number) => fc.double({ min, max, noNaN: true, noDefaultInfinity: true });
// Names are at most 200 UTF-16 units (a grapheme can take several).
const anyName = fc.oneof(fc.string({ maxLength: 30 }), fc.string({ unit: "grapheme", maxLength: 40 }).filter((s) => s.length <= 200), fc.constant("x".repeat(200)));

const runProps = fc.record({
  length: fc.oneof({ weight: 8, arbitrary: between(0.5, 200) }, { weight: 1, arbitrary: fc.constantFrom(0.001, 1e5) }),
  /** Text lengths ("40 m", "130 ft"): only where resolveLengths runs first (the API). */
  textUnit: fc.constantFrom("m", "ft", "yd", "cm"),
  size: fc.nat(),
  returnSize: optional(fc.nat(), 4),
  material: optional(fc.constantFrom("copper", "aluminum")),
  parallel: optional(fc.integer({ min: 1, max: 4 })),
  stranding: optional(fc.constantFrom("class5", "class2"), 4),
  insulationC: optional(fc.constantFrom(60, 75, 90), 4),
  fuseA: optional(between(1, 500), 3),
  fuseInterruptingA: optional(between(100, 1e6), 4),
  kind: optional(fc.constantFrom("feeder", "branch"), 4),
  locked: optional(fc.boolean(), 5),
  name: optional(anyName, 4),
  flip: fc.boolean(),
});

const sourceProps = fc.record({
  at: fc.nat(),
  type: fc.constantFrom("battery", "battery", "supply", "pvArray"),
  volts: between(0.9, 1.15),
  r: optional(fc.oneof(fc.constant(0), between(0.001, 0.1))),
  currentA: between(0, 20),
  pvVoltage: optional(between(1, 100), 3),
  primary: optional(fc.boolean(), 4),
  name: optional(anyName, 4),
});

const loadProps = fc.record({
  at: fc.nat(),
  model: fc.constantFrom("ohms", "watts", "constantCurrent", "constantPower"),
  value: between(0.01, 1),
  critical: optional(fc.boolean()),
  minVoltage: optional(between(0.5, 0.95), 3),
  name: optional(anyName, 4),
});

const caseProps = fc.record({
  name: fc.oneof(fc.constantFrom("Nominal", "Low battery, hot day", "Full charge"), fc.string({ minLength: 1, maxLength: 40 })),
  voltages: fc.array(fc.tuple(fc.nat(), between(0.85, 1.15)), { maxLength: 3 }),
  currents: fc.array(fc.tuple(fc.nat(), between(0, 20)), { maxLength: 2 }),
  conductorTemperatureC: optional(between(-50, 150)),
  loadFactor: optional(between(0, 2)),
});

const profileProps = fc.record({
  name: optional(anyName),
  branchPercent: optional(between(0.5, 10)),
  totalPercent: optional(between(0.5, 15)),
  criticalPercent: optional(between(0.5, 10)),
  nearFraction: optional(between(0.05, 0.99)),
});

export interface ValidOptions {
  /** Write some run lengths as text with a unit (the API converts them; the engine does not). */
  textLengths?: boolean;
  maxPoints?: number;
}

/** A document the schema and every reference check accept (see the header). */
export function validDocument(options: ValidOptions = {}): fc.Arbitrary<Doc> {
  const maxPoints = options.maxPoints ?? 12;
  return fc
    .record({
      units: fc.constantFrom("metric", "imperial"),
      nominal: fc.constantFrom(12, 24, 48, 120),
      n: fc.integer({ min: 1, max: maxPoints }),
      parents: fc.array(fc.nat(), { minLength: maxPoints, maxLength: maxPoints }),
      extra: fc.array(fc.tuple(fc.nat(), fc.nat()), { maxLength: 4 }),
      runs: fc.array(runProps, { minLength: maxPoints + 4, maxLength: maxPoints + 4 }),
      sources: fc.array(sourceProps, { minLength: 1, maxLength: 3 }),
      loads: fc.array(loadProps, { maxLength: 10 }),
      cases: optional(fc.array(caseProps, { minLength: 1, maxLength: 3 })),
      profile: optional(profileProps),
      temperature: optional(between(-50, 150)),
      name: optional(anyName),
      prefixes: fc.tuple(idPrefix, idPrefix, idPrefix, idPrefix),
      pointFuse: fc.array(optional(between(100, 1e6), 5), { minLength: maxPoints, maxLength: maxPoints }),
      textLength: fc.array(fc.boolean(), { minLength: maxPoints + 4, maxLength: maxPoints + 4 }),
      order: fc.nat(),
    })
    .map((p) => {
      const [pp, sp, rp, lp] = p.prefixes;
      const pid = (i: number) => `${pp}${i}`;
      const points = Array.from({ length: p.n }, (_, i) => {
        const point: Doc = { id: pid(i) };
        if (p.pointFuse[i] !== undefined) point.fuseInterruptingA = p.pointFuse[i];
        if (i === 0 && p.name !== undefined) point.name = p.name;
        return point;
      });
      const pairs: [number, number][] = [];
      for (let i = 1; i < p.n; i++) pairs.push([p.parents[i] % i, i]);
      for (const [a, b] of p.extra) {
        if (p.n < 2) break;
        const x = a % p.n;
        const y = b % p.n;
        if (x !== y) pairs.push([x, y]);
      }
      const runs = pairs.map(([a, b], i) => {
        const q = p.runs[i];
        const material = q.material ?? "copper";
        const list: readonly string[] = p.units === "metric" ? METRIC_SIZES : material === "aluminum" ? ALUMINUM_AWG_SIZES : AWG_SIZES;
        const run: Doc = { id: `${rp}${i}`, from: pid(q.flip ? b : a), to: pid(q.flip ? a : b), length: q.length, size: list[q.size % list.length] };
        // Text only in the typical range, so the converted length stays within 0.001 … 1e5.
        if (options.textLengths && p.textLength[i] && q.length >= 1 && q.length <= 200) run.length = `${Math.round(q.length * 100) / 100} ${q.textUnit}`;
        if (q.returnSize !== undefined) run.returnSize = list[q.returnSize % list.length];
        if (q.material !== undefined) run.material = q.material;
        for (const key of ["parallel", "stranding", "insulationC", "fuseA", "fuseInterruptingA", "kind", "locked", "name"] as const) {
          if (q[key] !== undefined) run[key] = q[key];
        }
        return run;
      });
      const sources = p.sources.map((q, i) => {
        const source: Doc = { id: `${sp}${i}`, type: q.type, point: pid(q.at % p.n) };
        if (q.type === "pvArray") {
          source.currentA = q.currentA;
          if (q.pvVoltage !== undefined) source.voltage = q.pvVoltage;
        } else {
          source.voltage = Math.round(p.nominal * q.volts * 1000) / 1000;
          if (q.r !== undefined) source.internalResistanceOhm = q.r;
        }
        if (q.primary !== undefined) source.primary = q.primary;
        if (q.name !== undefined) source.name = q.name;
        return source;
      });
      // Loads sized from the nominal voltage: up to about 20 A each.
      const loads = p.loads.map((q, i) => {
        const load: Doc = { id: `${lp}${i}`, point: pid(q.at % p.n) };
        const amps = 20 * q.value;
        if (q.model === "ohms") Object.assign(load, { model: "constantResistance", ohms: p.nominal / amps });
        else if (q.model === "watts") Object.assign(load, { model: "constantResistance", watts: p.nominal * amps });
        else if (q.model === "constantCurrent") Object.assign(load, { model: "constantCurrent", amps });
        else Object.assign(load, { model: "constantPower", watts: p.nominal * amps });
        if (q.critical !== undefined) load.critical = q.critical;
        if (q.minVoltage !== undefined) load.minVoltage = p.nominal * q.minVoltage;
        if (q.name !== undefined) load.name = q.name;
        return load;
      });
      const doc: Doc = { format: "runwright-system/1", units: p.units, nominalVoltage: p.nominal, points, sources, runs, loads };
      if (p.name !== undefined) doc.name = p.name;
      if (p.temperature !== undefined) doc.conductorTemperatureC = p.temperature;
      if (p.cases !== undefined) {
        doc.cases = p.cases.map((q) => {
          const kase: Doc = { name: q.name };
          const volts = sources.filter((s) => s.type !== "pvArray");
          const pv = sources.filter((s) => s.type === "pvArray");
          if (q.voltages.length > 0 && volts.length > 0) kase.sourceVoltages = Object.fromEntries(q.voltages.map(([k, f]) => [volts[k % volts.length].id, Math.round(p.nominal * f * 1000) / 1000]));
          if (q.currents.length > 0 && pv.length > 0) kase.sourceCurrents = Object.fromEntries(q.currents.map(([k, a]) => [pv[k % pv.length].id, a]));
          if (q.conductorTemperatureC !== undefined) kase.conductorTemperatureC = q.conductorTemperatureC;
          if (q.loadFactor !== undefined) kase.loadFactor = q.loadFactor;
          return kase;
        });
      }
      if (p.profile !== undefined) {
        doc.limitProfile = Object.fromEntries(Object.entries(p.profile).filter(([, v]) => v !== undefined));
      }
      // Key order does not matter to the format: sometimes write the arrays first.
      if (p.order % 3 === 0) return Object.fromEntries(Object.entries(doc).reverse());
      return doc;
    });
}

// ---------------------------------------------------------------------------------------------
// Junk: any JSON-ish value, recursive (fc.letrec), with the numbers JSON cannot carry.

/** Objects that trip code which converts a value to a number or string without checking its type:
 *  `{"length": {"valueOf": 0, "toString": 0}}` cannot be converted to a primitive at all. */
export const HOSTILE_OBJECTS: readonly object[] = [
  { length: { valueOf: 0, toString: 0 } },
  { valueOf: 0, toString: 0 },
  { length: 1e9 },
  { length: -1, 0: "a" },
  { then: 1, toJSON: 1 },
  { constructor: { prototype: 1 } },
];
const hostileObject = fc.constantFrom(...HOSTILE_OBJECTS).map((o) => structuredClone(o));
const specialNumber = fc.constantFrom(Number.NaN, Infinity, -Infinity, -0, 0, -1, 1e308, -1e308, 5e-324, Number.MAX_SAFE_INTEGER, 1e21, 2 ** 53 + 2);
export const junk: fc.Arbitrary<unknown> = fc.letrec((tie) => ({
  value: fc.oneof(
    { depthSize: "small", withCrossShrink: true },
    tie("leaf"),
    fc.array(tie("value"), { maxLength: 4 }),
    fc.dictionary(fc.oneof(fc.string({ maxLength: 8 }), fc.constantFrom("id", "point", "from", "to", "length", "model", "__proto__", "constructor")), tie("value"), { maxKeys: 4 }),
  ),
  leaf: fc.oneof(
    specialNumber,
    hostileObject,
    fc.double(),
    fc.integer(),
    fc.string({ maxLength: 20 }),
    fc.constantFrom(null, true, false, "", "runwright-system/1", "16 mm2", "10 AWG", "130 ft", "bus", "constantPower", "battery"),
  ),
})).value;

// ---------------------------------------------------------------------------------------------
// Mutations

/** Invalid numbers per numeric field (each outside the schema's range or refused by the engine). */
const BAD_NUMBERS: Record<string, number[]> = {
  voltage: [0, -1, 2000.5, 1e308],
  internalResistanceOhm: [-1, -1e-300, 1000.001, 1e308],
  currentA: [-1, 100_001, 1e308],
  length: [0, -0, -5, 1e-7, 5e-324, 100_001, 1e308],
  parallel: [0, 21, 1.5, -1],
  fuseA: [0, -1, 100_001],
  fuseInterruptingA: [0, -1, 1_000_001],
  ohms: [-1, 0, 1e9 + 1, 1e308],
  watts: [-1, -1e-9, 1e7 + 1, 1e308],
  amps: [-1, 100_001, 1e308],
  minVoltage: [0, -1, 2001],
  nominalVoltage: [0, 0.99, 2001, -12],
  conductorTemperatureC: [-51, 151, -273.15, 1e308],
  loadFactor: [-0.1, 100.5],
  branchPercent: [0, -1, 100.1],
  totalPercent: [0, -1, 100.1],
  criticalPercent: [0, -1, 100.1],
  nearFraction: [0, 1, -0.5, 1.5],
  insulationC: [70, 0, 105, 75.5],
};
/** Valid extremes per numeric field: the schema's bounds and the smallest doubles it lets through. */
const EXTREME_NUMBERS: Record<string, number[]> = {
  voltage: [5e-324, 1e-300, 2000],
  internalResistanceOhm: [5e-324, 1e-300, 1000],
  currentA: [5e-324, 1e5],
  length: [0.001, 1e5],
  parallel: [20],
  fuseA: [5e-324, 1e5],
  fuseInterruptingA: [5e-324, 1e6],
  ohms: [5e-324, 1e-300, 1e-12, 1e9],
  watts: [5e-324, 1e-300, 1e7],
  amps: [5e-324, 1e5],
  minVoltage: [5e-324, 2000],
  nominalVoltage: [1, 2000],
  conductorTemperatureC: [-50, 150],
  loadFactor: [5e-324, 1e-300, 100],
  branchPercent: [5e-324, 100],
  totalPercent: [5e-324, 100],
  criticalPercent: [5e-324, 100],
  nearFraction: [5e-324, 1 - 2 ** -53],
};
const BAD_VOLTAGE_ENTRY = [0, -1, 2001];
const BAD_CURRENT_ENTRY = [-1, 100_001];
const BAD_STRINGS: Record<string, string[]> = {
  format: ["runwright-system/2", "", "RUNWRIGHT-SYSTEM/1"],
  units: ["furlong", "", "Metric"],
  material: ["gold", "", "Copper"],
  stranding: ["class9", ""],
  kind: ["trunk", ""],
  type: ["fusion", "", "Battery"],
  model: ["magic", "", "constantpower"],
  size: ["17 mm2", "banana", "", "x".repeat(41), "3.3 mm2", "19 AWG", "600 kcmil"],
  returnSize: ["17 mm2", "banana", "", "x".repeat(41)],
  id: ["", "a b", "x".repeat(81), "ü", "a/b", "<script>"],
  name: ["x".repeat(201)],
};
const NON_FINITE = [Number.NaN, Infinity, -Infinity];
const WRONG_FOR_NUMBER: unknown[] = ["12", true, null, [], {}, [1], { value: 1 }, ...HOSTILE_OBJECTS];
const WRONG_FOR_LENGTH: unknown[] = [true, null, [], {}, [1], ...HOSTILE_OBJECTS];
const WRONG_FOR_STRING: unknown[] = [12, true, null, [], {}, ["a"], ...HOSTILE_OBJECTS];
const WRONG_FOR_BOOLEAN: unknown[] = ["true", 1, null, []];
const REFS = new Set(["point", "from", "to"]);
const REQUIRED: Record<string, string[]> = {
  "": ["format", "units", "nominalVoltage", "points", "sources", "runs", "loads"],
  points: ["id"],
  sources: ["id", "point", "type"],
  runs: ["id", "from", "to", "length", "size"],
  loads: ["id", "point", "model"],
  cases: ["name"],
};
/** Required only for some kinds of entity. */
function requiredHere(entity: Doc, list: string, key: string): boolean {
  if ((REQUIRED[list] ?? []).includes(key)) return true;
  if (list === "sources") return (entity.type === "pvArray" && key === "currentA") || (entity.type !== "pvArray" && key === "voltage");
  if (list === "loads") return (entity.model === "constantCurrent" && key === "amps") || (entity.model === "constantPower" && key === "watts") || (entity.model === "constantResistance" && (key === "ohms" || key === "watts"));
  return false;
}

export interface Field {
  path: PathPart[];
  /** The list the entity is in ("runs"), or "" for a top-level field. */
  list: string;
  key: string;
  value: unknown;
  entity: Doc;
}

/** Entities looked at per list when picking a field (a list may have 60,000). */
const FIELD_SCAN = 40;
const isObject = (v: unknown): v is Doc => typeof v === "object" && v !== null && !Array.isArray(v);
/** Indexes of the entries of doc[list] that are objects (a mutation may have put junk there). */
function entitiesOf(doc: Doc, list: string): number[] {
  const arr = doc[list];
  if (!Array.isArray(arr)) return [];
  const out: number[] = [];
  for (let i = 0; i < arr.length && out.length < FIELD_SCAN; i++) if (isObject(arr[i])) out.push(i);
  return out;
}

/** The fields of the document, entity by entity (record entries of cases included), from the
 *  first FIELD_SCAN entities of each list. */
export function fieldsOf(doc: Doc): Field[] {
  const out: Field[] = [];
  for (const key of Object.keys(doc)) {
    if (!Array.isArray(doc[key]) && key !== "limitProfile") out.push({ path: [key], list: "", key, value: doc[key], entity: doc });
  }
  for (const list of ["points", "sources", "runs", "loads", "cases"]) {
    for (const i of entitiesOf(doc, list)) {
      const entity: Doc = doc[list][i];
      for (const key of Object.keys(entity)) {
        const v = entity[key];
        if ((key === "sourceVoltages" || key === "sourceCurrents") && isObject(v)) {
          for (const sid of Object.keys(v).slice(0, FIELD_SCAN)) out.push({ path: [list, i, key, sid], list: key, key: sid, value: v[sid], entity: v });
        } else out.push({ path: [list, i, key], list, key, value: v, entity });
      }
    }
  }
  if (isObject(doc.limitProfile)) {
    for (const key of Object.keys(doc.limitProfile)) out.push({ path: ["limitProfile", key], list: "limitProfile", key, value: doc.limitProfile[key], entity: doc.limitProfile });
  }
  return out;
}

/** "runs[2].size", as the engine writes paths. */
export function formatPath(path: readonly PathPart[]): string {
  let out = "";
  for (const part of path) out += typeof part === "number" ? `[${part}]` : out ? `.${part}` : part;
  return out;
}

function setAt(doc: Doc, path: readonly PathPart[], value: unknown): void {
  let at: any = doc;
  for (const part of path.slice(0, -1)) at = at[part];
  at[path[path.length - 1]] = value;
}

export type MutationOp =
  | "badNumber" | "nonFinite" | "wrongType" | "badString" | "deleteRequired" | "unknownField" | "dangling"
  | "duplicateId" | "zeroLength" | "sameEnds" | "unknownSource" | "deepNesting" | "hugeArrayInField" | "overLimit"
  | "textLength"
  // not strict: the result may be valid
  | "randomDouble" | "junkAnywhere" | "deleteAny" | "hugeList" | "shuffle" | "extremeValue";

export const STRICT_OPS: MutationOp[] = [
  "badNumber", "nonFinite", "wrongType", "badString", "deleteRequired", "unknownField", "dangling", "duplicateId",
  "zeroLength", "sameEnds", "unknownSource", "deepNesting", "hugeArrayInField", "overLimit", "textLength",
];
const LOOSE_OPS: MutationOp[] = ["randomDouble", "junkAnywhere", "deleteAny", "hugeList", "shuffle", "extremeValue"];

export interface MutationSeed {
  op: MutationOp;
  a: number;
  b: number;
  depth: number;
  double: number;
  junk: unknown;
}

/** Mutations that build 50,000- or 60,000-element arrays: about 1 % of the cases (each costs
 *  tens of milliseconds), the others ten times as often each. */
const HEAVY_OPS = new Set<MutationOp>(["hugeArrayInField", "overLimit", "hugeList"]);
const seedOf = (ops: MutationOp[]) =>
  fc.record({
    op: fc.oneof(...ops.map((op) => ({ weight: HEAVY_OPS.has(op) ? 1 : 10, arbitrary: fc.constant(op) }))),
    a: fc.nat(),
    b: fc.nat(),
    depth: fc.integer({ min: 1000, max: 10_000 }),
    double: fc.double(),
    junk,
  });

export interface Applied {
  op: MutationOp;
  /** The field the engine must name (for strict mutations that applied). */
  target?: string;
  note: string;
}

export interface ApplyOptions {
  /** The engine reads text lengths only after resolveLengths (the API): there "40 m" is valid. */
  textLengthsResolved?: boolean;
}

/** Applies one mutation in place; returns what it did (target undefined: not strict or no-op). */
export function applyMutation(doc: Doc, m: MutationSeed, options: ApplyOptions = {}): Applied {
  const fields = fieldsOf(doc);
  const pick = <T>(list: T[], k = m.a): T | undefined => (list.length ? list[k % list.length] : undefined);
  const strict = (path: PathPart[], note: string): Applied => ({ op: m.op, target: formatPath(path), note });
  const loose = (note: string): Applied => ({ op: m.op, note });
  const lists = ["points", "sources", "runs", "loads"].filter((l) => entitiesOf(doc, l).length > 0);
  const runs = entitiesOf(doc, "runs");
  switch (m.op) {
    case "badNumber": {
      const f = pick(fields.filter((x) => typeof x.value === "number" && (BAD_NUMBERS[x.key] || x.list === "sourceVoltages" || x.list === "sourceCurrents")));
      if (!f) return loose("no numeric field");
      const bad = f.list === "sourceVoltages" ? BAD_VOLTAGE_ENTRY : f.list === "sourceCurrents" ? BAD_CURRENT_ENTRY : BAD_NUMBERS[f.key];
      const v = bad[m.b % bad.length];
      setAt(doc, f.path, v);
      return strict(f.path, `${formatPath(f.path)} = ${v}`);
    }
    case "nonFinite": {
      const f = pick(fields.filter((x) => typeof x.value === "number"));
      if (!f) return loose("no numeric field");
      const v = NON_FINITE[m.b % NON_FINITE.length];
      setAt(doc, f.path, v);
      return strict(f.path, `${formatPath(f.path)} = ${v}`);
    }
    case "wrongType": {
      const f = pick(fields.filter((x) => x.value !== undefined && x.value !== null && typeof x.value !== "object"));
      if (!f) return loose("no field");
      const options = f.key === "length" && f.list === "runs" ? WRONG_FOR_LENGTH : typeof f.value === "number" ? WRONG_FOR_NUMBER : typeof f.value === "boolean" ? WRONG_FOR_BOOLEAN : WRONG_FOR_STRING;
      const v = structuredClone(options[m.b % options.length]);
      setAt(doc, f.path, v);
      return strict(f.path, `${formatPath(f.path)} = ${JSON.stringify(v)}`);
    }
    case "badString": {
      const f = pick(fields.filter((x) => typeof x.value === "string" && (BAD_STRINGS[x.key] || REFS.has(x.key)) && !(x.list === "cases" && x.key === "name")));
      if (!f) return loose("no string field");
      const bad = REFS.has(f.key) ? BAD_STRINGS.id : BAD_STRINGS[f.key];
      const v = bad[m.b % bad.length];
      setAt(doc, f.path, v);
      return strict(f.path, `${formatPath(f.path)} = ${JSON.stringify(v)}`);
    }
    case "deleteRequired": {
      const topLists: Field[] = lists.map((l) => ({ path: [l], list: "", key: l, value: doc[l], entity: doc }));
      const f = pick([...topLists, ...fields.filter((x) => x.list !== "sourceVoltages" && x.list !== "sourceCurrents" && x.list !== "limitProfile" && requiredHere(x.entity, x.list, x.key))]);
      if (!f) return loose("no required field");
      delete f.entity[f.key];
      return strict(f.path, `delete ${formatPath(f.path)}`);
    }
    case "unknownField": {
      const owners: PathPart[][] = [[]];
      for (const l of [...lists, "cases"]) for (const i of entitiesOf(doc, l)) owners.push([l, i]);
      if (isObject(doc.limitProfile)) owners.push(["limitProfile"]);
      const owner = pick(owners)!;
      const key = ["colour", "lengthM", "Id", "voltage_V", "__proto__x", "x".repeat(300)][m.b % 6];
      const path = [...owner, key];
      let at: any = doc;
      for (const part of owner) at = at[part];
      at[key] = m.junk === undefined ? 1 : m.junk;
      return strict(path, `add ${formatPath(path)}`);
    }
    case "dangling": {
      const f = pick(fields.filter((x) => REFS.has(x.key) && typeof x.value === "string" && x.list !== "sourceVoltages" && x.list !== "sourceCurrents"));
      if (!f) return loose("no reference");
      setAt(doc, f.path, "ghost-point");
      return strict(f.path, `${formatPath(f.path)} → ghost-point`);
    }
    case "duplicateId": {
      const list = pick(lists.filter((l) => entitiesOf(doc, l).length >= 2));
      if (!list) return loose("no list with two entries");
      const entities = entitiesOf(doc, list);
      const i = entities[m.a % entities.length];
      let j = entities[m.b % entities.length];
      if (j === i) j = entities[(entities.indexOf(i) + 1) % entities.length];
      doc[list][Math.max(i, j)].id = doc[list][Math.min(i, j)].id;
      return strict([list, Math.max(i, j), "id"], `${list}[${Math.max(i, j)}].id duplicates ${list}[${Math.min(i, j)}].id`);
    }
    case "zeroLength": {
      const i = pick(runs);
      if (i === undefined) return loose("no run");
      const v = [0, -0, -1, 1e-4, 5e-324][m.b % 5];
      doc.runs[i].length = v;
      return strict(["runs", i, "length"], `runs[${i}].length = ${v}`);
    }
    case "sameEnds": {
      const i = pick(runs);
      if (i === undefined) return loose("no run");
      doc.runs[i].to = doc.runs[i].from;
      return strict(["runs", i, "to"], `runs[${i}].to = from`);
    }
    case "unknownSource": {
      const i = pick(entitiesOf(doc, "cases"));
      if (i === undefined) return loose("no case");
      const kase = doc.cases[i];
      const key = m.b % 2 ? "sourceVoltages" : "sourceCurrents";
      kase[key] = { ...(isObject(kase[key]) ? kase[key] : {}), "ghost-source": key === "sourceVoltages" ? 24 : 3 };
      return strict(["cases", i, key, "ghost-source"], `cases[${i}].${key}.ghost-source`);
    }
    case "deepNesting": {
      const kind = m.b % 2 ? "array" : "object";
      const f = pick(fields);
      const list = pick(lists);
      const path = f && m.b % 3 !== 0 ? f.path : list ? [list, entitiesOf(doc, list)[0], "nested"] : ["nested"];
      setAt(doc, path, nested(m.depth, kind));
      return strict(path, `${formatPath(path)} = ${kind} nested ${m.depth} deep`);
    }
    case "hugeArrayInField": {
      const f = pick(fields);
      if (!f) return loose("no field");
      setAt(doc, f.path, new Array(50_000).fill(m.b % 2 ? 0 : "x"));
      return strict(f.path, `${formatPath(f.path)} = array of 50,000`);
    }
    case "overLimit": {
      // Over the size budget: every entry valid on its own, the list too long.
      const which = (["points", "sources", "cases", "loads"] as const)[m.b % 4];
      if (which === "points") doc.points = Array.from({ length: 60_001 }, (_, i) => ({ id: `q${i}` }));
      else if (which === "sources") doc.sources = Array.from({ length: 51 }, (_, i) => ({ id: `s${i}`, type: "battery", point: "q0", voltage: 12 }));
      else if (which === "cases") doc.cases = Array.from({ length: 21 }, (_, i) => ({ name: `c${i}` }));
      else doc.loads = Array.from({ length: 60_001 }, (_, i) => ({ id: `l${i}`, point: "q0", model: "constantCurrent", amps: 1 }));
      return strict([which], `${which} over the limit`);
    }
    case "textLength": {
      const i = pick(runs);
      if (i === undefined) return loose("no run");
      if (options.textLengthsResolved) {
        // Text the converter cannot read as a length.
        const v = ["banana", "12 kg", "1e400 m", "NaN", "m", "((((", "-"][m.b % 7];
        doc.runs[i].length = v;
        return strict(["runs", i, "length"], `runs[${i}].length = ${JSON.stringify(v)}`);
      }
      doc.runs[i].length = ["40 m", "130 ft", "12"][m.b % 3];
      return strict(["runs", i, "length"], `runs[${i}].length = text (not converted)`);
    }
    case "extremeValue": {
      const f = pick(fields.filter((x) => typeof x.value === "number" && (EXTREME_NUMBERS[x.key] || x.list === "sourceVoltages" || x.list === "sourceCurrents")));
      if (!f) return loose("no numeric field");
      const options = f.list === "sourceVoltages" ? [5e-324, 2000] : f.list === "sourceCurrents" ? [5e-324, 1e5] : EXTREME_NUMBERS[f.key];
      const v = options[m.b % options.length];
      setAt(doc, f.path, v);
      return loose(`${formatPath(f.path)} = ${v}`);
    }
    case "randomDouble": {
      const f = pick(fields.filter((x) => typeof x.value === "number"));
      if (!f) return loose("no numeric field");
      setAt(doc, f.path, m.double);
      return loose(`${formatPath(f.path)} = ${m.double}`);
    }
    case "junkAnywhere": {
      const f = pick(fields);
      if (!f) return loose("no field");
      setAt(doc, f.path, m.junk);
      return loose(`${formatPath(f.path)} = junk`);
    }
    case "deleteAny": {
      const f = pick(fields);
      if (!f) return loose("no field");
      delete f.entity[f.key];
      return loose(`delete ${formatPath(f.path)}`);
    }
    case "hugeList": {
      const which = (["points", "runs", "loads", "name"] as const)[m.b % 4];
      const n = 50_000;
      if (which === "points") doc.points = Array.from({ length: n }, (_, i) => ({ id: `h${i}` }));
      else if (which === "runs") doc.runs = Array.from({ length: n }, (_, i) => ({ id: `h${i}`, from: `h${i}`, to: `h${i + 1}`, length: 1, size: "10 AWG" }));
      else if (which === "loads") doc.loads = Array.from({ length: n }, (_, i) => ({ id: `h${i}`, point: "ghost", model: "constantPower", watts: i }));
      else doc.name = "x".repeat(n);
      return loose(`${which}: 50,000 entries`);
    }
    case "shuffle": {
      const list = pick(lists);
      if (!list) return loose("no list");
      (doc[list] as unknown[]).reverse();
      return loose(`${list} reversed`);
    }
  }
}

export type FuzzCase =
  | { kind: "valid"; doc: Doc; applied: Applied[] }
  | { kind: "near-valid"; doc: Doc; applied: Applied[] }
  /** Valid by the schema, with numbers at its bounds (5e-324 Ω, 1e5 m, a load factor of 100). */
  | { kind: "extreme"; doc: Doc; applied: Applied[] }
  | { kind: "broken"; doc: unknown; applied: Applied[] };

/** One generated case (see the header): about 30 % valid, 40 % near-valid, 10 % extreme, 20 % broken. */
export function fuzzCase(options: ValidOptions & ApplyOptions = {}): fc.Arbitrary<FuzzCase> {
  const base = validDocument(options);
  // Mutations work on a copy: fast-check keeps generated values to shrink them.
  const valid = base.map((doc): FuzzCase => withDescription({ kind: "valid", doc: structuredClone(doc), applied: [] }));
  const nearValid = fc.tuple(base, fc.array(seedOf(STRICT_OPS), { minLength: 1, maxLength: 3 })).map(([original, seeds]): FuzzCase => {
    const doc = structuredClone(original);
    const applied = seeds.map((s) => applyMutation(doc, s, options));
    return withDescription({ kind: applied.some((a) => a.target) ? "near-valid" : "valid", doc, applied });
  });
  const extreme = fc.tuple(base, fc.array(seedOf(["extremeValue"]), { minLength: 1, maxLength: 3 })).map(([original, seeds]): FuzzCase => {
    const doc = structuredClone(original);
    return withDescription({ kind: "extreme", doc, applied: seeds.map((s) => applyMutation(doc, s, options)) });
  });
  const broken = fc.oneof(
    {
      weight: 4,
      arbitrary: fc.tuple(base, fc.array(seedOf([...STRICT_OPS, ...LOOSE_OPS, ...LOOSE_OPS]), { minLength: 2, maxLength: 6 })).map(([original, seeds]): FuzzCase => {
        const doc = structuredClone(original);
        return withDescription({ kind: "broken", doc, applied: seeds.map((s) => applyMutation(doc, s, options)) });
      }),
    },
    { weight: 1, arbitrary: junk.map((doc): FuzzCase => withDescription({ kind: "broken", doc, applied: [{ op: "junkAnywhere", note: "the whole document is junk" }] })) },
  );
  return fc.oneof({ weight: 30, arbitrary: valid }, { weight: 40, arbitrary: nearValid }, { weight: 10, arbitrary: extreme }, { weight: 20, arbitrary: broken });
}

/** fast-check prints a case with this (a value nested 10,000 deep would overflow its printer). */
function withDescription(c: FuzzCase): FuzzCase {
  Object.defineProperty(c, fc.toStringMethod, { value: () => describeCase(c), enumerable: false });
  return c;
}

/** Does an error at `errPath` name the mutated field `target`: the field itself, a field inside
 *  it, or another field of the same entity ("loads[3].ohms" for a deleted "loads[3].watts"). */
export function names(errPath: string | undefined, target: string): boolean {
  if (!errPath) return false;
  if (errPath === target || errPath.startsWith(`${target}.`) || errPath.startsWith(`${target}[`)) return true;
  const entity = (p: string) => /^[A-Za-z]+(\[\d+\])?/.exec(p)?.[0];
  const e = entity(target);
  return e !== undefined && e.includes("[") && entity(errPath) === e;
}

// ---------------------------------------------------------------------------------------------
// Large networks (the work budget)

export type Shape = "grid" | "dense" | "chain" | "star";
export interface BigSpec { shape: Shape; size: number; watts: number; cases: number; cp: boolean }

/** A network of up to about 1 MB of JSON (what the API accepts): a grid of runs, points joined
 *  at random, a daisy chain, or a star; constant-power (possibly collapsing) or constant-current
 *  loads at every point; up to 20 cases. */
export function bigNetwork(s: BigSpec): Doc {
  const points: Doc[] = [];
  const runs: Doc[] = [];
  const loads: Doc[] = [];
  const run = (a: string, b: string) => runs.push({ id: `r${runs.length}`, from: a, to: b, length: 1, size: "2.5 mm2" });
  if (s.shape === "grid") {
    const k = Math.max(2, Math.round(Math.sqrt(s.size)));
    for (let i = 0; i < k; i++) for (let j = 0; j < k; j++) {
      points.push({ id: `g${i}.${j}` });
      if (i > 0) run(`g${i - 1}.${j}`, `g${i}.${j}`);
      if (j > 0) run(`g${i}.${j - 1}`, `g${i}.${j}`);
    }
  } else {
    for (let i = 0; i < s.size; i++) points.push({ id: `p${i}` });
    for (let i = 1; i < s.size; i++) run(s.shape === "star" ? "p0" : `p${i - 1}`, `p${i}`);
    if (s.shape === "dense") {
      // Runs between pseudo-random pairs (seeded: the document depends on the spec only).
      const random = mulberry32(s.size);
      for (let k = 0; k < 7 * s.size; k++) {
        const a = Math.floor(random() * s.size);
        const b = Math.floor(random() * s.size);
        if (a !== b) run(`p${a}`, `p${b}`);
      }
    }
  }
  points.slice(1).forEach((p, i) => loads.push(s.cp ? { id: `l${i}`, point: p.id, model: "constantPower", watts: s.watts } : { id: `l${i}`, point: p.id, model: "constantCurrent", amps: s.watts / 24 }));
  const doc: Doc = {
    format: "runwright-system/1", units: "metric", nominalVoltage: 24, points,
    sources: [{ id: "bank", type: "battery", point: points[0].id, voltage: 25.6, internalResistanceOhm: 0.005 }],
    runs, loads,
  };
  if (s.cases > 1) doc.cases = Array.from({ length: s.cases }, (_, i) => ({ name: `case ${i}`, loadFactor: 1 - i / 40, conductorTemperatureC: 20 + 3 * i }));
  return doc;
}

// ---------------------------------------------------------------------------------------------
// Checking an answer

export const ENGINE_CODES = [
  "INVALID_FIELD", "TOO_LARGE", "DUPLICATE_ID", "UNKNOWN_POINT", "UNKNOWN_SOURCE", "UNKNOWN_SIZE", "UNKNOWN_CASE",
  "ZERO_LENGTH_RUN", "RUN_ENDS_SAME_POINT", "NO_SOURCE", "FLOATING_POINT", "SHORTED_SOURCE", "PARALLEL_IDEAL_SOURCES",
  "VOLTAGE_COLLAPSE", "ILL_CONDITIONED",
];
/** What a document the schema and the references accept may still fail with when solved. */
export const SOLVE_CODES = ["VOLTAGE_COLLAPSE", "PARALLEL_IDEAL_SOURCES", "FLOATING_POINT", "ILL_CONDITIONED"];
/** Errors about one field: they carry its path, and the message starts with it. */
const FIELD_CODES = new Set(["INVALID_FIELD", "DUPLICATE_ID", "UNKNOWN_POINT", "UNKNOWN_SOURCE", "UNKNOWN_SIZE", "ZERO_LENGTH_RUN", "RUN_ENDS_SAME_POINT"]);
/** The only fields of a successful result that may be null (no value rather than a number). */
const NULLABLE = new Set(["faultCurrentA", "ampacityA", "utilizationPercent"]);
/** Longest message we accept: messages quote ids and paths, never a whole value. */
export const MAX_MESSAGE = 4000;

/** The first component of a path and its index: "runs[2]" of "runs[2].size". */
const entityOf = (p: string) => /^[^.[]+(\[\d+\])?/.exec(p)?.[0] ?? p;

/**
 * Problems with the engine's answer to a case (empty: fine). `json`: the answer went through
 * JSON (NaN and ±Infinity would have become null there, so a null in a number's place counts).
 */
export function problemsWith(result: unknown, c: FuzzCase, json = false): string[] {
  const out: string[] = [];
  if (!result || typeof result !== "object") return [`not an object: ${String(result)}`];
  const r = result as Record<string, any>;
  if (typeof r.ok !== "boolean") out.push(`ok is ${typeof r.ok}`);
  if (!Array.isArray(r.cautions) || r.cautions.length !== 3) out.push("cautions missing");
  if (r.ok === false) {
    if (!Array.isArray(r.errors) || r.errors.length === 0) return [...out, "ok: false without errors"];
    for (const e of r.errors.slice(0, 200)) {
      if (!ENGINE_CODES.includes(e.code)) out.push(`unknown code ${e.code}`);
      if (typeof e.message !== "string" || e.message.length === 0 || e.message.length > MAX_MESSAGE) out.push(`bad message for ${e.code}: ${String(e.message).slice(0, 100)}`);
      if (FIELD_CODES.has(e.code)) {
        if (typeof e.path !== "string" || e.path.length === 0) out.push(`${e.code} without a path: ${e.message}`);
        else if (!e.message.startsWith(entityOf(e.path))) out.push(`${e.code} message does not name ${e.path}: ${e.message.slice(0, 200)}`);
      }
    }
    const codes: string[] = r.errors.map((e: { code: string }) => e.code);
    if (c.kind === "valid" && !codes.every((code) => SOLVE_CODES.includes(code))) {
      out.push(`a valid document was refused: ${JSON.stringify(r.errors.slice(0, 3)).slice(0, 600)}`);
    }
    if (c.kind === "near-valid") {
      const targets = c.applied.flatMap((a) => (a.target ? [a.target] : []));
      const named = targets.some((t) => r.errors.some((e: { path?: string }) => names(e.path, t)));
      if (!named) out.push(`no error names ${targets.join(" or ")}: ${JSON.stringify(r.errors.slice(0, 3)).slice(0, 600)}`);
    }
    return out;
  }
  if (r.ok !== true) return out;
  if (c.kind === "near-valid") out.push(`a document with ${c.applied.map((a) => a.note).join("; ")} was solved`);
  const doc = c.doc as Doc;
  const expectedCases = Array.isArray(doc.cases) && doc.cases.length > 0 ? doc.cases.length : 1;
  if (!Array.isArray(r.cases) || r.cases.length !== expectedCases) out.push(`${r.cases?.length} cases, expected ${expectedCases}`);
  for (const cr of r.cases ?? []) {
    for (const list of ["points", "runs", "loads", "sources"]) {
      const ids = (cr[list] ?? []).map((x: { id: string }) => x.id);
      const want = (doc[list] ?? []).map((x: { id: string }) => x.id);
      if (ids.join("\u0000") !== want.join("\u0000")) out.push(`case ${cr.name}: ${list} ids differ from the document's`);
    }
    for (const l of cr.loads ?? []) if (!["within", "near", "over"].includes(l.status)) out.push(`status ${l.status}`);
  }
  if (!Array.isArray(r.loads) || r.loads.length !== (doc.loads?.length ?? 0)) out.push("worst-case loads missing");
  for (const f of r.findings ?? []) {
    if (!["error", "warning", "info"].includes(f.severity) || typeof f.message !== "string" || !Array.isArray(f.ids)) out.push(`bad finding ${JSON.stringify(f).slice(0, 200)}`);
  }
  // Every number finite; null only where the contract allows it.
  const stack: [unknown, string][] = [[r, ""]];
  let bad = 0;
  while (stack.length > 0 && bad < 5) {
    const [v, key] = stack.pop()!;
    if (typeof v === "number" && !Number.isFinite(v)) { out.push(`${key} = ${v}`); bad++; }
    else if (v === null && !NULLABLE.has(key)) { out.push(`${key} is null${json ? " (NaN or Infinity before JSON)" : ""}`); bad++; }
    else if (Array.isArray(v)) for (const x of v) stack.push([x, key]);
    else if (v && typeof v === "object") for (const [k, x] of Object.entries(v)) stack.push([x, k]);
  }
  return out;
}

/** A short description for fast-check's counterexample (the document may be 10,000 deep). */
export function describeCase(c: FuzzCase): string {
  let text: string;
  try {
    text = JSON.stringify(c.doc, (_k, v) => {
      if (v && typeof v === "object" && NESTED_VALUES.has(v)) return `(${NESTED_VALUES.get(v)!.kind} nested ${NESTED_VALUES.get(v)!.depth} deep)`;
      if (Array.isArray(v) && v.length > 20) return `(array of ${v.length})`;
      return typeof v === "number" && !Number.isFinite(v) ? String(v) : v;
    });
  } catch {
    text = "(too deep to print)";
  }
  return `${c.kind}: ${c.applied.map((a) => a.note).join("; ") || "no mutation"}\n${text.slice(0, 1500)}`;
}
