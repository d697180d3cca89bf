import { MigrationInterface, QueryRunner } from "typeorm";

export class CreateAccounts1796173602296 implements MigrationInterface {
    name = 'CreateAccounts1796173602296'

    public async up(queryRunner: QueryRunner): Promise<void> {
        // The session store's table (connect-pg-simple's layout), made here and never at run time.
        await queryRunner.query(`
            CREATE TABLE "user_session" (
                "sid" character varying NOT NULL COLLATE "default",
                "sess" json NOT NULL,
                "expire" TIMESTAMP(6) NOT NULL,
                CONSTRAINT "PK_user_session" PRIMARY KEY ("sid")
            )
        `);
        await queryRunner.query(`
            CREATE INDEX "IDX_user_session_expire" ON "user_session" ("expire")
        `);
        // Ending every session of one user (after a password reset) looks them up by the user id inside the JSON.
        await queryRunner.query(`
            CREATE INDEX "IDX_user_session_user" ON "user_session" ((("sess" -> 'passport' ->> 'user')))
        `);
        await queryRunner.query(`
            CREATE TABLE "app_user" (
                "id" uuid NOT NULL DEFAULT gen_random_uuid(),
                "email" character varying(254) NOT NULL,
                "name" character varying(120) NOT NULL,
                "password_hash" character varying(255) NOT NULL,
                "created_at" TIMESTAMP WITH TIME ZONE NOT NULL DEFAULT now(),
                "updated_at" TIMESTAMP WITH TIME ZONE NOT NULL DEFAULT now(),
                "last_sign_in_at" TIMESTAMP WITH TIME ZONE,
                CONSTRAINT "UQ_3fa909d0e37c531ebc237703391" UNIQUE ("email"),
                CONSTRAINT "CHK_app_user_email_lower" CHECK ("email" = lower("email")),
                CONSTRAINT "PK_22a5c4a3d9b2fb8e4e73fc4ada1" PRIMARY KEY ("id")
            )
        `);
        await queryRunner.query(`
            CREATE TABLE "invitation" (
                "id" uuid NOT NULL DEFAULT gen_random_uuid(),
                "company_id" uuid NOT NULL,
                "email" character varying(254) NOT NULL,
                "role" character varying(20) NOT NULL,
                "token_hash" character(64) NOT NULL,
                "expires_at" TIMESTAMP WITH TIME ZONE NOT NULL,
                "accepted_at" TIMESTAMP WITH TIME ZONE,
                "revoked_at" TIMESTAMP WITH TIME ZONE,
                "invited_by_id" uuid,
                "created_at" TIMESTAMP WITH TIME ZONE NOT NULL DEFAULT now(),
                CONSTRAINT "CHK_invitation_role" CHECK ("role" IN ('owner', 'estimator', 'installer')),
                CONSTRAINT "PK_beb994737756c0f18a1c1f8669c" PRIMARY KEY ("id")
            )
        `);
        await queryRunner.query(`
            CREATE INDEX "IDX_invitation_company" ON "invitation" ("company_id")
        `);
        await queryRunner.query(`
            CREATE UNIQUE INDEX "UQ_invitation_pending" ON "invitation" ("company_id", "email")
            WHERE "accepted_at" IS NULL AND "revoked_at" IS NULL
        `);
        await queryRunner.query(`
            CREATE TABLE "membership" (
                "company_id" uuid NOT NULL,
                "user_id" uuid NOT NULL,
                "role" character varying(20) NOT NULL,
                "created_at" TIMESTAMP WITH TIME ZONE NOT NULL DEFAULT now(),
                CONSTRAINT "CHK_membership_role" CHECK ("role" IN ('owner', 'estimator', 'installer')),
                CONSTRAINT "PK_63d584557167bcb0fc71bd504d0" PRIMARY KEY ("company_id", "user_id")
            )
        `);
        await queryRunner.query(`
            CREATE INDEX "IDX_membership_user" ON "membership" ("user_id")
        `);
        await queryRunner.query(`
            CREATE TABLE "password_reset" (
                "id" uuid NOT NULL DEFAULT gen_random_uuid(),
                "user_id" uuid NOT NULL,
                "token_hash" character(64) NOT NULL,
                "expires_at" TIMESTAMP WITH TIME ZONE NOT NULL,
                "used_at" TIMESTAMP WITH TIME ZONE,
                "created_at" TIMESTAMP WITH TIME ZONE NOT NULL DEFAULT now(),
                CONSTRAINT "PK_8515e60a2cc41584fa4784f52ce" PRIMARY KEY ("id")
            )
        `);
        await queryRunner.query(`
            CREATE INDEX "IDX_password_reset_user" ON "password_reset" ("user_id")
        `);
        await queryRunner.query(`
            ALTER TABLE "company"
            ADD "licence_number" character varying(60)
        `);
        await queryRunner.query(`
            ALTER TABLE "company"
            ADD "contact_email" character varying(254)
        `);
        await queryRunner.query(`
            ALTER TABLE "company"
            ADD "phone" character varying(40)
        `);
        await queryRunner.query(`
            ALTER TABLE "company"
            ADD "address" character varying(500)
        `);
        await queryRunner.query(`
            ALTER TABLE "company"
            ADD "currency" character(3) NOT NULL DEFAULT 'USD'
        `);
        await queryRunner.query(`
            ALTER TABLE "company"
            ADD "tax_rate_percent" numeric(6, 3) NOT NULL DEFAULT '0'
        `);
        await queryRunner.query(`
            ALTER TABLE "company"
            ADD "default_markup_percent" numeric(6, 2) NOT NULL DEFAULT '0'
        `);
        await queryRunner.query(`
            ALTER TABLE "company"
            ADD "labour_rate_minor" integer NOT NULL DEFAULT '0'
        `);
        await queryRunner.query(`
            ALTER TABLE "company"
            ADD "deposit_percent" numeric(5, 2) NOT NULL DEFAULT '30'
        `);
        await queryRunner.query(`
            ALTER TABLE "company"
            ADD CONSTRAINT "CHK_company_labour_rate" CHECK ("labour_rate_minor" >= 0)
        `);
        await queryRunner.query(`
            ALTER TABLE "company"
            ADD CONSTRAINT "CHK_company_percentages" CHECK (
                    "tax_rate_percent" >= 0
                    AND "default_markup_percent" >= 0
                    AND "deposit_percent" >= 0
                    AND "deposit_percent" <= 100
                )
        `);
        await queryRunner.query(`
            ALTER TABLE "company"
            ADD CONSTRAINT "CHK_company_currency" CHECK ("currency" ~ '^[A-Z]{3}$')
        `);
        await queryRunner.query(`
            ALTER TABLE "invitation"
            ADD CONSTRAINT "FK_088c9b15c9465faaa40472b71cf" FOREIGN KEY ("company_id") REFERENCES "company"("id") ON DELETE CASCADE ON UPDATE NO ACTION
        `);
        await queryRunner.query(`
            ALTER TABLE "invitation"
            ADD CONSTRAINT "FK_9fcebfddfa4369ac0e3c26dc8a3" FOREIGN KEY ("invited_by_id") REFERENCES "app_user"("id") ON DELETE
            SET NULL ON UPDATE NO ACTION
        `);
        await queryRunner.query(`
            ALTER TABLE "membership"
            ADD CONSTRAINT "FK_d6812ba6c79a178ecab570bc17e" FOREIGN KEY ("company_id") REFERENCES "company"("id") ON DELETE CASCADE ON UPDATE NO ACTION
        `);
        await queryRunner.query(`
            ALTER TABLE "membership"
            ADD CONSTRAINT "FK_e9c72e8d29784031c96f5c6af8d" FOREIGN KEY ("user_id") REFERENCES "app_user"("id") ON DELETE CASCADE ON UPDATE NO ACTION
        `);
        await queryRunner.query(`
            ALTER TABLE "password_reset"
            ADD CONSTRAINT "FK_ad88301fdc79593dd222268a8b6" FOREIGN KEY ("user_id") REFERENCES "app_user"("id") ON DELETE CASCADE ON UPDATE NO ACTION
        `);
    }

