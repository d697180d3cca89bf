import { MigrationInterface, QueryRunner } from "typeorm";

export class CreateCompany1796164474353 implements MigrationInterface {
    name = 'CreateCompany1796164474353'

    public async up(queryRunner: QueryRunner): Promise<void> {
        await queryRunner.query(`
            CREATE TABLE "company" (
                "id" uuid NOT NULL DEFAULT gen_random_uuid(),
                "name" character varying(200) NOT NULL,
                "created_at" TIMESTAMP WITH TIME ZONE NOT NULL DEFAULT now(),
                "updated_at" TIMESTAMP WITH TIME ZONE NOT NULL DEFAULT now(),
                CONSTRAINT "PK_056f7854a7afdba7cbd6d45fc20" PRIMARY KEY ("id")
            )
        `);
    }

    public async down(queryRunner: QueryRunner): Promise<void> {
        await queryRunner.query(`
            DROP TABLE "company"
        `);
    }

}
