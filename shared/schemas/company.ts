import { z } from "zod";
import { companyNameSchema, withoutControlCharacters } from "./auth.js";

// Every ISO 4217 code the runtime knows (Node and browsers both have Intl).
const CURRENCIES = new Set(Intl.supportedValuesOf("currency"));

const optionalText = (field: string, max: number, multiline = false) =>
  withoutControlCharacters(
    z
      .string({ error: `${field} must be text` })
      .trim()
      .max(max, `${field} must be at most ${max} characters`),
    field,
    { multiline },
  )
    .transform((v) => (v === "" ? null : v))
    .nullable();

/** A percentage with at most `decimals` places (the column's scale, so nothing is rounded on save). */
const percent = (field: string, max: number, decimals: number) =>
  z
    .number({ error: `${field} must be a number` })
    .min(0, `${field} cannot be negative`)
    .max(max, `${field} must be at most ${max} %`)
    .refine((v) => {
      // Tolerance for binary floating point: 8.11 × 1000 is 8109.999999999999.
      const scaled = v * 10 ** decimals;
      return Math.abs(scaled - Math.round(scaled)) < 1e-6;
    }, `${field} may have at most ${decimals} decimal places`);

export const CompanySettingsSchema = z.object({
  id: z.string(),
  name: z.string(),
  licenceNumber: z.string().nullable(),
  contactEmail: z.string().nullable(),
  phone: z.string().nullable(),
  address: z.string().nullable(),
  currency: z.string(),
  taxRatePercent: z.number(),
  defaultMarkupPercent: z.number(),
  /** Per hour, in the currency's minor unit (cents). */
  labourRateMinor: z.number().int(),
  depositPercent: z.number(),
  updatedAt: z.string(),
});
export type CompanySettings = z.infer<typeof CompanySettingsSchema>;

/** `PATCH /api/company`: any subset of the settings. */
export const UpdateCompanyInput = z
  .strictObject({
    name: companyNameSchema,
    licenceNumber: optionalText("licence number", 60),
    contactEmail: z
      .string()
      .trim()
      .max(254, "contact e-mail is too long")
      .transform((v) => (v === "" ? null : v.toLowerCase()))
      .pipe(z.email({ error: "contact e-mail is not a valid address" }).nullable())
      .nullable(),
    phone: optionalText("phone", 40),
    address: optionalText("address", 500, true),
    currency: z
      .string({ error: "currency must be a three-letter code" })
      .trim()
      .transform((v) => v.toUpperCase())
      .refine((v) => CURRENCIES.has(v), "currency must be an ISO 4217 code such as USD, EUR or AUD"),
    taxRatePercent: percent("tax rate", 100, 3),
    defaultMarkupPercent: percent("default markup", 1000, 2),
    labourRateMinor: z
      .number({ error: "labour rate must be a number" })
      .int("labour rate must be a whole number of cents")
      .min(0, "labour rate cannot be negative")
      .max(100_000_000, "labour rate is too large"),
    depositPercent: percent("deposit", 100, 2),
  })
  .partial();
export type UpdateCompanyInput = z.input<typeof UpdateCompanyInput>;

/** Digits after the decimal point of a currency's minor unit (2 for USD, 0 for JPY). */
export function minorDigits(currency: string): number {
  try {
    return new Intl.NumberFormat("en", { style: "currency", currency }).resolvedOptions().maximumFractionDigits ?? 2;
  } catch {
    return 2;
  }
}
