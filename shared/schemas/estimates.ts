// The API contract of the price list, estimates, quotes and the dashboard: request bodies the
// server validates and the answers the client parses. Money is always integer minor units
// (cents) in the company's currency; see shared/money.ts for the rounding rule.
import { z } from "zod";
import { normalizeSize } from "../engine/conductors.js";
import { MAX_MONEY_MINOR } from "../money.js";
import { withoutControlCharacters } from "./auth.js";
import { DepositTotalsSchema, PaymentSchema, PublicDepositSchema } from "./payments.js";

export const EstimateLimits = {
  skuMax: 40,
  descriptionMax: 200,
  priceItemsMax: 5000,
  manualLinesMax: 200,
  quantityMax: 1_000_000,
  termsMax: 10_000,
  reasonMax: 1000,
  acceptNameMax: 120,
  /** Price list CSV: bytes per upload. */
  csvMaxBytes: 2 * 1024 * 1024,
  /** Company logo: bytes, PNG or JPEG (pdfkit draws both). */
  logoMaxBytes: 512 * 1024,
  validDaysMax: 365,
} as const;

export const PRICE_CATEGORIES = ["cable", "fuse", "termination", "device", "labour", "other"] as const;
export const PriceCategory = z.enum(PRICE_CATEGORIES, { error: `category must be one of ${PRICE_CATEGORIES.join(", ")}` });
export type PriceCategory = z.infer<typeof PriceCategory>;

export const CATEGORY_LABELS: Record<PriceCategory, string> = {
  cable: "Cable",
  fuse: "Fuses and holders",
  termination: "Terminations",
  device: "Devices",
  labour: "Labour",
  other: "Other",
};

export const PRICE_UNITS = ["m", "ft", "each", "hour"] as const;
export const PriceUnit = z.enum(PRICE_UNITS, { error: `unit must be one of ${PRICE_UNITS.join(", ")}` });
export type PriceUnit = z.infer<typeof PriceUnit>;

const requiredText = (field: string, max: number) =>
  withoutControlCharacters(
    z.string({ error: `${field} is required` }).trim().min(1, `${field} is required`).max(max, `${field} must be at most ${max} characters`),
    field,
  );

const money = (field: string) =>
  z
    .number({ error: `${field} must be a number` })
    .int(`${field} must be a whole number of minor units (cents)`)
    .min(0, `${field} cannot be negative`)
    .max(MAX_MONEY_MINOR, `${field} is too large`);

const percent = (field: string, max: number) =>
  z
    .number({ error: `${field} must be a number` })
    .min(0, `${field} cannot be negative`)
    .max(max, `${field} must be at most ${max} %`)
    .refine((v) => Math.abs(v * 1000 - Math.round(v * 1000)) < 1e-6, `${field} may have at most 3 decimal places`);

const quantity = (field: string) =>
  z
    .number({ error: `${field} must be a number` })
    .min(0, `${field} cannot be negative`)
    .max(EstimateLimits.quantityMax, `${field} must be at most ${EstimateLimits.quantityMax}`)
    .refine((v) => Math.abs(v * 1000 - Math.round(v * 1000)) < 1e-6, `${field} may have at most 3 decimal places`);

// ---------------------------------------------------------------- price list

/** A cable size as people type it ("16", "6 AWG", "2/0", "250 kcmil", "16 mm²") → its label ("16 mm2"). */
export const cableSizeSchema = z
  .string({ error: "size must be text" })
  .trim()
  .min(1, "size is required for cable")
  .max(40, "size must be at most 40 characters")
  .transform((v, ctx) => {
    const label = normalizeSize(v, /^\d+(?:\.\d+)?$/.test(v.trim()) ? "metric" : undefined);
    if (!label) {
      ctx.addIssue({ code: "custom", message: `size "${v}" is not a conductor size (e.g. 16 mm2, 10 AWG, 2/0 AWG, 250 kcmil)` });
      return z.NEVER;
    }
    return label;
  });

