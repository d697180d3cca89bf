import { Check, Column, CreateDateColumn, Entity, Index, JoinColumn, ManyToOne, PrimaryColumn, PrimaryGeneratedColumn, type Relation } from "typeorm";
import type { PaymentStatus } from "../../../shared/schemas/payments.js";
import { Company } from "./company.entity.js";
import { Quote } from "./quote.entity.js";
import { User } from "./user.entity.js";

const bigintMoney = { to: (v: number) => v, from: (v: string) => Number(v) };

/**
 * A Stripe Checkout Session made for a quote's deposit. One per attempt: a new one only when the
 * previous one expired, so two "Pay deposit" presses share a session.
 */
@Entity({ name: "deposit_checkout" })
@Index("UQ_deposit_checkout_attempt", ["quoteId", "attempt"], { unique: true })
@Check("CHK_deposit_checkout_status", `"status" IN ('open', 'complete', 'expired')`)
export class DepositCheckout {
  @PrimaryGeneratedColumn("uuid")
  id!: string;

  @Column({ type: "uuid", name: "company_id" })
  companyId!: string;

  @Column({ type: "uuid", name: "quote_id" })
  quoteId!: string;

  @Column({ type: "integer" })
  attempt!: number;

  @Index("UQ_deposit_checkout_session", { unique: true })
  @Column({ type: "varchar", length: 255, name: "stripe_session_id" })
  stripeSessionId!: string;

  @Column({ type: "varchar", length: 2000 })
  url!: string;

  @Column({ type: "bigint", name: "amount_minor", transformer: bigintMoney })
  amountMinor!: number;

  @Column({ type: "char", length: 3 })
  currency!: string;

  @Column({ type: "varchar", length: 10, default: "open" })
  status!: "open" | "complete" | "expired";

  @CreateDateColumn({ type: "timestamptz", name: "created_at" })
  createdAt!: Date;

  @ManyToOne(() => Company, { onDelete: "CASCADE" })
  @JoinColumn({ name: "company_id" })
  company!: Relation<Company>;

  @ManyToOne(() => Quote, { onDelete: "CASCADE" })
  @JoinColumn({ name: "quote_id" })
  quote!: Relation<Quote>;
}

/** Money received through Stripe for a quote, recorded only from a verified webhook. */
@Entity({ name: "payment" })
@Index("IDX_payment_company_paid", ["companyId", "paidAt"])
@Index("IDX_payment_quote", ["quoteId"])
@Check("CHK_payment_status", `"status" IN ('paid', 'mismatch', 'partially refunded', 'refunded')`)
@Check("CHK_payment_money", `"amount_minor" >= 0 AND "refunded_minor" >= 0 AND "refunded_minor" <= "amount_minor"`)
export class Payment {
  @PrimaryGeneratedColumn("uuid")
  id!: string;

  @Column({ type: "uuid", name: "company_id" })
  companyId!: string;

  @Column({ type: "uuid", name: "quote_id" })
  quoteId!: string;

  @Column({ type: "uuid", name: "job_id" })
  jobId!: string;

  /** "Q-2026-0042-D1": the quote's number and the payment's place among its payments. */
  @Column({ type: "varchar", length: 30, name: "receipt_number" })
  receiptNumber!: string;

  @Column({ type: "varchar", length: 20 })
  status!: PaymentStatus;

  @Column({ type: "varchar", length: 300, name: "mismatch_reason", nullable: true })
  mismatchReason!: string | null;

  @Column({ type: "bigint", name: "amount_minor", transformer: bigintMoney })
  amountMinor!: number;

  @Column({ type: "char", length: 3 })
  currency!: string;

  @Column({ type: "bigint", name: "expected_amount_minor", transformer: bigintMoney })
  expectedAmountMinor!: number;

  @Column({ type: "char", length: 3, name: "expected_currency" })
  expectedCurrency!: string;

  @Column({ type: "bigint", name: "refunded_minor", default: 0, transformer: bigintMoney })
  refundedMinor!: number;

  @Column({ type: "timestamptz", name: "paid_at" })
  paidAt!: Date;

