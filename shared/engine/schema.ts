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
} as const;

const id = z
  .string()
  .min(1, "must not be empty")
  .max(SYSTEM_LIMITS.idLength, `must be at most ${SYSTEM_LIMITS.idLength} characters`)
  .regex(/^[A-Za-z0-9_.:\-]+$/, "may contain only letters, digits and _ . : -");
const name = z.string().max(SYSTEM_LIMITS.nameLength).optional();
// zod's number() already refuses NaN and ±Infinity; built-in checks are much faster than
// refinements, which matters at 60,000 runs.
const finite = z.number({ error: "must be a finite number" });
/** Bounded: anything outside these is a typing error, not a DC installation (and would overflow
 *  the arithmetic). */
const upTo = (schema: z.ZodNumber, max: number, unit: string) => schema.max(max, `must be at most ${max} ${unit}`);
const positive = z.number({ error: "must be a finite number" }).positive("must be greater than 0");
const nonNegative = z.number({ error: "must be a finite number" }).nonnegative("must be 0 or more");

/** One-way length: a number in the system's units (m or ft), or text with a unit ("130 ft"). */
export const lengthValue = z.union([upTo(z.number({ error: "must be a finite number" }), 1e5, "m or ft"), z.string().min(1).max(40)]);

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
  size: z.string().min(1).max(40),
  material: z.enum(["copper", "aluminum"]).default("copper"),
  parallel: z.number().int("must be a whole number").min(1, "must be at least 1").max(20, "must be at most 20").default(1),
  /** Size of the − conductor when it differs from the + conductor. */
  returnSize: z.string().min(1).max(40).optional(),
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
  name: z.string().min(1).max(SYSTEM_LIMITS.nameLength),
  /** Source id → voltage (battery/supply) in this case. */
  sourceVoltages: z.record(z.string(), upTo(positive, 2000, "V")).optional(),
  /** Source id → current (pvArray) in this case. */
  sourceCurrents: z.record(z.string(), upTo(nonNegative, 1e5, "A")).optional(),
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
  points: z.array(pointSchema),
  sources: z.array(sourceSchema),
  runs: z.array(runSchema),
  loads: z.array(loadSchema),
  cases: z.array(caseSchema).min(1, "give at least one case, or leave cases out").optional(),
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
