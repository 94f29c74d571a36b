import { MigrationInterface, QueryRunner } from "typeorm";

/** Coding: codes, excerpts and their codes, memos, codebook snapshots, full-text search of turns, excerpts and memos. */

export class Coding1796157377152 implements MigrationInterface {
    name = 'Coding1796157377152'

    public async up(queryRunner: QueryRunner): Promise<void> {
        await queryRunner.query(`CREATE TABLE "codebook_snapshots" ("id" uuid NOT NULL DEFAULT gen_random_uuid(), "created_at" TIMESTAMP WITH TIME ZONE NOT NULL DEFAULT now(), "updated_at" TIMESTAMP WITH TIME ZONE NOT NULL DEFAULT now(), "study_id" uuid NOT NULL, "name" character varying(120) NOT NULL, "codes" jsonb NOT NULL, "created_by_id" uuid, "created_by_name" character varying(200) NOT NULL DEFAULT '', CONSTRAINT "PK_49f1df8950598885c89dc3332a7" PRIMARY KEY ("id"))`);
        await queryRunner.query(`CREATE INDEX "IDX_3b90a59d60805075d1eb1826ff" ON "codebook_snapshots"  ("study_id", "created_at") `);
        await queryRunner.query(`CREATE TABLE "codes" ("id" uuid NOT NULL DEFAULT gen_random_uuid(), "created_at" TIMESTAMP WITH TIME ZONE NOT NULL DEFAULT now(), "updated_at" TIMESTAMP WITH TIME ZONE NOT NULL DEFAULT now(), "study_id" uuid NOT NULL, "parent_id" uuid, "position" integer NOT NULL DEFAULT '0', "label" character varying(80) NOT NULL, "definition" text NOT NULL DEFAULT '', "when_to_use" text NOT NULL DEFAULT '', "when_not_to_use" text NOT NULL DEFAULT '', "example_excerpt_id" uuid, "colour" character varying(7) NOT NULL, "status" character varying(10) NOT NULL DEFAULT 'active', "merged_into_id" uuid, "version" integer NOT NULL DEFAULT '1', CONSTRAINT "PK_9b85c624e2d705f4e8a9b64dbf4" PRIMARY KEY ("id"))`);
        await queryRunner.query(`CREATE INDEX "IDX_d644688071baa6cee4c6d48600" ON "codes"  ("study_id", "parent_id", "position") `);
        await queryRunner.query(`CREATE TABLE "excerpts" ("id" uuid NOT NULL DEFAULT gen_random_uuid(), "created_at" TIMESTAMP WITH TIME ZONE NOT NULL DEFAULT now(), "updated_at" TIMESTAMP WITH TIME ZONE NOT NULL DEFAULT now(), "study_id" uuid NOT NULL, "transcript_id" uuid NOT NULL, "participant_id" uuid NOT NULL, "coder_id" uuid NOT NULL, "start_offset" integer NOT NULL, "end_offset" integer NOT NULL, "text" text NOT NULL, "version" integer NOT NULL DEFAULT '1', CONSTRAINT "PK_9c4e6a19f792cb0e7425cd4edaa" PRIMARY KEY ("id"))`);
        await queryRunner.query(`CREATE INDEX "IDX_0deec4760d5b7bf756986b5881" ON "excerpts"  ("study_id", "coder_id") `);
        await queryRunner.query(`CREATE INDEX "IDX_dd1b5a72ef9cf4f5d39115cdb0" ON "excerpts"  ("transcript_id", "coder_id") `);
        await queryRunner.query(`CREATE TABLE "excerpt_codes" ("excerpt_id" uuid NOT NULL, "code_id" uuid NOT NULL, CONSTRAINT "PK_ff08bcfcaecc0ef20fbe0072f3f" PRIMARY KEY ("excerpt_id", "code_id"))`);
        await queryRunner.query(`CREATE INDEX "IDX_b7473e81a7d0bad94b2d056b1f" ON "excerpt_codes"  ("code_id") `);
        await queryRunner.query(`CREATE TABLE "memos" ("id" uuid NOT NULL DEFAULT gen_random_uuid(), "created_at" TIMESTAMP WITH TIME ZONE NOT NULL DEFAULT now(), "updated_at" TIMESTAMP WITH TIME ZONE NOT NULL DEFAULT now(), "study_id" uuid NOT NULL, "target_type" character varying(12) NOT NULL, "target_id" uuid, "body" text NOT NULL, "author_id" uuid NOT NULL, "version" integer NOT NULL DEFAULT '1', CONSTRAINT "PK_5f005ade603ff6ea114dcacde0b" PRIMARY KEY ("id"))`);
        await queryRunner.query(`CREATE INDEX "IDX_1998660aef46ced3f5be6b3d1b" ON "memos"  ("study_id", "target_type", "target_id") `);
        await queryRunner.query(`ALTER TABLE "transcript_turns" ADD "text" text`);
        await queryRunner.query(`ALTER TABLE "studies" ADD "coder_comparison" boolean NOT NULL DEFAULT false`);
        await queryRunner.query(`ALTER TABLE "codebook_snapshots" ADD CONSTRAINT "FK_bd2efb923aee84a37265b9dbaf6" FOREIGN KEY ("study_id") REFERENCES "studies"("id") ON DELETE CASCADE ON UPDATE NO ACTION`);
        await queryRunner.query(`ALTER TABLE "codes" ADD CONSTRAINT "FK_c712b671badc5827e8b17df5591" FOREIGN KEY ("study_id") REFERENCES "studies"("id") ON DELETE CASCADE ON UPDATE NO ACTION`);
        await queryRunner.query(`ALTER TABLE "codes" ADD CONSTRAINT "FK_3c7a02108b15c62c212310325bb" FOREIGN KEY ("parent_id") REFERENCES "codes"("id") ON DELETE SET NULL ON UPDATE NO ACTION`);
        await queryRunner.query(`ALTER TABLE "excerpts" ADD CONSTRAINT "FK_21ed4799eac2c0198991bd75699" FOREIGN KEY ("transcript_id") REFERENCES "transcripts"("id") ON DELETE CASCADE ON UPDATE NO ACTION`);
        await queryRunner.query(`ALTER TABLE "excerpts" ADD CONSTRAINT "FK_31824def7e2e9d3a8109a641834" FOREIGN KEY ("coder_id") REFERENCES "users"("id") ON DELETE RESTRICT ON UPDATE NO ACTION`);
        await queryRunner.query(`ALTER TABLE "excerpt_codes" ADD CONSTRAINT "FK_54a2b587f24485c294e7b9a075a" FOREIGN KEY ("excerpt_id") REFERENCES "excerpts"("id") ON DELETE CASCADE ON UPDATE NO ACTION`);
        await queryRunner.query(`ALTER TABLE "excerpt_codes" ADD CONSTRAINT "FK_b7473e81a7d0bad94b2d056b1fb" FOREIGN KEY ("code_id") REFERENCES "codes"("id") ON DELETE RESTRICT ON UPDATE NO ACTION`);
        await queryRunner.query(`ALTER TABLE "memos" ADD CONSTRAINT "FK_84df05f20663ee9311b5c14cd38" FOREIGN KEY ("study_id") REFERENCES "studies"("id") ON DELETE CASCADE ON UPDATE NO ACTION`);
        await queryRunner.query(`ALTER TABLE "memos" ADD CONSTRAINT "FK_cd28863615ecc67d4597c5da9f4" FOREIGN KEY ("author_id") REFERENCES "users"("id") ON DELETE RESTRICT ON UPDATE NO ACTION`);
        // written by hand (TypeORM cannot express them): case-insensitive unique labels among codes that are not merged, and full-text indexes
        await queryRunner.query(`CREATE UNIQUE INDEX "codes_study_label_unique" ON "codes" ("study_id", lower("label")) WHERE "status" <> 'merged'`);
        await queryRunner.query(`CREATE INDEX "excerpts_search_idx" ON "excerpts" USING GIN (to_tsvector('english', "text"))`);
        await queryRunner.query(`CREATE INDEX "memos_search_idx" ON "memos" USING GIN (to_tsvector('english', "body"))`);
        await queryRunner.query(`CREATE INDEX "transcript_turns_search_idx" ON "transcript_turns" USING GIN (to_tsvector('english', coalesce("text", '')))`);
    }