  @Column({ type: "varchar", length: 200, name: "payer_name", nullable: true })
  payerName!: string | null;

  @Column({ type: "varchar", length: 254, name: "payer_email", nullable: true })
  payerEmail!: string | null;

  @Index("UQ_payment_checkout_session", { unique: true })
  @Column({ type: "varchar", length: 255, name: "stripe_checkout_session_id" })
  stripeCheckoutSessionId!: string;

  @Index("UQ_payment_payment_intent", { unique: true, where: `"stripe_payment_intent_id" IS NOT NULL` })
  @Column({ type: "varchar", length: 255, name: "stripe_payment_intent_id", nullable: true })
  stripePaymentIntentId!: string | null;

  /** The event that recorded it. */
  @Column({ type: "varchar", length: 255, name: "stripe_event_id" })
  stripeEventId!: string;

  @Column({ type: "timestamptz", name: "receipt_sent_at", nullable: true })
  receiptSentAt!: Date | null;

  @Column({ type: "varchar", length: 500, name: "receipt_error", nullable: true })
  receiptError!: string | null;

  @CreateDateColumn({ type: "timestamptz", name: "created_at" })
  createdAt!: Date;

  @ManyToOne(() => Company, { onDelete: "CASCADE" })
  @JoinColumn({ name: "company_id" })
  company!: Relation<Company>;

  @ManyToOne(() => Quote, { onDelete: "CASCADE" })
  @JoinColumn({ name: "quote_id" })
  quote!: Relation<Quote>;
}

/**
 * A refund Stripe made. Recorded from the refund's answer or its webhook, whichever comes first
 * (unique by Stripe's id). A refund reported before its payment (events out of order) waits with
 * no payment and is attached when the payment is recorded.
 */
@Entity({ name: "payment_refund" })
@Index("IDX_payment_refund_payment", ["paymentId"])
@Index("IDX_payment_refund_intent", ["stripePaymentIntentId"])
@Check("CHK_payment_refund_amount", `"amount_minor" > 0`)
export class PaymentRefund {
  @PrimaryGeneratedColumn("uuid")
  id!: string;

  @Column({ type: "uuid", name: "payment_id", nullable: true })
  paymentId!: string | null;

  @Index("UQ_payment_refund_stripe", { unique: true })
  @Column({ type: "varchar", length: 255, name: "stripe_refund_id" })
  stripeRefundId!: string;

  @Column({ type: "varchar", length: 255, name: "stripe_payment_intent_id" })
  stripePaymentIntentId!: string;

  @Column({ type: "bigint", name: "amount_minor", transformer: bigintMoney })
  amountMinor!: number;

  @Column({ type: "char", length: 3 })
  currency!: string;

  @Column({ type: "varchar", length: 40, nullable: true })
  reason!: string | null;

  @Column({ type: "varchar", length: 20 })
  status!: string;

  @Column({ type: "uuid", name: "created_by_id", nullable: true })
  createdById!: string | null;

  @CreateDateColumn({ type: "timestamptz", name: "created_at" })
  createdAt!: Date;

  @ManyToOne(() => Payment, { onDelete: "CASCADE" })
  @JoinColumn({ name: "payment_id" })
  payment!: Relation<Payment> | null;

  @ManyToOne(() => User, { onDelete: "SET NULL" })
  @JoinColumn({ name: "created_by_id" })
  createdBy!: Relation<User> | null;
}

/** Every Stripe event received, by its id: a repeated delivery is acknowledged and ignored. */
@Entity({ name: "stripe_event" })
export class StripeEvent {
  @PrimaryColumn({ type: "varchar", length: 255 })
  id!: string;

  @Column({ type: "varchar", length: 100 })
  type!: string;

  @Column({ type: "timestamptz", name: "received_at", default: () => "now()" })
  receivedAt!: Date;

  /** What the app did with it: "payment recorded", "payment flagged", "ignored: …". */
  @Column({ type: "varchar", length: 200, nullable: true })
  outcome!: string | null;

  @Column({ type: "jsonb" })
  payload!: unknown;
}