export const PriceItemSchema = z.object({
  id: z.string(),
  sku: z.string(),
  description: z.string(),
  category: PriceCategory,
  unit: PriceUnit,
  unitCostMinor: z.number().int(),
  /** Sell price per unit; when set it replaces cost + markup on estimates. */
  sellPriceMinor: z.number().int().nullable(),
  /** Cable: conductor size label ("16 mm2"); terminations: the size they fit (null: any size). */
  cableSize: z.string().nullable(),
  cableMaterial: z.enum(["copper", "aluminum"]).nullable(),
  /** Cable: conductors in one cable (1 single, 2 twin/duplex). */
  conductors: z.number().int().nullable(),
  /** Fuses: rating in A. A fuse-category item without a rating is a fuse holder. */
  ratingA: z.number().nullable(),
  updatedAt: z.string(),
});
export type PriceItem = z.infer<typeof PriceItemSchema>;
export const PriceItemList = z.object({ items: z.array(PriceItemSchema), currency: z.string() });

const priceItemShape = {
  sku: withoutControlCharacters(
    z
      .string({ error: "SKU is required" })
      .trim()
      .min(1, "SKU is required")
      .max(EstimateLimits.skuMax, `SKU must be at most ${EstimateLimits.skuMax} characters`)
      .regex(/^[A-Za-z0-9][A-Za-z0-9._\-/ ]*$/, "SKU may contain letters, digits, spaces and . _ - /"),
    "SKU",
  ),
  description: requiredText("description", EstimateLimits.descriptionMax),
  category: PriceCategory,
  unit: PriceUnit,
  unitCostMinor: money("unit cost"),
  sellPriceMinor: money("sell price").nullable().default(null),
  cableSize: cableSizeSchema.nullable().default(null),
  cableMaterial: z.enum(["copper", "aluminum"], { error: "material must be copper or aluminum" }).nullable().default(null),
  conductors: z.number({ error: "conductors must be a number" }).int("conductors must be 1 or 2").min(1, "conductors must be 1 or 2").max(2, "conductors must be 1 or 2").nullable().default(null),
  ratingA: z.number({ error: "rating must be a number" }).positive("rating must be greater than 0").max(100_000, "rating must be at most 100000 A").nullable().default(null),
};

/** The rules that tie fields to the category; each issue names its field. */
function checkItem(item: { category: PriceCategory; unit: PriceUnit; cableSize: string | null; cableMaterial: string | null; conductors: number | null; ratingA: number | null }, ctx: z.RefinementCtx) {
  if (item.category === "cable") {
    if (!item.cableSize) ctx.addIssue({ code: "custom", path: ["cableSize"], message: "size is required for cable" });
    if (!item.cableMaterial) ctx.addIssue({ code: "custom", path: ["cableMaterial"], message: "material is required for cable" });
    if (item.unit !== "m" && item.unit !== "ft") ctx.addIssue({ code: "custom", path: ["unit"], message: "cable is sold by the m or the ft" });
  } else {
    if (item.cableMaterial) ctx.addIssue({ code: "custom", path: ["cableMaterial"], message: "material is only for cable" });
    if (item.conductors !== null) ctx.addIssue({ code: "custom", path: ["conductors"], message: "conductors is only for cable" });
    if (item.cableSize && item.category !== "termination") ctx.addIssue({ code: "custom", path: ["cableSize"], message: "size is only for cable and terminations" });
  }
  if (item.ratingA !== null && item.category !== "fuse") ctx.addIssue({ code: "custom", path: ["ratingA"], message: "rating is only for fuses" });
}

export const PriceItemInput = z.strictObject(priceItemShape).superRefine(checkItem);
export type PriceItemInput = z.input<typeof PriceItemInput>;
export type PriceItemValues = z.output<typeof PriceItemInput>;

/** One row the CSV import would write, and what it does to the list. */
export const PriceImportPreview = z.object({
  added: z.array(z.object({ sku: z.string(), description: z.string() })),
  changed: z.array(z.object({ sku: z.string(), description: z.string(), fields: z.array(z.string()) })),
  unchanged: z.number().int(),
  /** Set when the import was applied. */
  applied: z.boolean(),
});
export type PriceImportPreview = z.infer<typeof PriceImportPreview>;

// ---------------------------------------------------------------- company estimating settings

export const EstimatingSettingsSchema = z.object({
  /** Added to cable lengths for offcuts and routing, %. */
  wastePercent: z.number(),
  /** Labour: minutes per run (set-up, pulling), per metre of run, per termination. */
  labourMinutesPerRun: z.number(),
  labourMinutesPerMetre: z.number(),
  labourMinutesPerTermination: z.number(),
  quoteValidDays: z.number().int(),
  quoteTerms: z.string(),
  hasLogo: z.boolean(),
});
export type EstimatingSettings = z.infer<typeof EstimatingSettingsSchema>;

