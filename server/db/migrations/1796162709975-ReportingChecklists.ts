import { MigrationInterface, QueryRunner } from "typeorm";

/** The study's answers to the COREQ and SRQR reporting checklists. */

export class ReportingChecklists1796162709975 implements MigrationInterface {
    name = 'ReportingChecklists1796162709975'

    public async up(queryRunner: QueryRunner): Promise<void> {
        await queryRunner.query(`CREATE TABLE "checklist_answers" ("study_id" uuid NOT NULL, "checklist" character varying(10) NOT NULL, "number" character varying(4) NOT NULL, "where_addressed" text NOT NULL DEFAULT '', "note" text NOT NULL DEFAULT '', "done" boolean NOT NULL DEFAULT false, "updated_at" TIMESTAMP WITH TIME ZONE NOT NULL DEFAULT now(), CONSTRAINT "PK_6b55a471a9253c23555b6928982" PRIMARY KEY ("study_id", "checklist", "number"))`);
        await queryRunner.query(`ALTER TABLE "checklist_answers" ADD CONSTRAINT "FK_f8acc3de3be6fbefac8fd67921f" FOREIGN KEY ("study_id") REFERENCES "studies"("id") ON DELETE CASCADE ON UPDATE NO ACTION`);
    }

    public async down(queryRunner: QueryRunner): Promise<void> {
        await queryRunner.query(`ALTER TABLE "checklist_answers" DROP CONSTRAINT "FK_f8acc3de3be6fbefac8fd67921f"`);
        await queryRunner.query(`DROP TABLE "checklist_answers"`);
    }

}
