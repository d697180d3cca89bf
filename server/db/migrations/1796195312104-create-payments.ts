import { MigrationInterface, QueryRunner } from "typeorm";

export class CreatePayments1796195312104 implements MigrationInterface {
    name = 'CreatePayments1796195312104'

    public async up(queryRunner: QueryRunner): Promise<void> {
        await queryRunner.query(`
            CREATE TABLE "deposit_checkout" (
                "id" uuid NOT NULL DEFAULT gen_random_uuid(),
                "company_id" uuid NOT NULL,
                "quote_id" uuid NOT NULL,
                "attempt" integer NOT NULL,
                "stripe_session_id" character varying(255) NOT NULL,
                "url" character varying(2000) NOT NULL,
                "amount_minor" bigint NOT NULL,
                "currency" character(3) NOT NULL,
                "status" character varying(10) NOT NULL DEFAULT 'open',
                "created_at" TIMESTAMP WITH TIME ZONE NOT NULL DEFAULT now(),
                CONSTRAINT "CHK_deposit_checkout_status" CHECK ("status" IN ('open', 'complete', 'expired')),
                CONSTRAINT "PK_aa914a86c04d8c44e6287eac338" PRIMARY KEY ("id")
            )
        `);
        await queryRunner.query(`
            CREATE UNIQUE INDEX "UQ_deposit_checkout_session" ON "deposit_checkout" ("stripe_session_id")
        `);
        await queryRunner.query(`
            CREATE UNIQUE INDEX "UQ_deposit_checkout_attempt" ON "deposit_checkout" ("quote_id", "attempt")
        `);
        await queryRunner.query(`
            CREATE TABLE "payment" (
                "id" uuid NOT NULL DEFAULT gen_random_uuid(),
                "company_id" uuid NOT NULL,
                "quote_id" uuid NOT NULL,
                "job_id" uuid NOT NULL,
                "receipt_number" character varying(30) NOT NULL,
                "status" character varying(20) NOT NULL,
                "mismatch_reason" character varying(300),
                "amount_minor" bigint NOT NULL,
                "currency" character(3) NOT NULL,
                "expected_amount_minor" bigint NOT NULL,
                "expected_currency" character(3) NOT NULL,
                "refunded_minor" bigint NOT NULL DEFAULT '0',
                "paid_at" TIMESTAMP WITH TIME ZONE NOT NULL,
                "payer_name" character varying(200),
                "payer_email" character varying(254),
                "stripe_checkout_session_id" character varying(255) NOT NULL,
                "stripe_payment_intent_id" character varying(255),
                "stripe_event_id" character varying(255) NOT NULL,
                "receipt_sent_at" TIMESTAMP WITH TIME ZONE,
                "receipt_error" character varying(500),
                "created_at" TIMESTAMP WITH TIME ZONE NOT NULL DEFAULT now(),
                CONSTRAINT "CHK_payment_money" CHECK (
                    "amount_minor" >= 0
                    AND "refunded_minor" >= 0
                    AND "refunded_minor" <= "amount_minor"
                ),
                CONSTRAINT "CHK_payment_status" CHECK (
                    "status" IN (
                        'paid',
                        'mismatch',
                        'partially refunded',
                        'refunded'
                    )
                ),
                CONSTRAINT "PK_fcaec7df5adf9cac408c686b2ab" PRIMARY KEY ("id")
            )
        `);
        await queryRunner.query(`
            CREATE UNIQUE INDEX "UQ_payment_checkout_session" ON "payment" ("stripe_checkout_session_id")
        `);
        await queryRunner.query(`
            CREATE UNIQUE INDEX "UQ_payment_payment_intent" ON "payment" ("stripe_payment_intent_id")
            WHERE "stripe_payment_intent_id" IS NOT NULL
        `);
        await queryRunner.query(`
            CREATE INDEX "IDX_payment_quote" ON "payment" ("quote_id")
        `);
        await queryRunner.query(`
            CREATE INDEX "IDX_payment_company_paid" ON "payment" ("company_id", "paid_at")
        `);
        await queryRunner.query(`
            CREATE TABLE "payment_refund" (
                "id" uuid NOT NULL DEFAULT gen_random_uuid(),
                "payment_id" uuid,
                "stripe_refund_id" character varying(255) NOT NULL,
                "stripe_payment_intent_id" character varying(255) NOT NULL,
                "amount_minor" bigint NOT NULL,
                "currency" character(3) NOT NULL,
                "reason" character varying(40),
                "status" character varying(20) NOT NULL,
                "created_by_id" uuid,
                "created_at" TIMESTAMP WITH TIME ZONE NOT NULL DEFAULT now(),
                CONSTRAINT "CHK_payment_refund_amount" CHECK ("amount_minor" > 0),
                CONSTRAINT "PK_9bcd6c17fe1fce78631fdb79633" PRIMARY KEY ("id")
            )
        `);
        await queryRunner.query(`
            CREATE UNIQUE INDEX "UQ_payment_refund_stripe" ON "payment_refund" ("stripe_refund_id")
        `);
        await queryRunner.query(`
            CREATE INDEX "IDX_payment_refund_intent" ON "payment_refund" ("stripe_payment_intent_id")
        `);
        await queryRunner.query(`
            CREATE INDEX "IDX_payment_refund_payment" ON "payment_refund" ("payment_id")
        `);
        await queryRunner.query(`
            CREATE TABLE "stripe_event" (
                "id" character varying(255) NOT NULL,
                "type" character varying(100) NOT NULL,
                "received_at" TIMESTAMP WITH TIME ZONE NOT NULL DEFAULT now(),
                "outcome" character varying(200),
                "payload" jsonb NOT NULL,
                CONSTRAINT "PK_7a91ab435defe9ce0ee6fb6f7f7" PRIMARY KEY ("id")
            )
        `);
        await queryRunner.query(`
            ALTER TABLE "deposit_checkout"
            ADD CONSTRAINT "FK_8e0f477890f13f802941c56d7a7" FOREIGN KEY ("company_id") REFERENCES "company"("id") ON DELETE CASCADE ON UPDATE NO ACTION
        `);
        await queryRunner.query(`
            ALTER TABLE "deposit_checkout"
            ADD CONSTRAINT "FK_c63dd8e20a52852ed55c546af83" FOREIGN KEY ("quote_id") REFERENCES "quote"("id") ON DELETE CASCADE ON UPDATE NO ACTION
        `);
        await queryRunner.query(`
            ALTER TABLE "payment"
            ADD CONSTRAINT "FK_3e9244ca0c1af4a3601f1795ff6" FOREIGN KEY ("company_id") REFERENCES "company"("id") ON DELETE CASCADE ON UPDATE NO ACTION
        `);
        await queryRunner.query(`
            ALTER TABLE "payment"
            ADD CONSTRAINT "FK_bb79b03435d6a5f35eb5ab8e850" FOREIGN KEY ("quote_id") REFERENCES "quote"("id") ON DELETE CASCADE ON UPDATE NO ACTION
        `);
        await queryRunner.query(`
            ALTER TABLE "payment_refund"
            ADD CONSTRAINT "FK_9b1ba9fb797de22fc87b598f509" FOREIGN KEY ("payment_id") REFERENCES "payment"("id") ON DELETE CASCADE ON UPDATE NO ACTION
        `);
        await queryRunner.query(`
            ALTER TABLE "payment_refund"
            ADD CONSTRAINT "FK_5612687661593a4963e7e8f68c4" FOREIGN KEY ("created_by_id") REFERENCES "app_user"("id") ON DELETE
            SET NULL ON UPDATE NO ACTION
        `);
    }

