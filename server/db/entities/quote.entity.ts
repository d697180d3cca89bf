import { Check, Column, CreateDateColumn, Entity, Index, JoinColumn, ManyToOne, PrimaryGeneratedColumn, UpdateDateColumn, type Relation } from "typeorm";
import type { QuoteSnapshot, QuoteStatus } from "../../../shared/schemas/estimates.js";
import { Company } from "./company.entity.js";
import { Job } from "./job.entity.js";
import { User } from "./user.entity.js";

/** One revision of a quote: a frozen snapshot of the estimate, its layout and solve results. */
@Entity({ name: "quote" })
@Index("UQ_quote_number_revision", ["companyId", "number", "revision"], { unique: true })
@Index("IDX_quote_job", ["jobId", "createdAt"])
@Index("IDX_quote_company_status", ["companyId", "status"])
@Index("UQ_quote_link", ["linkId"], { unique: true, where: `"link_id" IS NOT NULL` })
@Check("CHK_quote_status", `"status" IN ('draft', 'sent', 'viewed', 'accepted', 'declined', 'expired', 'deposit paid')`)
@Check("CHK_quote_money", `"total_minor" >= 0 AND "deposit_minor" >= 0`)
export class Quote {
  @PrimaryGeneratedColumn("uuid")
  id!: string;

  @Column({ type: "uuid", name: "company_id" })
  companyId!: string;

  @Column({ type: "uuid", name: "job_id" })
  jobId!: string;

  /** "Q-2026-0042": the same for every revision of one quote. */
  @Column({ type: "varchar", length: 20 })
  number!: string;

  @Column({ type: "integer" })
  revision!: number;

  @Column({ type: "varchar", length: 20, default: "draft" })
  status!: QuoteStatus;

  /** Set when a later revision was sent; its client link stops working. */
  @Column({ type: "timestamptz", name: "superseded_at", nullable: true })
  supersededAt!: Date | null;

  @Column({ type: "char", length: 3 })
  currency!: string;

  @Column({ type: "bigint", name: "total_minor", transformer: { to: (v: number) => v, from: (v: string) => Number(v) } })
  totalMinor!: number;

  @Column({ type: "bigint", name: "deposit_minor", transformer: { to: (v: number) => v, from: (v: string) => Number(v) } })
  depositMinor!: number;

  @Column({ type: "date", name: "valid_until" })
  validUntil!: string;

  @Column({ type: "jsonb" })
  snapshot!: QuoteSnapshot;

  /** SHA-256 of the client link's secret; null: no working link. */
  @Column({ type: "varchar", length: 64, name: "link_hash", nullable: true })
  linkHash!: string | null;

  @Column({ type: "uuid", name: "link_id", nullable: true })
  linkId!: string | null;

  @Column({ type: "timestamptz", name: "sent_at", nullable: true })
  sentAt!: Date | null;

  @Column({ type: "varchar", length: 254, name: "sent_to", nullable: true })
  sentTo!: string | null;

  @Column({ type: "uuid", name: "sent_by_id", nullable: true })
  sentById!: string | null;

  @Column({ type: "varchar", length: 500, name: "send_error", nullable: true })
  sendError!: string | null;

  /** The mail server did not take the e-mail; a queued job keeps trying until this is cleared. */
  @Column({ type: "timestamptz", name: "send_pending_at", nullable: true })
  sendPendingAt!: Date | null;

  @Column({ type: "timestamptz", name: "viewed_at", nullable: true })
  viewedAt!: Date | null;

  @Column({ type: "timestamptz", name: "accepted_at", nullable: true })
  acceptedAt!: Date | null;

  @Column({ type: "varchar", length: 120, name: "accepted_name", nullable: true })
  acceptedName!: string | null;

  @Column({ type: "varchar", length: 64, name: "accepted_ip", nullable: true })
  acceptedIp!: string | null;

  @Column({ type: "varchar", length: 500, name: "accepted_user_agent", nullable: true })
  acceptedUserAgent!: string | null;

  @Column({ type: "timestamptz", name: "declined_at", nullable: true })
  declinedAt!: Date | null;

  @Column({ type: "varchar", length: 1000, name: "decline_reason", nullable: true })
  declineReason!: string | null;

  @Column({ type: "uuid", name: "created_by_id", nullable: true })
  createdById!: string | null;

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

  @ManyToOne(() => User, { onDelete: "SET NULL" })
  @JoinColumn({ name: "sent_by_id" })
  sentBy!: Relation<User> | null;

  @ManyToOne(() => User, { onDelete: "SET NULL" })
  @JoinColumn({ name: "created_by_id" })
  createdBy!: Relation<User> | null;
}

/** What happened to a quote and when: the quote page's timeline and the dashboard's activity. */
@Entity({ name: "quote_event" })
@Index("IDX_quote_event_company_at", ["companyId", "at"])
@Index("IDX_quote_event_quote", ["quoteId", "at"])
export class QuoteEvent {
  @PrimaryGeneratedColumn("uuid")
  id!: string;

  @Column({ type: "uuid", name: "company_id" })
  companyId!: string;

  @Column({ type: "uuid", name: "quote_id" })
  quoteId!: string;

  @Column({ type: "varchar", length: 20 })
  type!: string;

  @CreateDateColumn({ type: "timestamptz" })
  at!: Date;

  /** Who: a member's name, or the client's typed name. */
  @Column({ type: "varchar", length: 200, nullable: true })
  actor!: string | null;

  @Column({ type: "varchar", length: 1000, nullable: true })
  detail!: string | null;

  @ManyToOne(() => Company, { onDelete: "CASCADE" })
  @JoinColumn({ name: "company_id" })
  company!: Relation<Company>;

  @ManyToOne(() => Quote, { onDelete: "CASCADE" })
  @JoinColumn({ name: "quote_id" })
  quote!: Relation<Quote>;
}
