import { Check, Column, CreateDateColumn, Entity, Index, JoinColumn, ManyToOne, PrimaryGeneratedColumn, UpdateDateColumn, VersionColumn, type Relation } from "typeorm";
import type { EstimateFinding, GeneratedLine, LineChange, LineOverride, ManualLine, SuppliedLoad } from "../../../shared/schemas/estimates.js";
import { Company } from "./company.entity.js";
import { Job } from "./job.entity.js";
import { numericAsNumber } from "./numeric.js";

/**
 * A job's estimate: the lines the bill of materials made from the layout (`generated`), the lines
 * typed by hand, the estimator's overrides of generated lines (by line key, so they survive a
 * rebuild), and the money settings. Prices and totals are computed from these on every read.
 */
@Entity({ name: "estimate" })
@Index("UQ_estimate_job", ["jobId"], { unique: true })
@Check("CHK_estimate_deposit_mode", `"deposit_mode" IN ('percent', 'fixed')`)
@Check("CHK_estimate_money", `"discount_minor" >= 0 AND "deposit_fixed_minor" >= 0`)
export class Estimate {
  @PrimaryGeneratedColumn("uuid")
  id!: string;

  @Column({ type: "uuid", name: "company_id" })
  companyId!: string;

  @Column({ type: "uuid", name: "job_id" })
  jobId!: string;

  @Column({ type: "numeric", precision: 8, scale: 3, name: "markup_percent", transformer: numericAsNumber })
  markupPercent!: number;

  @Column({ type: "bigint", name: "discount_minor", default: 0, transformer: numericAsNumber })
  discountMinor!: number;

  @Column({ type: "numeric", precision: 6, scale: 3, name: "tax_rate_percent", transformer: numericAsNumber })
  taxRatePercent!: number;

  @Column({ type: "varchar", length: 10, name: "deposit_mode", default: "percent" })
  depositMode!: "percent" | "fixed";

  @Column({ type: "numeric", precision: 6, scale: 3, name: "deposit_percent", transformer: numericAsNumber })
  depositPercent!: number;

  @Column({ type: "bigint", name: "deposit_fixed_minor", default: 0, transformer: numericAsNumber })
  depositFixedMinor!: number;

  @Column({ type: "numeric", precision: 6, scale: 3, name: "waste_percent", transformer: numericAsNumber })
  wastePercent!: number;

  @Column({ type: "jsonb", default: () => "'[]'" })
  generated!: GeneratedLine[];

  @Column({ type: "jsonb", default: () => "'[]'" })
  manual!: ManualLine[];

  @Column({ type: "jsonb", default: () => "'{}'" })
  overrides!: Record<string, LineOverride>;

  @Column({ type: "jsonb", default: () => "'[]'" })
  supplied!: SuppliedLoad[];

  /** What the bill of materials could not price at the last build (MISSING_PRICE …). */
  @Column({ type: "jsonb", name: "bom_findings", default: () => "'[]'" })
  bomFindings!: EstimateFinding[];

  /** What the last rebuild changed. */
  @Column({ type: "jsonb", name: "last_changes", default: () => "'[]'" })
  lastChanges!: LineChange[];

  @Column({ type: "timestamptz", name: "generated_at", nullable: true })
  generatedAt!: Date | null;

  @VersionColumn({ type: "integer" })
  version!: number;

  @CreateDateColumn({ type: "timestamptz", name: "created_at" })
  createdAt!: Date;

  @UpdateDateColumn({ type: "timestamptz", name: "updated_at" })
  updatedAt!: Date;

  @ManyToOne(() => Company, { onDelete: "CASCADE" })
  @JoinColumn({ name: "company_id" })
  company!: Relation<Company>;

  @ManyToOne(() => Job, { onDelete: "CASCADE" })
  @JoinColumn({ name: "job_id" })
  job!: Relation<Job>;
}