const minutes = (field: string) =>
  z
    .number({ error: `${field} must be a number` })
    .min(0, `${field} cannot be negative`)
    .max(10_000, `${field} must be at most 10000 minutes`)
    .refine((v) => Math.abs(v * 100 - Math.round(v * 100)) < 1e-6, `${field} may have at most 2 decimal places`);

export const UpdateEstimatingSettingsInput = z
  .strictObject({
    wastePercent: percent("waste", 100),
    labourMinutesPerRun: minutes("minutes per run"),
    labourMinutesPerMetre: minutes("minutes per metre"),
    labourMinutesPerTermination: minutes("minutes per termination"),
    quoteValidDays: z.number({ error: "validity must be a number" }).int("validity must be whole days").min(1, "validity must be at least 1 day").max(EstimateLimits.validDaysMax, `validity must be at most ${EstimateLimits.validDaysMax} days`),
    quoteTerms: withoutControlCharacters(z.string({ error: "terms must be text" }).trim().max(EstimateLimits.termsMax, `terms must be at most ${EstimateLimits.termsMax} characters`), "terms", { multiline: true }),
  })
  .partial();
export type UpdateEstimatingSettingsInput = z.input<typeof UpdateEstimatingSettingsInput>;

// ---------------------------------------------------------------- estimate

/** A line the bill of materials made from the layout. `key` is stable across regenerations. */
export const GeneratedLineSchema = z.object({
  key: z.string(),
  category: PriceCategory,
  description: z.string(),
  /** How the quantity was reached, e.g. "2 conductors × 40 m × 1 set + 10 % waste". */
  detail: z.string(),
  priceItemId: z.string().nullable(),
  sku: z.string().nullable(),
  quantity: z.number(),
  unit: PriceUnit,
  unitCostMinor: z.number().int(),
  sellPriceMinor: z.number().int().nullable(),
});
export type GeneratedLine = z.infer<typeof GeneratedLineSchema>;

export const ManualLineSchema = z.object({
  id: z.string(),
  category: PriceCategory,
  description: z.string(),
  quantity: z.number(),
  unit: PriceUnit,
  unitCostMinor: z.number().int(),
  markupPercent: z.number().nullable(),
});
export type ManualLine = z.infer<typeof ManualLineSchema>;

export const ManualLineInput = z.strictObject({
  id: z.string().uuid("line id is not a valid id").optional(),
  category: PriceCategory,
  description: requiredText("description", EstimateLimits.descriptionMax),
  quantity: quantity("quantity"),
  unit: PriceUnit,
  unitCostMinor: money("unit cost"),
  markupPercent: percent("markup", 1000).nullable().default(null),
});

/** What the estimator changed on a generated line; kept across regenerations by the line's key. */
export const LineOverrideSchema = z.strictObject({
  markupPercent: percent("markup", 1000).optional(),
  quantity: quantity("quantity").optional(),
});
export type LineOverride = z.infer<typeof LineOverrideSchema>;

/** A load the contractor supplies, priced from a device in the price list. */
export const SuppliedLoadSchema = z.strictObject({
  systemId: z.string().uuid("systemId is not a valid id"),
  loadId: z.string().min(1).max(80),
  priceItemId: z.string().uuid("priceItemId is not a valid id"),
});
export type SuppliedLoad = z.infer<typeof SuppliedLoadSchema>;

export const EstimateFindingSchema = z.object({
  code: z.enum(["MISSING_PRICE", "NO_LABOUR_RATE", "SYSTEM_NOT_SOLVED", "LAYOUT_CHANGED", "LOAD_OVER_LIMIT", "DISCOUNT_CAPPED", "AMOUNT_TOO_LARGE", "UNKNOWN_SUPPLIED_LOAD", "NO_SYSTEMS"]),
  severity: z.enum(["error", "warning"]),
  message: z.string(),
  /** For MISSING_PRICE: what to add to the price list (the client pre-fills the form from it). */
  need: z
    .object({ category: PriceCategory, unit: PriceUnit, cableSize: z.string().nullable(), cableMaterial: z.enum(["copper", "aluminum"]).nullable(), ratingA: z.number().nullable(), description: z.string() })
    .optional(),
});
export type EstimateFinding = z.infer<typeof EstimateFindingSchema>;

