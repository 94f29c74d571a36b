import { MigrationInterface, QueryRunner } from "typeorm";

/** The team's own list of terms the de-identification scan always flags. */
export class DeidentificationTerms1796155275375 implements MigrationInterface {
    name = 'DeidentificationTerms1796155275375'

    public async up(queryRunner: QueryRunner): Promise<void> {
        await queryRunner.query(`ALTER TABLE "studies" ADD "deidentification_terms" jsonb NOT NULL DEFAULT '[]'`);
    }

    public async down(queryRunner: QueryRunner): Promise<void> {
        await queryRunner.query(`ALTER TABLE "studies" DROP COLUMN "deidentification_terms"`);
    }

}
