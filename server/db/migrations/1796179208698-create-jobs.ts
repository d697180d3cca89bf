import { MigrationInterface, QueryRunner } from "typeorm";

export class CreateJobs1796179208698 implements MigrationInterface {
    name = 'CreateJobs1796179208698'

    public async up(queryRunner: QueryRunner): Promise<void> {
        await queryRunner.query(`
            CREATE TABLE "client" (
                "id" uuid NOT NULL DEFAULT gen_random_uuid(),
                "company_id" uuid NOT NULL,
                "name" character varying(200) NOT NULL,
                "email" character varying(254),
                "phone" character varying(40),
                "billing_address" character varying(500),
                "notes" text,
                "created_at" TIMESTAMP WITH TIME ZONE NOT NULL DEFAULT now(),
                "updated_at" TIMESTAMP WITH TIME ZONE NOT NULL DEFAULT now(),
                CONSTRAINT "PK_96da49381769303a6515a8785c7" PRIMARY KEY ("id")
            )
        `);
        await queryRunner.query(`
            CREATE INDEX "IDX_client_company_name" ON "client" ("company_id", "name")
        `);
        await queryRunner.query(`
            CREATE TABLE "job" (
                "id" uuid NOT NULL DEFAULT gen_random_uuid(),
                "company_id" uuid NOT NULL,
                "client_id" uuid NOT NULL,
                "title" character varying(200) NOT NULL,
                "site_address" character varying(500),
                "status" character varying(20) NOT NULL DEFAULT 'lead',
                "notes" text,
                "created_by_id" uuid,
                "created_at" TIMESTAMP WITH TIME ZONE NOT NULL DEFAULT now(),
                "updated_at" TIMESTAMP WITH TIME ZONE NOT NULL DEFAULT now(),
                CONSTRAINT "CHK_job_status" CHECK (
                    "status" IN ('lead', 'quoted', 'won', 'lost', 'installed')
                ),
                CONSTRAINT "PK_98ab1c14ff8d1cf80d18703b92f" PRIMARY KEY ("id")
            )
        `);
        await queryRunner.query(`
            CREATE INDEX "IDX_job_client" ON "job" ("client_id")
        `);
        await queryRunner.query(`
            CREATE INDEX "IDX_job_company_updated" ON "job" ("company_id", "updated_at")
        `);
        await queryRunner.query(`
            CREATE TABLE "attachment" (
                "id" uuid NOT NULL DEFAULT gen_random_uuid(),
                "company_id" uuid NOT NULL,
                "job_id" uuid NOT NULL,
                "file_name" character varying(255) NOT NULL,
                "media_type" character varying(40) NOT NULL,
                "size_bytes" integer NOT NULL,
                "content" bytea NOT NULL,
                "uploaded_by_id" uuid,
                "created_at" TIMESTAMP WITH TIME ZONE NOT NULL DEFAULT now(),
                CONSTRAINT "CHK_attachment_size" CHECK (
                    "size_bytes" > 0
                    AND "size_bytes" <= 10485760
                ),
                CONSTRAINT "CHK_attachment_media_type" CHECK (
                    "media_type" IN ('image/jpeg', 'image/png', 'application/pdf')
                ),
                CONSTRAINT "PK_d2a80c3a8d467f08a750ac4b420" PRIMARY KEY ("id")
            )
        `);
        await queryRunner.query(`
            CREATE INDEX "IDX_attachment_job" ON "attachment" ("job_id", "created_at")
        `);
        await queryRunner.query(`
            CREATE TABLE "limit_profile" (
                "id" uuid NOT NULL DEFAULT gen_random_uuid(),
                "company_id" uuid NOT NULL,
                "name" character varying(120) NOT NULL,
                "branch_percent" numeric(6, 3) NOT NULL,
                "total_percent" numeric(6, 3) NOT NULL,
                "critical_percent" numeric(6, 3) NOT NULL,
                "near_fraction" numeric(4, 3) NOT NULL DEFAULT 0.8,
                "notes" text,
                "built_in" boolean NOT NULL DEFAULT false,
                "created_at" TIMESTAMP WITH TIME ZONE NOT NULL DEFAULT now(),
                "updated_at" TIMESTAMP WITH TIME ZONE NOT NULL DEFAULT now(),
                CONSTRAINT "CHK_limit_profile_near" CHECK (
                    "near_fraction" > 0
                    AND "near_fraction" < 1
                ),
                CONSTRAINT "CHK_limit_profile_percentages" CHECK (
                    "branch_percent" > 0
                    AND "branch_percent" <= 100
                    AND "total_percent" > 0
                    AND "total_percent" <= 100
                    AND "critical_percent" > 0
                    AND "critical_percent" <= 100
                ),
                CONSTRAINT "PK_81126a2c87c9462997723ff1238" PRIMARY KEY ("id")
            )
        `);
        await queryRunner.query(`
            CREATE UNIQUE INDEX "UQ_limit_profile_name" ON "limit_profile" ("company_id", "name")
        `);
        await queryRunner.query(`
            CREATE TABLE "system" (
                "id" uuid NOT NULL DEFAULT gen_random_uuid(),
                "company_id" uuid NOT NULL,
                "job_id" uuid NOT NULL,
                "name" character varying(120) NOT NULL,
                "nominal_voltage" numeric(7, 2) NOT NULL,
                "units" character varying(10) NOT NULL,
                "limit_profile_id" uuid,
                "document" jsonb NOT NULL,
                "last_solve" jsonb,
                "version" integer NOT NULL,
                "updated_by_id" uuid,
                "created_at" TIMESTAMP WITH TIME ZONE NOT NULL DEFAULT now(),
                "updated_at" TIMESTAMP WITH TIME ZONE NOT NULL DEFAULT now(),
                CONSTRAINT "CHK_system_units" CHECK ("units" IN ('metric', 'imperial')),
                CONSTRAINT "PK_6b1e6b6f88da9888fde62379945" PRIMARY KEY ("id")
            )
        `);
        await queryRunner.query(`
            CREATE INDEX "IDX_system_limit_profile" ON "system" ("limit_profile_id")
        `);
        await queryRunner.query(`
            CREATE INDEX "IDX_system_job" ON "system" ("job_id")
        `);
        await queryRunner.query(`
            ALTER TABLE "client"
            ADD CONSTRAINT "FK_75fffe092dc8bb594720f9b7598" FOREIGN KEY ("company_id") REFERENCES "company"("id") ON DELETE CASCADE ON UPDATE NO ACTION
        `);
        await queryRunner.query(`
            ALTER TABLE "job"
            ADD CONSTRAINT "FK_51cb12c924d3e8c7465cc8edff2" FOREIGN KEY ("company_id") REFERENCES "company"("id") ON DELETE CASCADE ON UPDATE NO ACTION
        `);
        await queryRunner.query(`
            ALTER TABLE "job"
            ADD CONSTRAINT "FK_cc52bb1d22b93ebd7d86a88da4d" FOREIGN KEY ("client_id") REFERENCES "client"("id") ON DELETE RESTRICT ON UPDATE NO ACTION
        `);
        await queryRunner.query(`
            ALTER TABLE "job"
            ADD CONSTRAINT "FK_70a700fa7e6133a31e1bbaecdb8" FOREIGN KEY ("created_by_id") REFERENCES "app_user"("id") ON DELETE
            SET NULL ON UPDATE NO ACTION
        `);
        await queryRunner.query(`
            ALTER TABLE "attachment"
            ADD CONSTRAINT "FK_b4d7c2d35bbc00e9f72eb744ebe" FOREIGN KEY ("company_id") REFERENCES "company"("id") ON DELETE CASCADE ON UPDATE NO ACTION
        `);
        await queryRunner.query(`
            ALTER TABLE "attachment"
            ADD CONSTRAINT "FK_639e3b3dda59a105ec3aaa17617" FOREIGN KEY ("job_id") REFERENCES "job"("id") ON DELETE CASCADE ON UPDATE NO ACTION
        `);
        await queryRunner.query(`
            ALTER TABLE "attachment"
            ADD CONSTRAINT "FK_98872340e922bc9a2efd5ae144a" FOREIGN KEY ("uploaded_by_id") REFERENCES "app_user"("id") ON DELETE
            SET NULL ON UPDATE NO ACTION
        `);
        await queryRunner.query(`
            ALTER TABLE "limit_profile"
            ADD CONSTRAINT "FK_04c2ce4b2ed35bd5f8381ac8c0a" FOREIGN KEY ("company_id") REFERENCES "company"("id") ON DELETE CASCADE ON UPDATE NO ACTION
        `);
        await queryRunner.query(`
            ALTER TABLE "system"
            ADD CONSTRAINT "FK_8edfbf632902b0b6dbdf630974b" FOREIGN KEY ("company_id") REFERENCES "company"("id") ON DELETE CASCADE ON UPDATE NO ACTION
        `);
        await queryRunner.query(`
            ALTER TABLE "system"
            ADD CONSTRAINT "FK_41be5aa28ef813395d09994d383" FOREIGN KEY ("job_id") REFERENCES "job"("id") ON DELETE CASCADE ON UPDATE NO ACTION
        `);
        await queryRunner.query(`
            ALTER TABLE "system"
            ADD CONSTRAINT "FK_222a3a86b5adecf39cfc1e2d9ef" FOREIGN KEY ("limit_profile_id") REFERENCES "limit_profile"("id") ON DELETE RESTRICT ON UPDATE NO ACTION
        `);
        await queryRunner.query(`
            ALTER TABLE "system"
            ADD CONSTRAINT "FK_50bc311347612492774a7c8cde2" FOREIGN KEY ("updated_by_id") REFERENCES "app_user"("id") ON DELETE
            SET NULL ON UPDATE NO ACTION
        `);
        // Companies that exist before this migration get the default limit profiles that sign-up
        // gives new ones (the same figures as DEFAULT_LIMIT_PROFILES, frozen here).
        await queryRunner.query(`
            INSERT INTO "limit_profile" ("company_id", "name", "branch_percent", "total_percent", "critical_percent", "near_fraction", "built_in", "notes")
            SELECT c."id", p."name", p."branch", p."total", p."critical", 0.8, p."built_in", p."notes"
            FROM "company" c CROSS JOIN (VALUES
                ('General — 3 % branch, 5 % total', 3, 5, 3, true, 'NFPA 70 (NEC) 210.19(A) Informational Note No. 4 and 215.2(A) Informational Note No. 2: size conductors for at most 3 % drop in a branch circuit or feeder and 5 % feeder plus branch. A recommendation for reasonable efficiency, not a requirement (informational notes are not enforceable, NEC 90.5(C)).'),
                ('Marine DC — 3 % critical, 10 % other', 10, 10, 3, true, 'ABYC E-11 (AC and DC Electrical Systems on Boats): at most 3 % for panelboard main feeders, bilge blowers, electronics, navigation lights and other critical circuits; at most 10 % for other lighting and non-critical circuits. Mark critical loads as critical.'),
                ('Company custom', 3, 5, 3, false, 'Your own limits: edit them to match a client''s specification or the locally adopted code.')
            ) AS p("name", "branch", "total", "critical", "built_in", "notes")
        `);
    }

