import { Check, Column, CreateDateColumn, Entity, Index, JoinColumn, ManyToOne, PrimaryGeneratedColumn, UpdateDateColumn, type Relation } from "typeorm";
import type { JobStatus } from "../../../shared/schemas/jobs.js";
import { Client } from "./client.entity.js";
import { Company } from "./company.entity.js";
import { User } from "./user.entity.js";

/** A piece of work for a client at a site: its systems, attachments and (later) estimate and quotes. */
@Entity({ name: "job" })
@Check("CHK_job_status", `"status" IN ('lead', 'quoted', 'won', 'lost', 'installed')`)
@Index("IDX_job_company_updated", ["companyId", "updatedAt"])
@Index("IDX_job_client", ["clientId"])
export class Job {
  @PrimaryGeneratedColumn("uuid")
  id!: string;

  @Column({ type: "uuid", name: "company_id" })
  companyId!: string;

  @Column({ type: "uuid", name: "client_id" })
  clientId!: string;

  @Column({ type: "varchar", length: 200 })
  title!: string;

  @Column({ type: "varchar", length: 500, name: "site_address", nullable: true })
  siteAddress!: string | null;

  @Column({ type: "varchar", length: 20, default: "lead" })
  status!: JobStatus;

  @Column({ type: "text", nullable: true })
  notes!: string | null;

  @Column({ type: "uuid", name: "created_by_id", nullable: true })
  createdById!: string | null;

  @CreateDateColumn({ type: "timestamptz", name: "created_at" })
  createdAt!: Date;

  @UpdateDateColumn({ type: "timestamptz", name: "updated_at" })
  updatedAt!: Date;

  @ManyToOne(() => Company, { onDelete: "CASCADE" })
  @JoinColumn({ name: "company_id" })
  company!: Relation<Company>;

  // A client with jobs cannot be deleted (the service says so; the database refuses too).
  @ManyToOne(() => Client, { onDelete: "RESTRICT" })
  @JoinColumn({ name: "client_id" })
  client!: Relation<Client>;

  @ManyToOne(() => User, { onDelete: "SET NULL" })
  @JoinColumn({ name: "created_by_id" })
  createdBy!: Relation<User> | null;
}