export const PricedLineSchema = z.object({
  key: z.string(),
  source: z.enum(["layout", "manual"]),
  category: PriceCategory,
  description: z.string(),
  detail: z.string(),
  sku: z.string().nullable(),
  quantity: z.number(),
  unit: PriceUnit,
  unitCostMinor: z.number().int(),
  /** The markup applied (null: the item's fixed sell price was used). */
  markupPercent: z.number().nullable(),
  costMinor: z.number().int(),
  sellMinor: z.number().int(),
  overridden: z.boolean(),
});
export type PricedLine = z.infer<typeof PricedLineSchema>;

export const DepositMode = z.enum(["percent", "fixed"], { error: "deposit mode must be percent or fixed" });

export const EstimateTotalsSchema = z.object({
  costMinor: z.number().int(),
  subtotalMinor: z.number().int(),
  discountMinor: z.number().int(),
  taxableMinor: z.number().int(),
  taxRatePercent: z.number(),
  taxMinor: z.number().int(),
  totalMinor: z.number().int(),
  depositMinor: z.number().int(),
  /** Sell minus cost, before discount. */
  marginMinor: z.number().int(),
});
export type EstimateTotals = z.infer<typeof EstimateTotalsSchema>;

export const EstimateSettingsSchema = z.object({
  markupPercent: z.number(),
  discountMinor: z.number().int(),
  taxRatePercent: z.number(),
  depositMode: DepositMode,
  depositPercent: z.number(),
  depositFixedMinor: z.number().int(),
  wastePercent: z.number(),
});
export type EstimateSettings = z.infer<typeof EstimateSettingsSchema>;

export const LineChangeSchema = z.object({
  key: z.string(),
  description: z.string(),
  change: z.enum(["added", "removed", "changed"]),
  before: z.object({ quantity: z.number(), unitCostMinor: z.number().int() }).nullable(),
  after: z.object({ quantity: z.number(), unitCostMinor: z.number().int() }).nullable(),
});
export type LineChange = z.infer<typeof LineChangeSchema>;

export const EstimateSchema = z.object({
  id: z.string(),
  jobId: z.string(),
  currency: z.string(),
  settings: EstimateSettingsSchema,
  generated: z.array(GeneratedLineSchema),
  manual: z.array(ManualLineSchema),
  overrides: z.record(z.string(), LineOverrideSchema),
  supplied: z.array(SuppliedLoadSchema),
  lines: z.array(PricedLineSchema),
  totals: EstimateTotalsSchema,
  findings: z.array(EstimateFindingSchema),
  /** The loads of the job's systems, for choosing which the contractor supplies. */
  loads: z.array(z.object({ systemId: z.string(), systemName: z.string(), loadId: z.string(), name: z.string() })),
  generatedAt: z.string().nullable(),
  /** What the last regeneration changed (empty when nothing did). */
  lastChanges: z.array(LineChangeSchema),
  version: z.number().int(),
  updatedAt: z.string(),
});
export type Estimate = z.infer<typeof EstimateSchema>;

/** `PUT /api/jobs/:jobId/estimate`: settings, manual lines, overrides, supplied loads; with the version read. */
export const SaveEstimateInput = z.strictObject({
  version: z.number({ error: "version is required" }).int(),
  markupPercent: percent("markup", 1000).optional(),
  discountMinor: money("discount").optional(),
  taxRatePercent: percent("tax rate", 100).optional(),
  depositMode: DepositMode.optional(),
  depositPercent: percent("deposit", 100).optional(),
  depositFixedMinor: money("deposit").optional(),
  wastePercent: percent("waste", 100).optional(),
  manual: z.array(ManualLineInput).max(EstimateLimits.manualLinesMax, `at most ${EstimateLimits.manualLinesMax} manual lines`).optional(),
  overrides: z.record(z.string().max(200), LineOverrideSchema).optional(),
  supplied: z
    .array(SuppliedLoadSchema)
    .max(5000)
    .refine((list) => new Set(list.map((s) => `${s.systemId}/${s.loadId}`)).size === list.length, "supplied: a load may be chosen once")
    .optional(),
});
export type SaveEstimateInput = z.input<typeof SaveEstimateInput>;

// ---------------------------------------------------------------- quotes

