import { MigrationInterface, QueryRunner } from "typeorm";

/**
 * Interviews and transcripts: interview guides, interviews in UTC with both time zones, transcript
 * versions with their review flags, speaker turns, the anonymisation log and the study's placeholders.
 */
export class InterviewsTranscripts1796153161375 implements MigrationInterface {
    name = 'InterviewsTranscripts1796153161375'

    public async up(queryRunner: QueryRunner): Promise<void> {
        await queryRunner.query(`CREATE TABLE "interview_guides" ("id" uuid NOT NULL DEFAULT gen_random_uuid(), "created_at" TIMESTAMP WITH TIME ZONE NOT NULL DEFAULT now(), "updated_at" TIMESTAMP WITH TIME ZONE NOT NULL DEFAULT now(), "study_id" uuid NOT NULL, "label" character varying(60) NOT NULL, "approval_date" date NOT NULL, "text" text NOT NULL, "file_key" character varying(200) NOT NULL, "file_name" character varying(200) NOT NULL, "file_content_type" character varying(120) NOT NULL, "file_size" integer NOT NULL, "file_sha256" character(64) NOT NULL, CONSTRAINT "PK_da44f3839b7ffa170623282ed9d" PRIMARY KEY ("id"))`);
        await queryRunner.query(`CREATE INDEX "IDX_63104170ca57aa05924d5b76dc" ON "interview_guides"  ("study_id", "created_at") `);
        await queryRunner.query(`CREATE TABLE "interviews" ("id" uuid NOT NULL DEFAULT gen_random_uuid(), "created_at" TIMESTAMP WITH TIME ZONE NOT NULL DEFAULT now(), "updated_at" TIMESTAMP WITH TIME ZONE NOT NULL DEFAULT now(), "study_id" uuid NOT NULL, "participant_id" uuid NOT NULL, "scheduled_at" TIMESTAMP WITH TIME ZONE NOT NULL, "participant_time_zone" character varying(60) NOT NULL, "interviewer_id" uuid NOT NULL, "interviewer_time_zone" character varying(60) NOT NULL, "mode" character varying(20) NOT NULL, "planned_minutes" integer NOT NULL, "actual_minutes" integer, "guide_id" uuid, "field_notes" text NOT NULL DEFAULT '', "status" character varying(20) NOT NULL DEFAULT 'scheduled', "notes_only" boolean NOT NULL DEFAULT false, "calendar_sequence" integer NOT NULL DEFAULT '0', CONSTRAINT "PK_fd41af1f96d698fa33c2f070f47" PRIMARY KEY ("id"))`);
        await queryRunner.query(`CREATE INDEX "IDX_36c7a5a66a9d05fd14e66cb448" ON "interviews"  ("participant_id") `);
        await queryRunner.query(`CREATE INDEX "IDX_55a941201d82a6c4bed43ee43c" ON "interviews"  ("study_id", "scheduled_at") `);
        await queryRunner.query(`CREATE TABLE "anonymisation_log" ("id" uuid NOT NULL DEFAULT gen_random_uuid(), "at" TIMESTAMP WITH TIME ZONE NOT NULL DEFAULT now(), "study_id" uuid NOT NULL, "transcript_id" uuid NOT NULL, "original" character varying(300) NOT NULL, "placeholder" character varying(40) NOT NULL, "category" character varying(30) NOT NULL, "by_id" uuid, "by_name" character varying(120), CONSTRAINT "PK_8d96c55296fa6c505d9e600f76b" PRIMARY KEY ("id"))`);
        await queryRunner.query(`CREATE INDEX "IDX_e8366456ea1d05de409542411f" ON "anonymisation_log"  ("study_id", "at") `);
        await queryRunner.query(`CREATE TABLE "transcript_turns" ("id" uuid NOT NULL DEFAULT gen_random_uuid(), "transcript_id" uuid NOT NULL, "position" integer NOT NULL, "speaker" character varying(80) NOT NULL, "start_ms" integer, "start_offset" integer NOT NULL, "end_offset" integer NOT NULL, CONSTRAINT "PK_595f6149bccd5471aca8bff5baa" PRIMARY KEY ("id"))`);
        await queryRunner.query(`CREATE UNIQUE INDEX "IDX_0c94a366b5135cfe0090004572" ON "transcript_turns"  ("transcript_id", "position") `);
        await queryRunner.query(`CREATE TABLE "transcripts" ("id" uuid NOT NULL DEFAULT gen_random_uuid(), "created_at" TIMESTAMP WITH TIME ZONE NOT NULL DEFAULT now(), "updated_at" TIMESTAMP WITH TIME ZONE NOT NULL DEFAULT now(), "study_id" uuid NOT NULL, "interview_id" uuid NOT NULL, "participant_id" uuid NOT NULL, "version" integer NOT NULL, "status" character varying(20) NOT NULL DEFAULT 'in_review', "format" character varying(10) NOT NULL, "word_count" integer NOT NULL DEFAULT '0', "quarantine_prefix" character varying(200), "flags" jsonb NOT NULL DEFAULT '[]', "object_key" character varying(200), "sha256" character(64), "uploaded_by_id" uuid, "approved_by_id" uuid, "approved_at" TIMESTAMP WITH TIME ZONE, CONSTRAINT "PK_40c75f89c1fc953cd33e702247d" PRIMARY KEY ("id"))`);
        await queryRunner.query(`CREATE INDEX "IDX_39bb5beb5a4953857f0cdc3e5e" ON "transcripts"  ("study_id", "status") `);
        await queryRunner.query(`CREATE UNIQUE INDEX "IDX_c1f6b6bd7fab3e2e7e6d6b76da" ON "transcripts"  ("interview_id", "version") `);
        await queryRunner.query(`ALTER TABLE "studies" ADD "placeholder_registry" jsonb NOT NULL DEFAULT '{}'`);
    }

    public async down(queryRunner: QueryRunner): Promise<void> {
        await queryRunner.query(`ALTER TABLE "studies" DROP COLUMN "placeholder_registry"`);
        await queryRunner.query(`DROP INDEX "public"."IDX_c1f6b6bd7fab3e2e7e6d6b76da"`);
        await queryRunner.query(`DROP INDEX "public"."IDX_39bb5beb5a4953857f0cdc3e5e"`);
        await queryRunner.query(`DROP TABLE "transcripts"`);
        await queryRunner.query(`DROP INDEX "public"."IDX_0c94a366b5135cfe0090004572"`);
        await queryRunner.query(`DROP TABLE "transcript_turns"`);
        await queryRunner.query(`DROP INDEX "public"."IDX_e8366456ea1d05de409542411f"`);
        await queryRunner.query(`DROP TABLE "anonymisation_log"`);
        await queryRunner.query(`DROP INDEX "public"."IDX_55a941201d82a6c4bed43ee43c"`);
        await queryRunner.query(`DROP INDEX "public"."IDX_36c7a5a66a9d05fd14e66cb448"`);
        await queryRunner.query(`DROP TABLE "interviews"`);
        await queryRunner.query(`DROP INDEX "public"."IDX_63104170ca57aa05924d5b76dc"`);
        await queryRunner.query(`DROP TABLE "interview_guides"`);
    }

}
