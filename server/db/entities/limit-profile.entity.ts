import { Check, Column, CreateDateColumn, Entity, Index, JoinColumn, ManyToOne, PrimaryGeneratedColumn, UpdateDateColumn, type Relation } from "typeorm";
import { Company } from "./company.entity.js";
import { numericAsNumber } from "./numeric.js";

/** A named set of voltage-drop limits a system is checked against. */
@Entity({ name: "limit_profile" })
@Index("UQ_limit_profile_name", ["companyId", "name"], { unique: true })
@Check("CHK_limit_profile_percentages", `"branch_percent" > 0 AND "branch_percent" <= 100 AND "total_percent" > 0 AND "total_percent" <= 100 AND "critical_percent" > 0 AND "critical_percent" <= 100`)
@Check("CHK_limit_profile_near", `"near_fraction" > 0 AND "near_fraction" < 1`)
export class LimitProfile {
  @PrimaryGeneratedColumn("uuid")
  id!: string;

  @Column({ type: "uuid", name: "company_id" })
  companyId!: string;

  @Column({ type: "varchar", length: 120 })
  name!: string;

  @Column({ type: "numeric", precision: 6, scale: 3, name: "branch_percent", transformer: numericAsNumber })
  branchPercent!: number;

  @Column({ type: "numeric", precision: 6, scale: 3, name: "total_percent", transformer: numericAsNumber })
  totalPercent!: number;

  @Column({ type: "numeric", precision: 6, scale: 3, name: "critical_percent", transformer: numericAsNumber })
  criticalPercent!: number;

  /** "Near limit" starts at this fraction of the limit. */
  @Column({ type: "numeric", precision: 4, scale: 3, name: "near_fraction", default: () => "0.8", transformer: numericAsNumber })
  nearFraction!: number;

  /** Where the figures come from (a standard's clause, the client's specification). */
  @Column({ type: "text", nullable: true })
  notes!: string | null;

  /** Seeded from a published recommendation; read-only (duplicate it to change it). */
  @Column({ type: "boolean", name: "built_in", default: false })
  builtIn!: boolean;

  @CreateDateColumn({ type: "timestamptz", name: "created_at" })
  createdAt!: Date;

  @UpdateDateColumn({ type: "timestamptz", name: "updated_at" })
  updatedAt!: Date;

  @ManyToOne(() => Company, { onDelete: "CASCADE" })
  @JoinColumn({ name: "company_id" })
  company!: Relation<Company>;
}
