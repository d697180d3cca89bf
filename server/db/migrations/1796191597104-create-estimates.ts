import { MigrationInterface, QueryRunner } from "typeorm";

export class CreateEstimates1796191597104 implements MigrationInterface {
    name = 'CreateEstimates1796191597104'

    public async up(queryRunner: QueryRunner): Promise<void> {
        await queryRunner.query(`
            CREATE TABLE "price_item" (
                "id" uuid NOT NULL DEFAULT gen_random_uuid(),
                "company_id" uuid NOT NULL,
                "sku" character varying(40) NOT NULL,
                "description" character varying(200) NOT NULL,
                "category" character varying(20) NOT NULL,
                "unit" character varying(10) NOT NULL,
                "unit_cost_minor" bigint NOT NULL,
                "sell_price_minor" bigint,
                "cable_size" character varying(40),
                "cable_material" character varying(10),
                "conductors" smallint,
                "rating_a" numeric(9, 2),
                "created_at" TIMESTAMP WITH TIME ZONE NOT NULL DEFAULT now(),
                "updated_at" TIMESTAMP WITH TIME ZONE NOT NULL DEFAULT now(),
                CONSTRAINT "CHK_price_item_money" CHECK (
                    "unit_cost_minor" >= 0
                    AND (
                        "sell_price_minor" IS NULL
                        OR "sell_price_minor" >= 0
                    )
                ),
                CONSTRAINT "CHK_price_item_unit" CHECK ("unit" IN ('m', 'ft', 'each', 'hour')),
                CONSTRAINT "CHK_price_item_category" CHECK (
                    "category" IN (
                        'cable',
                        'fuse',
                        'termination',
                        'device',
                        'labour',
                        'other'
                    )
                ),
                CONSTRAINT "PK_178cd9dbbbaa11cff1a0d7fdbb2" PRIMARY KEY ("id")
            )
        `);
        await queryRunner.query(`
            CREATE INDEX "IDX_price_item_company" ON "price_item" ("company_id", "category")
        `);
        // SKUs are unique per company whatever their case (an expression index: not in the entity's diff).
        await queryRunner.query(`
            CREATE UNIQUE INDEX "UQ_price_item_company_sku" ON "price_item" ("company_id", lower("sku"))
        `);
        await queryRunner.query(`
            CREATE TABLE "estimate" (
                "id" uuid NOT NULL DEFAULT gen_random_uuid(),
                "company_id" uuid NOT NULL,
                "job_id" uuid NOT NULL,
                "markup_percent" numeric(8, 3) NOT NULL,
                "discount_minor" bigint NOT NULL DEFAULT '0',
                "tax_rate_percent" numeric(6, 3) NOT NULL,
                "deposit_mode" character varying(10) NOT NULL DEFAULT 'percent',
                "deposit_percent" numeric(6, 3) NOT NULL,
                "deposit_fixed_minor" bigint NOT NULL DEFAULT '0',
                "waste_percent" numeric(6, 3) NOT NULL,
                "generated" jsonb NOT NULL DEFAULT '[]',
                "manual" jsonb NOT NULL DEFAULT '[]',
                "overrides" jsonb NOT NULL DEFAULT '{}',
                "supplied" jsonb NOT NULL DEFAULT '[]',
                "bom_findings" jsonb NOT NULL DEFAULT '[]',
                "last_changes" jsonb NOT NULL DEFAULT '[]',
                "generated_at" TIMESTAMP WITH TIME ZONE,
                "version" integer NOT NULL,
                "created_at" TIMESTAMP WITH TIME ZONE NOT NULL DEFAULT now(),
                "updated_at" TIMESTAMP WITH TIME ZONE NOT NULL DEFAULT now(),
                CONSTRAINT "CHK_estimate_money" CHECK (
                    "discount_minor" >= 0
                    AND "deposit_fixed_minor" >= 0
                ),
                CONSTRAINT "CHK_estimate_deposit_mode" CHECK ("deposit_mode" IN ('percent', 'fixed')),
                CONSTRAINT "PK_75c20205845608fdb6725d7b130" PRIMARY KEY ("id")
            )
        `);
        await queryRunner.query(`
            CREATE UNIQUE INDEX "UQ_estimate_job" ON "estimate" ("job_id")
        `);
        await queryRunner.query(`
            CREATE TABLE "quote" (
                "id" uuid NOT NULL DEFAULT gen_random_uuid(),
                "company_id" uuid NOT NULL,
                "job_id" uuid NOT NULL,
                "number" character varying(20) NOT NULL,
                "revision" integer NOT NULL,
                "status" character varying(20) NOT NULL DEFAULT 'draft',
                "superseded_at" TIMESTAMP WITH TIME ZONE,
                "currency" character(3) NOT NULL,
                "total_minor" bigint NOT NULL,
                "deposit_minor" bigint NOT NULL,
                "valid_until" date NOT NULL,
                "snapshot" jsonb NOT NULL,
                "link_hash" character varying(64),
                "link_id" uuid,
                "sent_at" TIMESTAMP WITH TIME ZONE,
                "sent_to" character varying(254),
                "sent_by_id" uuid,
                "send_error" character varying(500),
                "viewed_at" TIMESTAMP WITH TIME ZONE,
                "accepted_at" TIMESTAMP WITH TIME ZONE,
                "accepted_name" character varying(120),
                "accepted_ip" character varying(64),
                "accepted_user_agent" character varying(500),
                "declined_at" TIMESTAMP WITH TIME ZONE,
                "decline_reason" character varying(1000),
                "created_by_id" uuid,
                "created_at" TIMESTAMP WITH TIME ZONE NOT NULL DEFAULT now(),
                "updated_at" TIMESTAMP WITH TIME ZONE NOT NULL DEFAULT now(),
                CONSTRAINT "CHK_quote_money" CHECK (
                    "total_minor" >= 0
                    AND "deposit_minor" >= 0
                ),
                CONSTRAINT "CHK_quote_status" CHECK (
                    "status" IN (
                        'draft',
                        'sent',
                        'viewed',
                        'accepted',
                        'declined',
                        'expired',
                        'deposit paid'
                    )
                ),
                CONSTRAINT "PK_b772d4cb09e587c8c72a78d2439" PRIMARY KEY ("id")
            )
        `);
        await queryRunner.query(`
            CREATE INDEX "IDX_quote_company_status" ON "quote" ("company_id", "status")
        `);
        await queryRunner.query(`
            CREATE INDEX "IDX_quote_job" ON "quote" ("job_id", "created_at")
        `);
        await queryRunner.query(`
            CREATE UNIQUE INDEX "UQ_quote_number_revision" ON "quote" ("company_id", "number", "revision")
        `);
        // A client link finds its quote by this id (partial: most quotes have no live link).
        await queryRunner.query(`
            CREATE UNIQUE INDEX "UQ_quote_link" ON "quote" ("link_id") WHERE "link_id" IS NOT NULL
        `);
        await queryRunner.query(`
            CREATE TABLE "quote_event" (
                "id" uuid NOT NULL DEFAULT gen_random_uuid(),
                "company_id" uuid NOT NULL,
                "quote_id" uuid NOT NULL,
                "type" character varying(20) NOT NULL,
                "at" TIMESTAMP WITH TIME ZONE NOT NULL DEFAULT now(),
                "actor" character varying(200),
                "detail" character varying(1000),
                CONSTRAINT "PK_8d794ca4e4ded85d939528b5d2a" PRIMARY KEY ("id")
            )
        `);
        await queryRunner.query(`
            CREATE INDEX "IDX_quote_event_quote" ON "quote_event" ("quote_id", "at")
        `);
        await queryRunner.query(`
            CREATE INDEX "IDX_quote_event_company_at" ON "quote_event" ("company_id", "at")
        `);
        await queryRunner.query(`
            ALTER TABLE "company"
            ADD "waste_percent" numeric(6, 3) NOT NULL DEFAULT '10'
        `);
        await queryRunner.query(`
            ALTER TABLE "company"
            ADD "labour_minutes_per_run" numeric(7, 2) NOT NULL DEFAULT '20'
        `);
        await queryRunner.query(`
            ALTER TABLE "company"
            ADD "labour_minutes_per_metre" numeric(7, 2) NOT NULL DEFAULT '1'
        `);
        await queryRunner.query(`
            ALTER TABLE "company"
            ADD "labour_minutes_per_termination" numeric(7, 2) NOT NULL DEFAULT '4'
        `);
        await queryRunner.query(`
            ALTER TABLE "company"
            ADD "quote_valid_days" integer NOT NULL DEFAULT '30'
        `);
        await queryRunner.query(`
            ALTER TABLE "company"
            ADD "quote_terms" text NOT NULL DEFAULT ''
        `);
        await queryRunner.query(`
            ALTER TABLE "company"
            ADD "last_quote_number" integer NOT NULL DEFAULT '0'
        `);
        await queryRunner.query(`
            ALTER TABLE "company"
            ADD "logo" bytea
        `);
        await queryRunner.query(`
            ALTER TABLE "company"
            ADD "logo_media_type" character varying(20)
        `);
        await queryRunner.query(`
            ALTER TABLE "price_item"
            ADD CONSTRAINT "FK_4eed21578334f09c5c2d770956f" FOREIGN KEY ("company_id") REFERENCES "company"("id") ON DELETE CASCADE ON UPDATE NO ACTION
        `);
        await queryRunner.query(`
            ALTER TABLE "estimate"
            ADD CONSTRAINT "FK_8c846f3a2e17a70d4fbe3492be3" FOREIGN KEY ("company_id") REFERENCES "company"("id") ON DELETE CASCADE ON UPDATE NO ACTION
        `);
        await queryRunner.query(`
            ALTER TABLE "estimate"
            ADD CONSTRAINT "FK_958485ac720b189bf3d15de98c9" FOREIGN KEY ("job_id") REFERENCES "job"("id") ON DELETE CASCADE ON UPDATE NO ACTION
        `);
        await queryRunner.query(`
            ALTER TABLE "quote"
            ADD CONSTRAINT "FK_39f823aaee3c62453cf746d29f6" FOREIGN KEY ("company_id") REFERENCES "company"("id") ON DELETE CASCADE ON UPDATE NO ACTION
        `);
        await queryRunner.query(`
            ALTER TABLE "quote"
            ADD CONSTRAINT "FK_3f6e8a1eb1828e3a14be8152943" FOREIGN KEY ("job_id") REFERENCES "job"("id") ON DELETE CASCADE ON UPDATE NO ACTION
        `);
        await queryRunner.query(`
            ALTER TABLE "quote"
            ADD CONSTRAINT "FK_01df142c5b66ecbd1bec4d8d747" FOREIGN KEY ("sent_by_id") REFERENCES "app_user"("id") ON DELETE
            SET NULL ON UPDATE NO ACTION
        `);
        await queryRunner.query(`
            ALTER TABLE "quote"
            ADD CONSTRAINT "FK_97ae1fdb35901200b2bf00f4f83" FOREIGN KEY ("created_by_id") REFERENCES "app_user"("id") ON DELETE
            SET NULL ON UPDATE NO ACTION
        `);
        await queryRunner.query(`
            ALTER TABLE "quote_event"
            ADD CONSTRAINT "FK_efe8ef147034e5be044259dedd9" FOREIGN KEY ("company_id") REFERENCES "company"("id") ON DELETE CASCADE ON UPDATE NO ACTION
        `);
        await queryRunner.query(`
            ALTER TABLE "quote_event"
            ADD CONSTRAINT "FK_718a25fc225a3053dbbd504966f" FOREIGN KEY ("quote_id") REFERENCES "quote"("id") ON DELETE CASCADE ON UPDATE NO ACTION
        `);
    }