export const QUOTE_STATUSES = ["draft", "sent", "viewed", "accepted", "declined", "expired", "deposit paid"] as const;
export const QuoteStatus = z.enum(QUOTE_STATUSES);
export type QuoteStatus = z.infer<typeof QuoteStatus>;

export const SnapshotLoadSchema = z.object({
  id: z.string(),
  name: z.string(),
  worstCase: z.string(),
  voltage: z.number(),
  dropPercent: z.number(),
  limitPercent: z.number(),
  status: z.enum(["within", "near", "over"]),
});
export const SnapshotRunSchema = z.object({
  id: z.string(),
  name: z.string(),
  from: z.string(),
  to: z.string(),
  size: z.string(),
  returnSize: z.string().nullable(),
  material: z.enum(["copper", "aluminum"]),
  /** One-way length in the system's units. */
  length: z.number(),
  parallel: z.number().int(),
  fuseA: z.number().nullable(),
  /** Largest current over the cases, A. */
  maxCurrentA: z.number().nullable(),
  ampacityA: z.number().nullable(),
});
export const SnapshotSystemSchema = z.object({
  id: z.string(),
  name: z.string(),
  nominalVoltage: z.number(),
  units: z.enum(["metric", "imperial"]),
  limitProfile: z.object({ name: z.string(), branchPercent: z.number(), totalPercent: z.number(), criticalPercent: z.number() }),
  solved: z.boolean(),
  caseNames: z.array(z.string()),
  points: z.array(z.object({ id: z.string(), name: z.string() })),
  loads: z.array(SnapshotLoadSchema),
  runs: z.array(SnapshotRunSchema),
  /** Errors and warnings of the solve, as the engine worded them. */
  findings: z.array(z.object({ severity: z.string(), message: z.string() })),
  /** The network document as sent. */
  document: z.record(z.string(), z.unknown()),
});
export type SnapshotSystem = z.infer<typeof SnapshotSystemSchema>;

/** Everything a quote shows, frozen when the revision was made. */
export const QuoteSnapshotSchema = z.object({
  company: z.object({
    name: z.string(),
    licenceNumber: z.string().nullable(),
    contactEmail: z.string().nullable(),
    phone: z.string().nullable(),
    address: z.string().nullable(),
    /** PNG or JPEG as base64, or null. */
    logo: z.object({ mediaType: z.string(), base64: z.string() }).nullable(),
  }),
  client: z.object({ name: z.string(), email: z.string().nullable(), phone: z.string().nullable(), billingAddress: z.string().nullable() }),
  job: z.object({ id: z.string(), title: z.string(), siteAddress: z.string().nullable() }),
  currency: z.string(),
  number: z.string(),
  revision: z.number().int(),
  issuedAt: z.string(),
  validUntil: z.string(),
  terms: z.string(),
  scope: z.array(z.string()),
  lines: z.array(PricedLineSchema),
  totals: EstimateTotalsSchema,
  systems: z.array(SnapshotSystemSchema),
  cautions: z.array(z.string()),
  /** Waste % the cut list adds to each run's conductors. */
  wastePercent: z.number(),
});
export type QuoteSnapshot = z.infer<typeof QuoteSnapshotSchema>;

export const QuoteEventSchema = z.object({
  type: z.enum(["created", "sent", "send_pending", "send_failed", "viewed", "accepted", "declined", "expired", "link_revoked", "link_issued", "deposit_paid", "payment_flagged", "refunded"]),
  at: z.string(),
  actor: z.string().nullable(),
  detail: z.string().nullable(),
});

export const QuoteSummarySchema = z.object({
  id: z.string(),
  jobId: z.string(),
  jobTitle: z.string(),
  clientName: z.string(),
  number: z.string(),
  revision: z.number().int(),
  /** "Q-2026-0042 R2" */
  label: z.string(),
  status: QuoteStatus,
  superseded: z.boolean(),
  currency: z.string(),
  totalMinor: z.number().int(),
  depositMinor: z.number().int(),
  validUntil: z.string(),
  sentAt: z.string().nullable(),
  sentTo: z.string().nullable(),
  sentBy: z.string().nullable(),
  sendError: z.string().nullable(),
  /** When the mail server first refused it; a queued job keeps trying until sent or it gives up. */
  sendPendingSince: z.string().nullable(),
  viewedAt: z.string().nullable(),
  acceptedAt: z.string().nullable(),
  acceptedName: z.string().nullable(),
  declinedAt: z.string().nullable(),
  declineReason: z.string().nullable(),
  linkActive: z.boolean(),
  createdAt: z.string(),
});
export type QuoteSummary = z.infer<typeof QuoteSummarySchema>;
export const QuoteListSchema = z.object({ items: z.array(QuoteSummarySchema) });

