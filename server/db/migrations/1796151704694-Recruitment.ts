import { MigrationInterface, QueryRunner } from "typeorm";

/**
 * Recruitment and screening: study recruitment settings, versioned screening questionnaires,
 * pseudonymous participants with their contact details in a separate table, screenings and the
 * participant timeline.
 */
export class Recruitment1796151704694 implements MigrationInterface {
    name = 'Recruitment1796151704694'

    public async up(queryRunner: QueryRunner): Promise<void> {
        await queryRunner.query(`CREATE TABLE "participants" ("id" uuid NOT NULL DEFAULT gen_random_uuid(), "created_at" TIMESTAMP WITH TIME ZONE NOT NULL DEFAULT now(), "updated_at" TIMESTAMP WITH TIME ZONE NOT NULL DEFAULT now(), "study_id" uuid NOT NULL, "sequence" integer NOT NULL, "pseudonym" character varying(12) NOT NULL, "status" character varying(20) NOT NULL, "help_seeking" boolean NOT NULL DEFAULT false, "source" character varying(30) NOT NULL, "source_detail" character varying(200) NOT NULL DEFAULT '', "characteristics" jsonb NOT NULL DEFAULT '{}', "override" jsonb, "last_activity_at" TIMESTAMP WITH TIME ZONE NOT NULL DEFAULT now(), CONSTRAINT "PK_1cda06c31eec1c95b3365a0283f" PRIMARY KEY ("id"))`);
        await queryRunner.query(`CREATE INDEX "IDX_45791dcd021339f23a4ae23432" ON "participants"  ("study_id", "status") `);
        await queryRunner.query(`CREATE UNIQUE INDEX "IDX_f58dfdb86e04c9513c3785a1c1" ON "participants"  ("study_id", "pseudonym") `);
        await queryRunner.query(`CREATE UNIQUE INDEX "IDX_f2b8ab24643b45459c65395ce6" ON "participants"  ("study_id", "sequence") `);
        await queryRunner.query(`CREATE TABLE "participant_contacts" ("participant_id" uuid NOT NULL, "name" character varying(120) NOT NULL, "email" character varying(254) NOT NULL DEFAULT '', "phone" character varying(40) NOT NULL DEFAULT '', "country" character varying(80) NOT NULL DEFAULT '', "time_zone" character varying(60) NOT NULL DEFAULT '', "consent_to_contact" boolean NOT NULL DEFAULT false, CONSTRAINT "PK_6ed32b0a61450487c95d33272ca" PRIMARY KEY ("participant_id"))`);
        await queryRunner.query(`CREATE TABLE "participant_events" ("id" uuid NOT NULL DEFAULT gen_random_uuid(), "at" TIMESTAMP WITH TIME ZONE NOT NULL DEFAULT now(), "study_id" uuid NOT NULL, "participant_id" uuid NOT NULL, "kind" character varying(20) NOT NULL, "summary" character varying(300) NOT NULL, "actor_id" uuid, "actor_name" character varying(120), "details" jsonb NOT NULL DEFAULT '{}', CONSTRAINT "PK_a7503544e420deda1b4920017c2" PRIMARY KEY ("id"))`);
        await queryRunner.query(`CREATE INDEX "IDX_052ca8d0a42c6e5d2f94fbe897" ON "participant_events"  ("participant_id", "at") `);
        await queryRunner.query(`CREATE TABLE "screening_questionnaires" ("id" uuid NOT NULL DEFAULT gen_random_uuid(), "created_at" TIMESTAMP WITH TIME ZONE NOT NULL DEFAULT now(), "updated_at" TIMESTAMP WITH TIME ZONE NOT NULL DEFAULT now(), "study_id" uuid NOT NULL, "version" integer NOT NULL, "intro" text NOT NULL DEFAULT '', "questions" jsonb NOT NULL DEFAULT '[]', "created_by_id" uuid, CONSTRAINT "PK_68e10abed398d82cc9e532b147c" PRIMARY KEY ("id"))`);
        await queryRunner.query(`CREATE UNIQUE INDEX "IDX_38ee4d0269d38bd007e5892938" ON "screening_questionnaires"  ("study_id", "version") `);
        await queryRunner.query(`CREATE TABLE "screenings" ("id" uuid NOT NULL DEFAULT gen_random_uuid(), "at" TIMESTAMP WITH TIME ZONE NOT NULL DEFAULT now(), "participant_id" uuid NOT NULL, "questionnaire_id" uuid NOT NULL, "answers" jsonb NOT NULL, "result" jsonb NOT NULL, "screened_by_id" uuid, CONSTRAINT "PK_343138765d7d5a69f71b2ff7795" PRIMARY KEY ("id"))`);
        await queryRunner.query(`CREATE INDEX "IDX_3ad6a797363e96ca8379d00fe6" ON "screenings"  ("participant_id", "at") `);
        await queryRunner.query(`ALTER TABLE "studies" ADD "recruiting" boolean NOT NULL DEFAULT false`);
        await queryRunner.query(`ALTER TABLE "studies" ADD "public_summary" text NOT NULL DEFAULT ''`);
        await queryRunner.query(`ALTER TABLE "studies" ADD "who_can_take_part" text NOT NULL DEFAULT ''`);
        await queryRunner.query(`ALTER TABLE "studies" ADD "sampling_characteristics" jsonb NOT NULL DEFAULT '[]'`);
        await queryRunner.query(`ALTER TABLE "studies" ADD "sampling_targets" jsonb NOT NULL DEFAULT '[]'`);
        await queryRunner.query(`ALTER TABLE "studies" ADD "resources" jsonb NOT NULL DEFAULT '[]'`);
        await queryRunner.query(`ALTER TABLE "studies" ADD "withdrawal_rule" jsonb NOT NULL DEFAULT '{"kind":"any_time"}'`);
        await queryRunner.query(`ALTER TABLE "studies" ADD "participant_sequence" integer NOT NULL DEFAULT '0'`);
        await queryRunner.query(`ALTER TABLE "participants" ADD CONSTRAINT "FK_58116ceaaf48d1bd426fb334a39" FOREIGN KEY ("study_id") REFERENCES "studies"("id") ON DELETE CASCADE ON UPDATE NO ACTION`);
        await queryRunner.query(`ALTER TABLE "participant_contacts" ADD CONSTRAINT "FK_6ed32b0a61450487c95d33272ca" FOREIGN KEY ("participant_id") REFERENCES "participants"("id") ON DELETE CASCADE ON UPDATE NO ACTION`);
        await queryRunner.query(`ALTER TABLE "screening_questionnaires" ADD CONSTRAINT "FK_4fa6a503f4452144860fa912131" FOREIGN KEY ("study_id") REFERENCES "studies"("id") ON DELETE CASCADE ON UPDATE NO ACTION`);
        await queryRunner.query(`ALTER TABLE "screenings" ADD CONSTRAINT "FK_e23b170ff6450add5bd0727589b" FOREIGN KEY ("participant_id") REFERENCES "participants"("id") ON DELETE CASCADE ON UPDATE NO ACTION`);
        await queryRunner.query(`ALTER TABLE "screenings" ADD CONSTRAINT "FK_9f9f482b5f9a352209762f2a205" FOREIGN KEY ("questionnaire_id") REFERENCES "screening_questionnaires"("id") ON DELETE RESTRICT ON UPDATE NO ACTION`);
    }

