import { MigrationInterface, QueryRunner } from "typeorm";

/** Per study: agreement on or off (reflexive analysis) and the unit it compares. */

export class AgreementSettings1796159637143 implements MigrationInterface {
    name = 'AgreementSettings1796159637143'

    public async up(queryRunner: QueryRunner): Promise<void> {
        await queryRunner.query(`ALTER TABLE "studies" ADD "agreement_enabled" boolean NOT NULL DEFAULT true`);
        await queryRunner.query(`ALTER TABLE "studies" ADD "agreement_unit" character varying(10) NOT NULL DEFAULT 'turn'`);
    }

    public async down(queryRunner: QueryRunner): Promise<void> {
        await queryRunner.query(`ALTER TABLE "studies" DROP COLUMN "agreement_unit"`);
        await queryRunner.query(`ALTER TABLE "studies" DROP COLUMN "agreement_enabled"`);
    }

}