export const QuoteDetailSchema = QuoteSummarySchema.extend({
  snapshot: QuoteSnapshotSchema,
  events: z.array(QuoteEventSchema),
  acceptedIp: z.string().nullable(),
  acceptedUserAgent: z.string().nullable(),
  payments: z.array(PaymentSchema),
});
export type QuoteDetail = z.infer<typeof QuoteDetailSchema>;

export const CreateQuoteInput = z.strictObject({
  validUntil: z.iso.date("valid-until must be a date (YYYY-MM-DD)").optional(),
  terms: withoutControlCharacters(z.string({ error: "terms must be text" }).trim().max(EstimateLimits.termsMax, `terms must be at most ${EstimateLimits.termsMax} characters`), "terms", { multiline: true }).optional(),
});

export const SendQuoteInput = z.strictObject({
  /** Defaults to the client's e-mail. */
  to: z.email({ error: "to is not a valid e-mail address" }).max(254).optional(),
  message: withoutControlCharacters(z.string().trim().max(2000, "message must be at most 2000 characters"), "message", { multiline: true }).optional(),
});

/** Answer of `POST /api/quotes/:id/link`: a fresh client link (the old one stops working). */
export const QuoteLinkSchema = z.object({ url: z.string() });

// ---------------------------------------------------------------- the client's page (no account)

/** A line as the client sees it: what and how much, never the contractor's cost or markup. */
export const ClientLineSchema = PricedLineSchema.pick({ key: true, source: true, category: true, description: true, quantity: true, unit: true, sellMinor: true });
export const ClientTotalsSchema = EstimateTotalsSchema.omit({ costMinor: true, marginMinor: true });
/** The snapshot on the client's page: the same, with lines and totals stripped of costs. */
export const ClientSnapshotSchema = QuoteSnapshotSchema.extend({ lines: z.array(ClientLineSchema), totals: ClientTotalsSchema });
export type ClientSnapshot = z.infer<typeof ClientSnapshotSchema>;

export const PublicQuoteSchema = z.object({
  state: z.enum(["open", "accepted", "declined", "deposit paid"]),
  status: QuoteStatus,
  label: z.string(),
  snapshot: ClientSnapshotSchema,
  acceptedName: z.string().nullable(),
  acceptedAt: z.string().nullable(),
  declinedAt: z.string().nullable(),
  deposit: PublicDepositSchema,
});
export type PublicQuote = z.infer<typeof PublicQuoteSchema>;

/** Why a client link no longer opens the quote; the page says so and how to reach the contractor. */
export const ClosedLinkDetails = z.object({
  reason: z.enum(["expired", "revoked", "superseded", "unknown"]),
  companyName: z.string().nullable(),
  contactEmail: z.string().nullable(),
  phone: z.string().nullable(),
});

export const AcceptQuoteInput = z.strictObject({
  name: requiredText("name", EstimateLimits.acceptNameMax),
  agree: z.literal(true, { error: "tick the box to agree to the terms" }),
});
export const DeclineQuoteInput = z.strictObject({
  reason: withoutControlCharacters(z.string({ error: "reason must be text" }).trim().max(EstimateLimits.reasonMax, `reason must be at most ${EstimateLimits.reasonMax} characters`), "reason", { multiline: true }).optional(),
});

// ---------------------------------------------------------------- dashboard

export const DashboardSchema = z.object({
  currency: z.string(),
  month: z.string(),
  byStatus: z.array(z.object({ status: QuoteStatus, count: z.number().int(), totalMinor: z.number().int() })),
  awaiting: z.array(QuoteSummarySchema),
  activity: z.array(z.object({ quoteId: z.string(), label: z.string(), jobId: z.string(), jobTitle: z.string(), clientName: z.string(), type: z.string(), at: z.string(), actor: z.string().nullable() })),
  overLimitSystems: z.array(z.object({ systemId: z.string(), systemName: z.string(), jobId: z.string(), jobTitle: z.string(), over: z.number().int() })),
  deposits: DepositTotalsSchema,
});
export type Dashboard = z.infer<typeof DashboardSchema>;
