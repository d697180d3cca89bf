import { Check, Column, CreateDateColumn, Entity, Index, JoinColumn, ManyToOne, PrimaryGeneratedColumn, UpdateDateColumn, VersionColumn, type Relation } from "typeorm";
import type { SystemSummary } from "../../../shared/schemas/jobs.js";
import { Company } from "./company.entity.js";
import { Job } from "./job.entity.js";
import { LimitProfile } from "./limit-profile.entity.js";
import { User } from "./user.entity.js";
import { numericAsNumber } from "./numeric.js";

/** One DC network inside a job, stored as the network file (runwright-system/1). */
@Entity({ name: "system" })
@Index("IDX_system_job", ["jobId"])
@Index("IDX_system_limit_profile", ["limitProfileId"])
@Check("CHK_system_units", `"units" IN ('metric', 'imperial')`)
export class System {
  @PrimaryGeneratedColumn("uuid")
  id!: string;

  @Column({ type: "uuid", name: "company_id" })
  companyId!: string;

  @Column({ type: "uuid", name: "job_id" })
  jobId!: string;

  @Column({ type: "varchar", length: 120 })
  name!: string;

  /** Copied from the document on every save, for lists. */
  @Column({ type: "numeric", precision: 7, scale: 2, name: "nominal_voltage", transformer: numericAsNumber })
  nominalVoltage!: number;

  @Column({ type: "varchar", length: 10 })
  units!: "metric" | "imperial";

  @Column({ type: "uuid", name: "limit_profile_id", nullable: true })
  limitProfileId!: string | null;

  /** The network document, validated by the shared schema before it is stored. */
  @Column({ type: "jsonb" })
  document!: Record<string, unknown>;

  /** Summary of the solve at the last save (null: could not be solved). */
  @Column({ type: "jsonb", name: "last_solve", nullable: true })
  lastSolve!: SystemSummary["lastSolve"];

  /** Optimistic locking: a save names the version it was read at. */
  @VersionColumn({ type: "integer" })
  version!: number;

  @Column({ type: "uuid", name: "updated_by_id", nullable: true })
  updatedById!: string | null;

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

  @ManyToOne(() => LimitProfile, { onDelete: "RESTRICT" })
  @JoinColumn({ name: "limit_profile_id" })
  limitProfile!: Relation<LimitProfile> | null;

  @ManyToOne(() => User, { onDelete: "SET NULL" })
  @JoinColumn({ name: "updated_by_id" })
  updatedBy!: Relation<User> | null;
}
