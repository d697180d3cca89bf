// The API contract of clients, jobs, systems, limit profiles and attachments: request bodies the
// server validates and the answers the client parses. One file so both sides agree.
import { z } from "zod";
import { limitProfileSchema, systemSchema } from "../engine/schema.js";
import { emailSchema, withoutControlCharacters } from "./auth.js";

export const JobLimits = {
  clientNameMax: 200,
  titleMax: 200,
  addressMax: 500,
  notesMax: 5000,
  phoneMax: 40,
  systemNameMax: 120,
  profileNameMax: 120,
  pageSizeMax: 100,
  pageSizeDefault: 25,
  searchMax: 200,
  /** Attachments: bytes per file. */
  attachmentMaxBytes: 10 * 1024 * 1024,
  fileNameMax: 255,
  /** CSV of runs: bytes per upload. */
  csvMaxBytes: 2 * 1024 * 1024,
} as const;

const text = (field: string, max: number, { multiline = false } = {}) =>
  withoutControlCharacters(z.string({ error: `${field} must be text` }).trim().max(max, `${field} must be at most ${max} characters`), field, { multiline });
const requiredText = (field: string, max: number) =>
  withoutControlCharacters(
    z.string({ error: `${field} is required` }).trim().min(1, `${field} is required`).max(max, `${field} must be at most ${max} characters`),
    field,
  );
/** Optional text: "" and null both clear the field (stored as null). */
const optionalText = (field: string, max: number, multiline = false) =>
  text(field, max, { multiline })
    .transform((v) => (v === "" ? null : v))
    .nullable();
const optionalEmail = z
  .union([z.literal(""), emailSchema])
  .transform((v) => (v === "" ? null : v))
  .nullable();
const uuid = (field: string) => z.string({ error: `${field} is required` }).uuid(`${field} is not a valid id`);

// ---------------------------------------------------------------- paging

/** `?page=1&pageSize=25&sort=-updatedAt&search=…` on every list. `sort` is a field, "-" for descending. */
export function listQuery<const S extends readonly [string, ...string[]]>(sortFields: S, defaultSort: S[number] | `-${S[number]}`) {
  const sortValues = sortFields.flatMap((f) => [f, `-${f}`]) as [string, ...string[]];
  return z.strictObject({
    page: z.coerce.number({ error: "page must be a number" }).int("page must be a whole number").min(1, "page must be 1 or more").max(1_000_000, "page is too large").default(1),
    pageSize: z.coerce
      .number({ error: "pageSize must be a number" })
      .int("pageSize must be a whole number")
      .min(1, "pageSize must be 1 or more")
      .max(JobLimits.pageSizeMax, `pageSize must be at most ${JobLimits.pageSizeMax}`)
      .default(JobLimits.pageSizeDefault),
    sort: z.enum(sortValues, { error: `sort must be one of ${sortValues.join(", ")}` }).default(defaultSort),
    search: text("search", JobLimits.searchMax).optional(),
  });
}

export const pageOf = <T extends z.ZodType>(item: T) =>
  z.object({ items: z.array(item), total: z.number().int(), page: z.number().int(), pageSize: z.number().int() });

// ---------------------------------------------------------------- clients

export const ClientSchema = z.object({
  id: z.string(),
  name: z.string(),
  email: z.string().nullable(),
  phone: z.string().nullable(),
  billingAddress: z.string().nullable(),
  notes: z.string().nullable(),
  jobCount: z.number().int(),
  createdAt: z.string(),
  updatedAt: z.string(),
});
export type Client = z.infer<typeof ClientSchema>;
export const ClientPage = pageOf(ClientSchema);

const clientFields = {
  name: requiredText("name", JobLimits.clientNameMax),
  email: optionalEmail,
  phone: optionalText("phone", JobLimits.phoneMax),
  billingAddress: optionalText("billing address", JobLimits.addressMax, true),
  notes: optionalText("notes", JobLimits.notesMax, true),
};
export const CreateClientInput = z.strictObject({
  name: clientFields.name,
  email: clientFields.email.optional(),
  phone: clientFields.phone.optional(),
  billingAddress: clientFields.billingAddress.optional(),
  notes: clientFields.notes.optional(),
});
export type CreateClientInput = z.input<typeof CreateClientInput>;
export const UpdateClientInput = z.strictObject(clientFields).partial();
export type UpdateClientInput = z.input<typeof UpdateClientInput>;
export const ClientListQuery = listQuery(["name", "createdAt", "updatedAt"], "name");

