// The network file format, version 1 ("runwright-system/1"): one schema for the API, the
// client, the command line and the tests. Unknown fields are rejected; optional fields take the
// defaults written here (and in the README's engine section).
import { z } from "zod";

export const SYSTEM_FORMAT = "runwright-system/1";

/** Size budget: a system larger than this is refused with TOO_LARGE before any solving. */
export const SYSTEM_LIMITS = {
  points: 60_000,
  runs: 60_000,
  loads: 60_000,
  sources: 50,
  cases: 20,
  idLength: 80,
  nameLength: 200,
  /** Shortest run, in the system's units (m or ft): anything shorter is a typing error, and a
   *  length like 5e-324 makes the conductor's resistance underflow to exactly 0 Ω. */
  minRunLength: 0.001,
  /** Work budget of one solve (all its cases), in the circuit solver's work units (see
   *  PreparedCircuit.factorWork in circuit.ts): what a solve may spend before it is stopped with
   *  TOO_LARGE instead of running on. Units are counted, not timed, so the answer does not depend
   *  on the machine or its load; on the project machine (2 cores, load average 8) a unit of
   *  factorization work took 6–10 ns. The size limits above do not bound the time by themselves:
   *  a 60 × 60 grid of runs (800 kB of JSON) whose constant-power loads collapse took 14 s in one
   *  case and 177 s in 20 (the collapse search refactors the matrix about 125 times per case), and
   *  1,000 points joined by 8,000 runs at random 19 s. This default (the command line, the tests)
   *  is about 4 × what the benchmark's 100 × 100 mesh needs (5.2e8); the API passes the tighter
   *  API_WORK_LIMITS. Building the results (linear in the points, runs and loads, per case) is not
   *  counted: the size limits bound it. */
  solveWork: 2e9,
  /** Budget of the minimum-degree ordering of one network (Σ degree² of the eliminated points;
   *  about 50 ns a unit with the machine loaded): the benchmark's 100 × 100 mesh needs 1.5e7,
   *  1,000 points joined by 8,000 random runs 8.7e7 (4.9 s). */
  orderingWork: 1e8,
} as const;

/** The tighter budgets of a solve through the API (system.service.ts solveDocument), which runs on
 *  the server's event loop and must answer within seconds: with them the networks above are
 *  refused with TOO_LARGE after 0.6–0.9 s on the loaded project machine. What a 1 MB request can
 *  hold that is realistic stays well inside: 2,000 constant-power fixtures in 20 cases, a 60 × 60
 *  grid of runs with resistive loads (7.3e7; ordering 2.2e6). */
export const API_WORK_LIMITS = { workLimit: 4e8, orderingWorkLimit: 2e7 } as const;

/**
 * zod runs length checks (min/max of strings and arrays) on any value that has a `length`, even
 * after its type check failed, and compares that length with `>=`: a JSON object such as
 * {"length": {"valueOf": 0, "toString": 0}} in place of an id then made the comparison throw
 * ("Cannot convert object to primitive value") instead of reporting the field. Every length check
 * of this format runs on strings (or arrays) only.
 */
const onString = (payload: { value: unknown }) => typeof payload.value === "string";
const onArray = (payload: { value: unknown }) => Array.isArray(payload.value);
/** Parameters of a length check that runs only on strings (or arrays). `when` is a field of every
 *  zod check's definition (documented for refinements); the classic API's parameter types leave
 *  it out for length checks, hence the cast. */
export const onlyOnStrings = (error: string) => ({ error, when: onString }) as { error: string };
export const onlyOnArrays = (error: string) => ({ error, when: onArray }) as { error: string };
const text = (min: number, max: number) =>
  z.string().min(min, onlyOnStrings(min === 1 ? "must not be empty" : `must be at least ${min} characters`)).max(max, onlyOnStrings(`must be at most ${max} characters`));

