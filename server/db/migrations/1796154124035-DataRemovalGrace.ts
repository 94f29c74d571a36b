import { MigrationInterface, QueryRunner } from "typeorm";

/** The study's grace period before withdrawn participants' transcript files are deleted, and when each was. */
export class DataRemovalGrace1796154124035 implements MigrationInterface {
    name = 'DataRemovalGrace1796154124035'

    public async up(queryRunner: QueryRunner): Promise<void> {
        await queryRunner.query(`ALTER TABLE "transcripts" ADD "purged_at" TIMESTAMP WITH TIME ZONE`);
        await queryRunner.query(`ALTER TABLE "studies" ADD "data_removal_grace_days" integer NOT NULL DEFAULT '30'`);
    }

    public async down(queryRunner: QueryRunner): Promise<void> {
        await queryRunner.query(`ALTER TABLE "studies" DROP COLUMN "data_removal_grace_days"`);
        await queryRunner.query(`ALTER TABLE "transcripts" DROP COLUMN "purged_at"`);
    }

}