    public async down(queryRunner: QueryRunner): Promise<void> {
        await queryRunner.query(`
            ALTER TABLE "password_reset" DROP CONSTRAINT "FK_ad88301fdc79593dd222268a8b6"
        `);
        await queryRunner.query(`
            ALTER TABLE "membership" DROP CONSTRAINT "FK_e9c72e8d29784031c96f5c6af8d"
        `);
        await queryRunner.query(`
            ALTER TABLE "membership" DROP CONSTRAINT "FK_d6812ba6c79a178ecab570bc17e"
        `);
        await queryRunner.query(`
            ALTER TABLE "invitation" DROP CONSTRAINT "FK_9fcebfddfa4369ac0e3c26dc8a3"
        `);
        await queryRunner.query(`
            ALTER TABLE "invitation" DROP CONSTRAINT "FK_088c9b15c9465faaa40472b71cf"
        `);
        await queryRunner.query(`
            ALTER TABLE "company" DROP CONSTRAINT "CHK_company_currency"
        `);
        await queryRunner.query(`
            ALTER TABLE "company" DROP CONSTRAINT "CHK_company_percentages"
        `);
        await queryRunner.query(`
            ALTER TABLE "company" DROP CONSTRAINT "CHK_company_labour_rate"
        `);
        await queryRunner.query(`
            ALTER TABLE "company" DROP COLUMN "deposit_percent"
        `);
        await queryRunner.query(`
            ALTER TABLE "company" DROP COLUMN "labour_rate_minor"
        `);
        await queryRunner.query(`
            ALTER TABLE "company" DROP COLUMN "default_markup_percent"
        `);
        await queryRunner.query(`
            ALTER TABLE "company" DROP COLUMN "tax_rate_percent"
        `);
        await queryRunner.query(`
            ALTER TABLE "company" DROP COLUMN "currency"
        `);
        await queryRunner.query(`
            ALTER TABLE "company" DROP COLUMN "address"
        `);
        await queryRunner.query(`
            ALTER TABLE "company" DROP COLUMN "phone"
        `);
        await queryRunner.query(`
            ALTER TABLE "company" DROP COLUMN "contact_email"
        `);
        await queryRunner.query(`
            ALTER TABLE "company" DROP COLUMN "licence_number"
        `);
        await queryRunner.query(`
            DROP INDEX "public"."IDX_password_reset_user"
        `);
        await queryRunner.query(`
            DROP TABLE "password_reset"
        `);
        await queryRunner.query(`
            DROP INDEX "public"."IDX_membership_user"
        `);
        await queryRunner.query(`
            DROP TABLE "membership"
        `);
        await queryRunner.query(`
            DROP INDEX "public"."UQ_invitation_pending"
        `);
        await queryRunner.query(`
            DROP INDEX "public"."IDX_invitation_company"
        `);
        await queryRunner.query(`
            DROP TABLE "invitation"
        `);
        await queryRunner.query(`
            DROP TABLE "app_user"
        `);
        await queryRunner.query(`
            DROP TABLE "user_session"
        `);
    }

}