const tooMany = (max: number, what: string) => `must have at most ${max.toLocaleString("en-US")} ${what} per system; split the network into several systems`;
/** Source id → value: no more entries than a system may have sources. */
const perSource = <T extends z.ZodType<number>>(value: T) =>
  z.record(z.string(), value).refine((r) => Object.keys(r).length <= SYSTEM_LIMITS.sources, `must have at most ${SYSTEM_LIMITS.sources} entries (one per source)`);

const id = text(1, SYSTEM_LIMITS.idLength)
  .regex(/^[A-Za-z0-9_.:\-]+$/, "may contain only letters, digits and _ . : -");
const name = z.string().max(SYSTEM_LIMITS.nameLength, onlyOnStrings(`must be at most ${SYSTEM_LIMITS.nameLength} characters`)).optional();
// zod's number() already refuses NaN and ±Infinity; built-in checks are much faster than
// refinements, which matters at 60,000 runs.
const finite = z.number({ error: "must be a finite number" });
/** Bounded: anything outside these is a typing error, not a DC installation (and would overflow
 *  the arithmetic). */
const upTo = (schema: z.ZodNumber, max: number, unit: string) => schema.max(max, `must be at most ${max} ${unit}`);
const positive = z.number({ error: "must be a finite number" }).positive("must be greater than 0");
const nonNegative = z.number({ error: "must be a finite number" }).nonnegative("must be 0 or more");

/** One-way length: a number in the system's units (m or ft), or text with a unit ("130 ft"). */
export const lengthValue = z.union([upTo(z.number({ error: "must be a finite number" }), 1e5, "m or ft"), text(1, 40)]);

export const pointSchema = z.strictObject({
  id,
  name,
  /** Interrupting rating (A) of the fuse or breaker that protects this point, if any. */
  fuseInterruptingA: upTo(positive, 1e6, "A").optional(),
});

const sourceCommon = {
  id,
  name,
  point: id,
  /** Marks the source whose terminal voltage is the reference for drop %. Default: the first. */
  primary: z.boolean().optional(),
};
export const sourceSchema = z.discriminatedUnion("type", [
  z.strictObject({
    ...sourceCommon,
    type: z.enum(["battery", "supply"]),
    voltage: upTo(positive, 2000, "V"),
    /** Ω; 0 (the default) is an ideal source. */
    internalResistanceOhm: upTo(nonNegative, 1000, "Ω").default(0),
  }),
  z.strictObject({
    ...sourceCommon,
    type: z.literal("pvArray"),
    /** Current at the maximum power point, A. */
    currentA: upTo(nonNegative, 1e5, "A"),
    /** Voltage at the maximum power point, V (informational). */
    voltage: upTo(positive, 2000, "V").optional(),
  }),
]);

export const runSchema = z.strictObject({
  id,
  name,
  from: id,
  to: id,
  length: lengthValue,
  size: text(1, 40),
  material: z.enum(["copper", "aluminum"]).default("copper"),
  parallel: z.number().int("must be a whole number").min(1, "must be at least 1").max(20, "must be at most 20").default(1),
  /** Size of the − conductor when it differs from the + conductor. */
  returnSize: text(1, 40).optional(),
  stranding: z.enum(["class5", "class2"]).default("class5"),
  insulationC: z.literal([60, 75, 90], { error: "must be 60, 75 or 90 (°C)" }).default(75),
  fuseA: upTo(positive, 1e5, "A").optional(),
  fuseInterruptingA: upTo(positive, 1e6, "A").optional(),
  /** feeder runs bring power to a distribution point; branch runs (the default) feed loads. */
  kind: z.enum(["feeder", "branch"]).default("branch"),
  /** Auto-size leaves a locked run at its size. */
  locked: z.boolean().optional(),
});

