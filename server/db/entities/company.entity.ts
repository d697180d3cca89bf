import { Check, Column, CreateDateColumn, Entity, PrimaryGeneratedColumn, UpdateDateColumn } from "typeorm";
import { numericAsNumber } from "./numeric.js";

/** The contractor's account: every piece of business data belongs to exactly one Company. */
@Entity({ name: "company" })
@Check("CHK_company_currency", `"currency" ~ '^[A-Z]{3}$'`)
@Check("CHK_company_percentages", `"tax_rate_percent" >= 0 AND "default_markup_percent" >= 0 AND "deposit_percent" >= 0 AND "deposit_percent" <= 100`)
@Check("CHK_company_labour_rate", `"labour_rate_minor" >= 0`)
export class Company {
  @PrimaryGeneratedColumn("uuid")
  id!: string;

  @Column({ type: "varchar", length: 200 })
  name!: string;

  /** The contractor's electrical licence number, printed on quotes. */
  @Column({ type: "varchar", length: 60, name: "licence_number", nullable: true })
  licenceNumber!: string | null;

  @Column({ type: "varchar", length: 254, name: "contact_email", nullable: true })
  contactEmail!: string | null;

  @Column({ type: "varchar", length: 40, nullable: true })
  phone!: string | null;

  @Column({ type: "varchar", length: 500, nullable: true })
  address!: string | null;

  /** ISO 4217 code of the company's money (quotes, price list, deposits). */
  @Column({ type: "char", length: 3, default: "USD" })
  currency!: string;

  @Column({ type: "numeric", precision: 6, scale: 3, name: "tax_rate_percent", default: 0, transformer: numericAsNumber })
  taxRatePercent!: number;

  @Column({ type: "numeric", precision: 6, scale: 2, name: "default_markup_percent", default: 0, transformer: numericAsNumber })
  defaultMarkupPercent!: number;

  /** Labour rate per hour in the currency's minor unit (cents). */
  @Column({ type: "integer", name: "labour_rate_minor", default: 0 })
  labourRateMinor!: number;

  @Column({ type: "numeric", precision: 5, scale: 2, name: "deposit_percent", default: 30, transformer: numericAsNumber })
  depositPercent!: number;

  /** Added to cable lengths for offcuts and routing, %. */
  @Column({ type: "numeric", precision: 6, scale: 3, name: "waste_percent", default: 10, transformer: numericAsNumber })
  wastePercent!: number;

  @Column({ type: "numeric", precision: 7, scale: 2, name: "labour_minutes_per_run", default: 20, transformer: numericAsNumber })
  labourMinutesPerRun!: number;

  @Column({ type: "numeric", precision: 7, scale: 2, name: "labour_minutes_per_metre", default: 1, transformer: numericAsNumber })
  labourMinutesPerMetre!: number;

  @Column({ type: "numeric", precision: 7, scale: 2, name: "labour_minutes_per_termination", default: 4, transformer: numericAsNumber })
  labourMinutesPerTermination!: number;

  @Column({ type: "integer", name: "quote_valid_days", default: 30 })
  quoteValidDays!: number;

  @Column({ type: "text", name: "quote_terms", default: "" })
  quoteTerms!: string;

  /** The last quote number given out; the next quote is this + 1. */
  @Column({ type: "integer", name: "last_quote_number", default: 0 })
  lastQuoteNumber!: number;

  /** PNG or JPEG printed on quotes; never selected by lists. */
  @Column({ type: "bytea", nullable: true, select: false })
  logo!: Buffer | null;

  @Column({ type: "varchar", length: 20, name: "logo_media_type", nullable: true })
  logoMediaType!: string | null;

  @CreateDateColumn({ type: "timestamptz", name: "created_at" })
  createdAt!: Date;

  @UpdateDateColumn({ type: "timestamptz", name: "updated_at" })
  updatedAt!: Date;
}
