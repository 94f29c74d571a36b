import { MigrationInterface, QueryRunner } from "typeorm";

/** Themes (codes, chosen excerpts), review rounds with patient partners, their answers and the team's responses. */

export class ThemesReview1796161242004 implements MigrationInterface {
    name = 'ThemesReview1796161242004'

    public async up(queryRunner: QueryRunner): Promise<void> {
        await queryRunner.query(`CREATE TABLE "review_rounds" ("id" uuid NOT NULL DEFAULT gen_random_uuid(), "created_at" TIMESTAMP WITH TIME ZONE NOT NULL DEFAULT now(), "updated_at" TIMESTAMP WITH TIME ZONE NOT NULL DEFAULT now(), "study_id" uuid NOT NULL, "title" character varying(160) NOT NULL, "closes_on" date NOT NULL, "status" character varying(10) NOT NULL DEFAULT 'open', "show_characteristics" jsonb NOT NULL DEFAULT '[]', "message" text NOT NULL DEFAULT '', "closed_at" TIMESTAMP WITH TIME ZONE, CONSTRAINT "PK_af804477416b76c82c10774be17" PRIMARY KEY ("id"))`);
        await queryRunner.query(`CREATE INDEX "IDX_c8c52d666d77d105cbacbba969" ON "review_rounds"  ("study_id", "created_at") `);
        await queryRunner.query(`CREATE TABLE "review_round_themes" ("round_id" uuid NOT NULL, "theme_id" uuid NOT NULL, "theme_name" character varying(120) NOT NULL, "position" integer NOT NULL DEFAULT '0', CONSTRAINT "PK_018164e0d5d9086d1e101f8e6ed" PRIMARY KEY ("round_id", "theme_id"))`);
        await queryRunner.query(`CREATE TABLE "partner_answers" ("id" uuid NOT NULL DEFAULT gen_random_uuid(), "created_at" TIMESTAMP WITH TIME ZONE NOT NULL DEFAULT now(), "updated_at" TIMESTAMP WITH TIME ZONE NOT NULL DEFAULT now(), "round_id" uuid NOT NULL, "theme_id" uuid NOT NULL, "partner_id" uuid NOT NULL, "verdict" character varying(20), "comment" text NOT NULL DEFAULT '', "note" text NOT NULL DEFAULT '', "share_note" boolean NOT NULL DEFAULT false, "submitted_at" TIMESTAMP WITH TIME ZONE, "response" text NOT NULL DEFAULT '', "responded_at" TIMESTAMP WITH TIME ZONE, CONSTRAINT "PK_c7efe94eaf3529f2faf37c30ff3" PRIMARY KEY ("id"))`);
        await queryRunner.query(`CREATE UNIQUE INDEX "IDX_d26c90cd9beb61b7cda7c86ee6" ON "partner_answers"  ("round_id", "theme_id", "partner_id") `);
        await queryRunner.query(`CREATE TABLE "themes" ("id" uuid NOT NULL DEFAULT gen_random_uuid(), "created_at" TIMESTAMP WITH TIME ZONE NOT NULL DEFAULT now(), "updated_at" TIMESTAMP WITH TIME ZONE NOT NULL DEFAULT now(), "study_id" uuid NOT NULL, "parent_id" uuid, "position" integer NOT NULL DEFAULT '0', "name" character varying(120) NOT NULL, "description" text NOT NULL DEFAULT '', "plain_description" text NOT NULL DEFAULT '', "status" character varying(20) NOT NULL DEFAULT 'draft', "version" integer NOT NULL DEFAULT '1', CONSTRAINT "PK_ddbeaab913c18682e5c88155592" PRIMARY KEY ("id"))`);
        await queryRunner.query(`CREATE INDEX "IDX_2f8f38edd3d0d00f6aafc2cbfb" ON "themes"  ("study_id", "parent_id", "position") `);
        await queryRunner.query(`CREATE TABLE "theme_codes" ("theme_id" uuid NOT NULL, "code_id" uuid NOT NULL, CONSTRAINT "PK_93cf8a966925f9c44eef1e43f89" PRIMARY KEY ("theme_id", "code_id"))`);
        await queryRunner.query(`CREATE TABLE "theme_excerpts" ("theme_id" uuid NOT NULL, "excerpt_id" uuid NOT NULL, "share_with_partners" boolean NOT NULL DEFAULT false, "position" integer NOT NULL DEFAULT '0', CONSTRAINT "PK_77853ca7d23264546469afe46d3" PRIMARY KEY ("theme_id", "excerpt_id"))`);
        await queryRunner.query(`ALTER TABLE "review_rounds" ADD CONSTRAINT "FK_ea5bcf55b52bc9731767973cbd4" FOREIGN KEY ("study_id") REFERENCES "studies"("id") ON DELETE CASCADE ON UPDATE NO ACTION`);
        await queryRunner.query(`ALTER TABLE "review_round_themes" ADD CONSTRAINT "FK_fe21afead5ebe840b765b65db1b" FOREIGN KEY ("round_id") REFERENCES "review_rounds"("id") ON DELETE CASCADE ON UPDATE NO ACTION`);
        await queryRunner.query(`ALTER TABLE "partner_answers" ADD CONSTRAINT "FK_0ee245d4437b13f0c9396abe3b9" FOREIGN KEY ("round_id") REFERENCES "review_rounds"("id") ON DELETE CASCADE ON UPDATE NO ACTION`);
        await queryRunner.query(`ALTER TABLE "partner_answers" ADD CONSTRAINT "FK_334d0c86f88707e249b67530f16" FOREIGN KEY ("partner_id") REFERENCES "users"("id") ON DELETE CASCADE ON UPDATE NO ACTION`);
        await queryRunner.query(`ALTER TABLE "themes" ADD CONSTRAINT "FK_699d8ee8854414604d229670e09" FOREIGN KEY ("study_id") REFERENCES "studies"("id") ON DELETE CASCADE ON UPDATE NO ACTION`);
        await queryRunner.query(`ALTER TABLE "themes" ADD CONSTRAINT "FK_a62dbd367841f6720b2af373943" FOREIGN KEY ("parent_id") REFERENCES "themes"("id") ON DELETE SET NULL ON UPDATE NO ACTION`);
        await queryRunner.query(`ALTER TABLE "theme_codes" ADD CONSTRAINT "FK_371e7e472a4ccb68c6a364bed6e" FOREIGN KEY ("theme_id") REFERENCES "themes"("id") ON DELETE CASCADE ON UPDATE NO ACTION`);
        await queryRunner.query(`ALTER TABLE "theme_codes" ADD CONSTRAINT "FK_5acb56ef1de8f193a3c15c6d4b0" FOREIGN KEY ("code_id") REFERENCES "codes"("id") ON DELETE CASCADE ON UPDATE NO ACTION`);
        await queryRunner.query(`ALTER TABLE "theme_excerpts" ADD CONSTRAINT "FK_873c981b91d4aa16e38efad6e59" FOREIGN KEY ("theme_id") REFERENCES "themes"("id") ON DELETE CASCADE ON UPDATE NO ACTION`);
        await queryRunner.query(`ALTER TABLE "theme_excerpts" ADD CONSTRAINT "FK_658546e6e93978403dc51b6e30f" FOREIGN KEY ("excerpt_id") REFERENCES "excerpts"("id") ON DELETE CASCADE ON UPDATE NO ACTION`);
    }