const loadCommon = {
  id,
  name,
  point: id,
  critical: z.boolean().default(false),
  /** Lowest voltage at which the load works, V. */
  minVoltage: upTo(positive, 2000, "V").optional(),
};
export const loadSchema = z.discriminatedUnion("model", [
  z.strictObject({
    ...loadCommon,
    model: z.literal("constantResistance"),
    ohms: upTo(nonNegative, 1e9, "Ω").optional(),
    /** Power at nominal voltage (the resistance is V²/P). */
    watts: upTo(positive, 1e7, "W").optional(),
  }).refine((l) => (l.ohms === undefined) !== (l.watts === undefined), {
    message: "give either ohms or watts",
    path: ["ohms"],
  }),
  z.strictObject({ ...loadCommon, model: z.literal("constantCurrent"), amps: upTo(nonNegative, 1e5, "A") }),
  z.strictObject({ ...loadCommon, model: z.literal("constantPower"), watts: upTo(nonNegative, 1e7, "W") }),
]);

export const caseSchema = z.strictObject({
  name: text(1, SYSTEM_LIMITS.nameLength),
  /** Source id → voltage (battery/supply) in this case. */
  sourceVoltages: perSource(upTo(positive, 2000, "V")).optional(),
  /** Source id → current (pvArray) in this case. */
  sourceCurrents: perSource(upTo(nonNegative, 1e5, "A")).optional(),
  conductorTemperatureC: z.number({ error: "must be a finite number" }).min(-50, "must be between −50 and 150 °C").max(150, "must be between −50 and 150 °C").optional(),
  /** Multiplies every load's demand (W, A, or conductance). */
  loadFactor: upTo(nonNegative, 100, "×").default(1),
});

export const limitProfileSchema = z.strictObject({
  name,
  branchPercent: upTo(positive, 100, "%").default(3),
  totalPercent: upTo(positive, 100, "%").default(5),
  criticalPercent: upTo(positive, 100, "%").default(3),
  nearFraction: z.number({ error: "must be a finite number" }).gt(0, "must be between 0 and 1").lt(1, "must be between 0 and 1").default(0.8),
});

export const systemSchema = z.strictObject({
  format: z.literal(SYSTEM_FORMAT),
  name,
  units: z.enum(["metric", "imperial"]),
  nominalVoltage: z.number({ error: "must be a finite number" }).min(1, "must be at least 1 V").max(2000, "must be at most 2000 V"),
  /** Conductor temperature for resistance, °C, unless a case says otherwise. Default 75 °C. */
  conductorTemperatureC: z.number({ error: "must be a finite number" }).min(-50, "must be between −50 and 150 °C").max(150, "must be between −50 and 150 °C").default(75),
  points: z.array(pointSchema).max(SYSTEM_LIMITS.points, onlyOnArrays(tooMany(SYSTEM_LIMITS.points, "points"))),
  sources: z.array(sourceSchema).max(SYSTEM_LIMITS.sources, onlyOnArrays(tooMany(SYSTEM_LIMITS.sources, "sources"))),
  runs: z.array(runSchema).max(SYSTEM_LIMITS.runs, onlyOnArrays(tooMany(SYSTEM_LIMITS.runs, "runs"))),
  loads: z.array(loadSchema).max(SYSTEM_LIMITS.loads, onlyOnArrays(tooMany(SYSTEM_LIMITS.loads, "loads"))),
  cases: z.array(caseSchema).min(1, onlyOnArrays("give at least one case, or leave cases out")).max(SYSTEM_LIMITS.cases, onlyOnArrays(tooMany(SYSTEM_LIMITS.cases, "cases"))).optional(),
  limitProfile: limitProfileSchema.optional(),
});

export type SystemInput = z.input<typeof systemSchema>;
export type System = z.output<typeof systemSchema>;
export type Run = System["runs"][number];
export type Load = System["loads"][number];
export type Source = System["sources"][number];
export type Point = System["points"][number];
export type Case = z.output<typeof caseSchema>;
export type LimitProfile = z.output<typeof limitProfileSchema>;

export const DEFAULT_LIMIT_PROFILE: LimitProfile = limitProfileSchema.parse({
  name: "General — 3 % branch, 5 % total (NFPA 70 210.19(A) / 215.2 informational notes)",
});
