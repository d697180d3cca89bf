import { MigrationInterface, QueryRunner } from "typeorm";

export class AddQuoteSendPending1796199345269 implements MigrationInterface {
    name = 'AddQuoteSendPending1796199345269'

    public async up(queryRunner: QueryRunner): Promise<void> {
        await queryRunner.query(`
            ALTER TABLE "quote"
            ADD "send_pending_at" TIMESTAMP WITH TIME ZONE
        `);
    }

    public async down(queryRunner: QueryRunner): Promise<void> {
        await queryRunner.query(`
            ALTER TABLE "quote" DROP COLUMN "send_pending_at"
        `);
    }

}