    public async down(queryRunner: QueryRunner): Promise<void> {
        await queryRunner.query(`DROP INDEX "transcript_turns_search_idx"`);
        await queryRunner.query(`DROP INDEX "memos_search_idx"`);
        await queryRunner.query(`DROP INDEX "excerpts_search_idx"`);
        await queryRunner.query(`DROP INDEX "codes_study_label_unique"`);
        await queryRunner.query(`ALTER TABLE "memos" DROP CONSTRAINT "FK_cd28863615ecc67d4597c5da9f4"`);
        await queryRunner.query(`ALTER TABLE "memos" DROP CONSTRAINT "FK_84df05f20663ee9311b5c14cd38"`);
        await queryRunner.query(`ALTER TABLE "excerpt_codes" DROP CONSTRAINT "FK_b7473e81a7d0bad94b2d056b1fb"`);
        await queryRunner.query(`ALTER TABLE "excerpt_codes" DROP CONSTRAINT "FK_54a2b587f24485c294e7b9a075a"`);
        await queryRunner.query(`ALTER TABLE "excerpts" DROP CONSTRAINT "FK_31824def7e2e9d3a8109a641834"`);
        await queryRunner.query(`ALTER TABLE "excerpts" DROP CONSTRAINT "FK_21ed4799eac2c0198991bd75699"`);
        await queryRunner.query(`ALTER TABLE "codes" DROP CONSTRAINT "FK_3c7a02108b15c62c212310325bb"`);
        await queryRunner.query(`ALTER TABLE "codes" DROP CONSTRAINT "FK_c712b671badc5827e8b17df5591"`);
        await queryRunner.query(`ALTER TABLE "codebook_snapshots" DROP CONSTRAINT "FK_bd2efb923aee84a37265b9dbaf6"`);
        await queryRunner.query(`ALTER TABLE "studies" DROP COLUMN "coder_comparison"`);
        await queryRunner.query(`ALTER TABLE "transcript_turns" DROP COLUMN "text"`);
        await queryRunner.query(`DROP INDEX "public"."IDX_1998660aef46ced3f5be6b3d1b"`);
        await queryRunner.query(`DROP TABLE "memos"`);
        await queryRunner.query(`DROP INDEX "public"."IDX_b7473e81a7d0bad94b2d056b1f"`);
        await queryRunner.query(`DROP TABLE "excerpt_codes"`);
        await queryRunner.query(`DROP INDEX "public"."IDX_dd1b5a72ef9cf4f5d39115cdb0"`);
        await queryRunner.query(`DROP INDEX "public"."IDX_0deec4760d5b7bf756986b5881"`);
        await queryRunner.query(`DROP TABLE "excerpts"`);
        await queryRunner.query(`DROP INDEX "public"."IDX_d644688071baa6cee4c6d48600"`);
        await queryRunner.query(`DROP TABLE "codes"`);
        await queryRunner.query(`DROP INDEX "public"."IDX_3b90a59d60805075d1eb1826ff"`);
        await queryRunner.query(`DROP TABLE "codebook_snapshots"`);
    }

}