    public async down(queryRunner: QueryRunner): Promise<void> {
        await queryRunner.query(`
            ALTER TABLE "payment_refund" DROP CONSTRAINT "FK_5612687661593a4963e7e8f68c4"
        `);
        await queryRunner.query(`
            ALTER TABLE "payment_refund" DROP CONSTRAINT "FK_9b1ba9fb797de22fc87b598f509"
        `);
        await queryRunner.query(`
            ALTER TABLE "payment" DROP CONSTRAINT "FK_bb79b03435d6a5f35eb5ab8e850"
        `);
        await queryRunner.query(`
            ALTER TABLE "payment" DROP CONSTRAINT "FK_3e9244ca0c1af4a3601f1795ff6"
        `);
        await queryRunner.query(`
            ALTER TABLE "deposit_checkout" DROP CONSTRAINT "FK_c63dd8e20a52852ed55c546af83"
        `);
        await queryRunner.query(`
            ALTER TABLE "deposit_checkout" DROP CONSTRAINT "FK_8e0f477890f13f802941c56d7a7"
        `);
        await queryRunner.query(`
            DROP TABLE "stripe_event"
        `);
        await queryRunner.query(`
            DROP INDEX "public"."IDX_payment_refund_payment"
        `);
        await queryRunner.query(`
            DROP INDEX "public"."IDX_payment_refund_intent"
        `);
        await queryRunner.query(`
            DROP INDEX "public"."UQ_payment_refund_stripe"
        `);
        await queryRunner.query(`
            DROP TABLE "payment_refund"
        `);
        await queryRunner.query(`
            DROP INDEX "public"."IDX_payment_company_paid"
        `);
        await queryRunner.query(`
            DROP INDEX "public"."IDX_payment_quote"
        `);
        await queryRunner.query(`
            DROP INDEX "public"."UQ_payment_payment_intent"
        `);
        await queryRunner.query(`
            DROP INDEX "public"."UQ_payment_checkout_session"
        `);
        await queryRunner.query(`
            DROP TABLE "payment"
        `);
        await queryRunner.query(`
            DROP INDEX "public"."UQ_deposit_checkout_attempt"
        `);
        await queryRunner.query(`
            DROP INDEX "public"."UQ_deposit_checkout_session"
        `);
        await queryRunner.query(`
            DROP TABLE "deposit_checkout"
        `);
    }

}