// ---------------------------------------------------------------- jobs

export const JOB_STATUSES = ["lead", "quoted", "won", "lost", "installed"] as const;
export const JobStatus = z.enum(JOB_STATUSES, { error: `status must be one of ${JOB_STATUSES.join(", ")}` });
export type JobStatus = z.infer<typeof JobStatus>;

export const LOAD_STATUSES = ["within", "near", "over"] as const;

/** A job in the list, with its worst load over every saved system (null until solved). */
export const JobSummarySchema = z.object({
  id: z.string(),
  title: z.string(),
  status: JobStatus,
  siteAddress: z.string().nullable(),
  client: z.object({ id: z.string(), name: z.string() }),
  systemCount: z.number().int(),
  /** Worst load status over the job's systems at their last save; null when none solved. */
  worstStatus: z.enum(LOAD_STATUSES).nullable(),
  createdAt: z.string(),
  updatedAt: z.string(),
});
export type JobSummary = z.infer<typeof JobSummarySchema>;
export const JobPage = pageOf(JobSummarySchema);

export const SystemSummarySchema = z.object({
  id: z.string(),
  name: z.string(),
  nominalVoltage: z.number(),
  units: z.enum(["metric", "imperial"]),
  limitProfileId: z.string().nullable(),
  loadCount: z.number().int(),
  runCount: z.number().int(),
  /** Summary of the solve at the last save: null when it could not be solved. */
  lastSolve: z
    .object({
      worstStatus: z.enum(LOAD_STATUSES).nullable(),
      worstDropPercent: z.number().nullable(),
      over: z.number().int(),
      near: z.number().int(),
      within: z.number().int(),
      errors: z.number().int(),
    })
    .nullable(),
  version: z.number().int(),
  updatedAt: z.string(),
});
export type SystemSummary = z.infer<typeof SystemSummarySchema>;

export const AttachmentSchema = z.object({
  id: z.string(),
  jobId: z.string(),
  fileName: z.string(),
  mediaType: z.enum(["image/jpeg", "image/png", "application/pdf"]),
  sizeBytes: z.number().int(),
  uploadedBy: z.object({ id: z.string(), name: z.string() }).nullable(),
  createdAt: z.string(),
  /** GET this for the bytes (add `?download=1` for a save-as). */
  url: z.string(),
});
export type Attachment = z.infer<typeof AttachmentSchema>;
export const AttachmentPage = pageOf(AttachmentSchema);
export const AttachmentListQuery = listQuery(["fileName", "createdAt", "sizeBytes"], "-createdAt");

export const JobDetailSchema = JobSummarySchema.extend({
  notes: z.string().nullable(),
  createdBy: z.object({ id: z.string(), name: z.string() }).nullable(),
  systems: z.array(SystemSummarySchema),
  attachments: z.array(AttachmentSchema),
});
export type JobDetail = z.infer<typeof JobDetailSchema>;

const jobFields = {
  clientId: uuid("client"),
  title: requiredText("title", JobLimits.titleMax),
  siteAddress: optionalText("site address", JobLimits.addressMax, true),
  status: JobStatus,
  notes: optionalText("notes", JobLimits.notesMax, true),
};
export const CreateJobInput = z.strictObject({
  clientId: jobFields.clientId,
  title: jobFields.title,
  siteAddress: jobFields.siteAddress.optional(),
  status: jobFields.status.default("lead"),
  notes: jobFields.notes.optional(),
});
export type CreateJobInput = z.input<typeof CreateJobInput>;
export const UpdateJobInput = z.strictObject(jobFields).partial();
export type UpdateJobInput = z.input<typeof UpdateJobInput>;
export const JobListQuery = listQuery(["title", "status", "createdAt", "updatedAt", "client"], "-updatedAt").extend({
  status: JobStatus.optional(),
  clientId: uuid("client").optional(),
});
export type JobListQuery = z.input<typeof JobListQuery>;

// ---------------------------------------------------------------- limit profiles