    public async down(queryRunner: QueryRunner): Promise<void> {
        await queryRunner.query(`
            ALTER TABLE "quote_event" DROP CONSTRAINT "FK_718a25fc225a3053dbbd504966f"
        `);
        await queryRunner.query(`
            ALTER TABLE "quote_event" DROP CONSTRAINT "FK_efe8ef147034e5be044259dedd9"
        `);
        await queryRunner.query(`
            ALTER TABLE "quote" DROP CONSTRAINT "FK_97ae1fdb35901200b2bf00f4f83"
        `);
        await queryRunner.query(`
            ALTER TABLE "quote" DROP CONSTRAINT "FK_01df142c5b66ecbd1bec4d8d747"
        `);
        await queryRunner.query(`
            ALTER TABLE "quote" DROP CONSTRAINT "FK_3f6e8a1eb1828e3a14be8152943"
        `);
        await queryRunner.query(`
            ALTER TABLE "quote" DROP CONSTRAINT "FK_39f823aaee3c62453cf746d29f6"
        `);
        await queryRunner.query(`
            ALTER TABLE "estimate" DROP CONSTRAINT "FK_958485ac720b189bf3d15de98c9"
        `);
        await queryRunner.query(`
            ALTER TABLE "estimate" DROP CONSTRAINT "FK_8c846f3a2e17a70d4fbe3492be3"
        `);
        await queryRunner.query(`
            ALTER TABLE "price_item" DROP CONSTRAINT "FK_4eed21578334f09c5c2d770956f"
        `);
        await queryRunner.query(`
            ALTER TABLE "company" DROP COLUMN "logo_media_type"
        `);
        await queryRunner.query(`
            ALTER TABLE "company" DROP COLUMN "logo"
        `);
        await queryRunner.query(`
            ALTER TABLE "company" DROP COLUMN "last_quote_number"
        `);
        await queryRunner.query(`
            ALTER TABLE "company" DROP COLUMN "quote_terms"
        `);
        await queryRunner.query(`
            ALTER TABLE "company" DROP COLUMN "quote_valid_days"
        `);
        await queryRunner.query(`
            ALTER TABLE "company" DROP COLUMN "labour_minutes_per_termination"
        `);
        await queryRunner.query(`
            ALTER TABLE "company" DROP COLUMN "labour_minutes_per_metre"
        `);
        await queryRunner.query(`
            ALTER TABLE "company" DROP COLUMN "labour_minutes_per_run"
        `);
        await queryRunner.query(`
            ALTER TABLE "company" DROP COLUMN "waste_percent"
        `);
        await queryRunner.query(`
            DROP INDEX "public"."IDX_quote_event_company_at"
        `);
        await queryRunner.query(`
            DROP INDEX "public"."IDX_quote_event_quote"
        `);
        await queryRunner.query(`
            DROP TABLE "quote_event"
        `);
        await queryRunner.query(`
            DROP INDEX "public"."UQ_quote_link"
        `);
        await queryRunner.query(`
            DROP INDEX "public"."UQ_quote_number_revision"
        `);
        await queryRunner.query(`
            DROP INDEX "public"."IDX_quote_job"
        `);
        await queryRunner.query(`
            DROP INDEX "public"."IDX_quote_company_status"
        `);
        await queryRunner.query(`
            DROP TABLE "quote"
        `);
        await queryRunner.query(`
            DROP INDEX "public"."UQ_estimate_job"
        `);
        await queryRunner.query(`
            DROP TABLE "estimate"
        `);
        await queryRunner.query(`
            DROP INDEX "public"."UQ_price_item_company_sku"
        `);
        await queryRunner.query(`
            DROP INDEX "public"."IDX_price_item_company"
        `);
        await queryRunner.query(`
            DROP TABLE "price_item"
        `);
    }

}