    public async down(queryRunner: QueryRunner): Promise<void> {
        await queryRunner.query(`ALTER TABLE "screenings" DROP CONSTRAINT "FK_9f9f482b5f9a352209762f2a205"`);
        await queryRunner.query(`ALTER TABLE "screenings" DROP CONSTRAINT "FK_e23b170ff6450add5bd0727589b"`);
        await queryRunner.query(`ALTER TABLE "screening_questionnaires" DROP CONSTRAINT "FK_4fa6a503f4452144860fa912131"`);
        await queryRunner.query(`ALTER TABLE "participant_contacts" DROP CONSTRAINT "FK_6ed32b0a61450487c95d33272ca"`);
        await queryRunner.query(`ALTER TABLE "participants" DROP CONSTRAINT "FK_58116ceaaf48d1bd426fb334a39"`);
        await queryRunner.query(`ALTER TABLE "studies" DROP COLUMN "participant_sequence"`);
        await queryRunner.query(`ALTER TABLE "studies" DROP COLUMN "withdrawal_rule"`);
        await queryRunner.query(`ALTER TABLE "studies" DROP COLUMN "resources"`);
        await queryRunner.query(`ALTER TABLE "studies" DROP COLUMN "sampling_targets"`);
        await queryRunner.query(`ALTER TABLE "studies" DROP COLUMN "sampling_characteristics"`);
        await queryRunner.query(`ALTER TABLE "studies" DROP COLUMN "who_can_take_part"`);
        await queryRunner.query(`ALTER TABLE "studies" DROP COLUMN "public_summary"`);
        await queryRunner.query(`ALTER TABLE "studies" DROP COLUMN "recruiting"`);
        await queryRunner.query(`DROP INDEX "public"."IDX_3ad6a797363e96ca8379d00fe6"`);
        await queryRunner.query(`DROP TABLE "screenings"`);
        await queryRunner.query(`DROP INDEX "public"."IDX_38ee4d0269d38bd007e5892938"`);
        await queryRunner.query(`DROP TABLE "screening_questionnaires"`);
        await queryRunner.query(`DROP INDEX "public"."IDX_052ca8d0a42c6e5d2f94fbe897"`);
        await queryRunner.query(`DROP TABLE "participant_events"`);
        await queryRunner.query(`DROP TABLE "participant_contacts"`);
        await queryRunner.query(`DROP INDEX "public"."IDX_f2b8ab24643b45459c65395ce6"`);
        await queryRunner.query(`DROP INDEX "public"."IDX_f58dfdb86e04c9513c3785a1c1"`);
        await queryRunner.query(`DROP INDEX "public"."IDX_45791dcd021339f23a4ae23432"`);
        await queryRunner.query(`DROP TABLE "participants"`);
    }

}