    public async down(queryRunner: QueryRunner): Promise<void> {
        await queryRunner.query(`ALTER TABLE "theme_excerpts" DROP CONSTRAINT "FK_658546e6e93978403dc51b6e30f"`);
        await queryRunner.query(`ALTER TABLE "theme_excerpts" DROP CONSTRAINT "FK_873c981b91d4aa16e38efad6e59"`);
        await queryRunner.query(`ALTER TABLE "theme_codes" DROP CONSTRAINT "FK_5acb56ef1de8f193a3c15c6d4b0"`);
        await queryRunner.query(`ALTER TABLE "theme_codes" DROP CONSTRAINT "FK_371e7e472a4ccb68c6a364bed6e"`);
        await queryRunner.query(`ALTER TABLE "themes" DROP CONSTRAINT "FK_a62dbd367841f6720b2af373943"`);
        await queryRunner.query(`ALTER TABLE "themes" DROP CONSTRAINT "FK_699d8ee8854414604d229670e09"`);
        await queryRunner.query(`ALTER TABLE "partner_answers" DROP CONSTRAINT "FK_334d0c86f88707e249b67530f16"`);
        await queryRunner.query(`ALTER TABLE "partner_answers" DROP CONSTRAINT "FK_0ee245d4437b13f0c9396abe3b9"`);
        await queryRunner.query(`ALTER TABLE "review_round_themes" DROP CONSTRAINT "FK_fe21afead5ebe840b765b65db1b"`);
        await queryRunner.query(`ALTER TABLE "review_rounds" DROP CONSTRAINT "FK_ea5bcf55b52bc9731767973cbd4"`);
        await queryRunner.query(`DROP TABLE "theme_excerpts"`);
        await queryRunner.query(`DROP TABLE "theme_codes"`);
        await queryRunner.query(`DROP INDEX "public"."IDX_2f8f38edd3d0d00f6aafc2cbfb"`);
        await queryRunner.query(`DROP TABLE "themes"`);
        await queryRunner.query(`DROP INDEX "public"."IDX_d26c90cd9beb61b7cda7c86ee6"`);
        await queryRunner.query(`DROP TABLE "partner_answers"`);
        await queryRunner.query(`DROP TABLE "review_round_themes"`);
        await queryRunner.query(`DROP INDEX "public"."IDX_c8c52d666d77d105cbacbba969"`);
        await queryRunner.query(`DROP TABLE "review_rounds"`);
    }

}