export const LimitProfileSchema = z.object({
  id: z.string(),
  name: z.string(),
  branchPercent: z.number(),
  totalPercent: z.number(),
  criticalPercent: z.number(),
  /** "Near limit" starts at this fraction of the limit (0.8 = 80 %). */
  nearFraction: z.number(),
  notes: z.string().nullable(),
  /** Built-in profiles cite a published recommendation and cannot be changed (duplicate one instead). */
  builtIn: z.boolean(),
  systemCount: z.number().int(),
  updatedAt: z.string(),
});
export type LimitProfileRecord = z.infer<typeof LimitProfileSchema>;
export const LimitProfilePage = pageOf(LimitProfileSchema);
export const LimitProfileListQuery = listQuery(["name", "updatedAt"], "name");

/** At most three decimal places: the columns are numeric(…, 3), so nothing is rounded on save. */
const threeDecimals = (v: number) => Math.abs(v * 1000 - Math.round(v * 1000)) < 1e-6;
const limitPercent = (field: string) =>
  z
    .number({ error: `${field} must be a number` })
    .min(0.001, `${field} must be at least 0.001 %`)
    .max(100, `${field} must be at most 100 %`)
    .refine(threeDecimals, `${field} may have at most 3 decimal places`);
const profileFields = {
  name: requiredText("name", JobLimits.profileNameMax),
  branchPercent: limitPercent("branch limit"),
  totalPercent: limitPercent("total limit"),
  criticalPercent: limitPercent("critical limit"),
  nearFraction: z
    .number({ error: "near-limit threshold must be a number" })
    .min(0.001, "near-limit threshold must be between 0.001 and 0.999")
    .max(0.999, "near-limit threshold must be between 0.001 and 0.999")
    .refine(threeDecimals, "near-limit threshold may have at most 3 decimal places"),
  notes: optionalText("notes", JobLimits.notesMax, true),
};
export const CreateLimitProfileInput = z.strictObject({
  ...profileFields,
  nearFraction: profileFields.nearFraction.default(0.8),
  notes: profileFields.notes.optional(),
});
export type CreateLimitProfileInput = z.input<typeof CreateLimitProfileInput>;
export const UpdateLimitProfileInput = z.strictObject(profileFields).partial();

// ---------------------------------------------------------------- systems

/** The network document as stored: the shared network file format. */
export const SystemDocument = systemSchema;

export const SystemRecordSchema = z.object({
  id: z.string(),
  jobId: z.string(),
  name: z.string(),
  nominalVoltage: z.number(),
  units: z.enum(["metric", "imperial"]),
  limitProfileId: z.string().nullable(),
  /** The network file (runwright-system/1), as saved. */
  document: z.record(z.string(), z.unknown()),
  /** Send this back with PUT; a save by someone else in between answers 409. */
  version: z.number().int(),
  updatedAt: z.string(),
  updatedBy: z.object({ id: z.string(), name: z.string() }).nullable(),
});
export type SystemRecord = z.infer<typeof SystemRecordSchema>;

const systemName = requiredText("name", JobLimits.systemNameMax);
export const CreateSystemInput = z.strictObject({
  name: systemName,
  limitProfileId: uuid("limit profile").nullable().optional(),
  /** Starts from this network; without it, a nominal-voltage battery on one bus bar. */
  document: z.unknown().optional(),
  nominalVoltage: z.number({ error: "nominal voltage must be a number" }).min(1, "nominal voltage must be at least 1 V").max(2000, "nominal voltage must be at most 2000 V").default(24),
  units: z.enum(["metric", "imperial"], { error: "units must be metric or imperial" }).default("metric"),
});
export type CreateSystemInput = z.input<typeof CreateSystemInput>;

export const SaveSystemInput = z.strictObject({
  version: z.number({ error: "version is required (the version you loaded)" }).int("version must be a whole number").min(1, "version must be 1 or more"),
  name: systemName.optional(),
  limitProfileId: uuid("limit profile").nullable().optional(),
  document: z.unknown(),
});
export type SaveSystemInput = z.input<typeof SaveSystemInput>;

/** Details of the 409 a stale save gets. */
export const SystemConflictDetails = z.object({
  currentVersion: z.number().int(),
  updatedAt: z.string(),
  updatedBy: z.string().nullable(),
});

/** `POST /api/systems/:id/solve` and `/autosize`: the unsaved network from the editor, or the saved one when absent. */
export const SolveRequest = z.strictObject({
  document: z.unknown().optional(),
});