    public async down(queryRunner: QueryRunner): Promise<void> {
        await queryRunner.query(`
            ALTER TABLE "system" DROP CONSTRAINT "FK_50bc311347612492774a7c8cde2"
        `);
        await queryRunner.query(`
            ALTER TABLE "system" DROP CONSTRAINT "FK_222a3a86b5adecf39cfc1e2d9ef"
        `);
        await queryRunner.query(`
            ALTER TABLE "system" DROP CONSTRAINT "FK_41be5aa28ef813395d09994d383"
        `);
        await queryRunner.query(`
            ALTER TABLE "system" DROP CONSTRAINT "FK_8edfbf632902b0b6dbdf630974b"
        `);
        await queryRunner.query(`
            ALTER TABLE "limit_profile" DROP CONSTRAINT "FK_04c2ce4b2ed35bd5f8381ac8c0a"
        `);
        await queryRunner.query(`
            ALTER TABLE "attachment" DROP CONSTRAINT "FK_98872340e922bc9a2efd5ae144a"
        `);
        await queryRunner.query(`
            ALTER TABLE "attachment" DROP CONSTRAINT "FK_639e3b3dda59a105ec3aaa17617"
        `);
        await queryRunner.query(`
            ALTER TABLE "attachment" DROP CONSTRAINT "FK_b4d7c2d35bbc00e9f72eb744ebe"
        `);
        await queryRunner.query(`
            ALTER TABLE "job" DROP CONSTRAINT "FK_70a700fa7e6133a31e1bbaecdb8"
        `);
        await queryRunner.query(`
            ALTER TABLE "job" DROP CONSTRAINT "FK_cc52bb1d22b93ebd7d86a88da4d"
        `);
        await queryRunner.query(`
            ALTER TABLE "job" DROP CONSTRAINT "FK_51cb12c924d3e8c7465cc8edff2"
        `);
        await queryRunner.query(`
            ALTER TABLE "client" DROP CONSTRAINT "FK_75fffe092dc8bb594720f9b7598"
        `);
        await queryRunner.query(`
            DROP INDEX "public"."IDX_system_job"
        `);
        await queryRunner.query(`
            DROP INDEX "public"."IDX_system_limit_profile"
        `);
        await queryRunner.query(`
            DROP TABLE "system"
        `);
        await queryRunner.query(`
            DROP INDEX "public"."UQ_limit_profile_name"
        `);
        await queryRunner.query(`
            DROP TABLE "limit_profile"
        `);
        await queryRunner.query(`
            DROP INDEX "public"."IDX_attachment_job"
        `);
        await queryRunner.query(`
            DROP TABLE "attachment"
        `);
        await queryRunner.query(`
            DROP INDEX "public"."IDX_job_company_updated"
        `);
        await queryRunner.query(`
            DROP INDEX "public"."IDX_job_client"
        `);
        await queryRunner.query(`
            DROP TABLE "job"
        `);
        await queryRunner.query(`
            DROP INDEX "public"."IDX_client_company_name"
        `);
        await queryRunner.query(`
            DROP TABLE "client"
        `);
    }

}
