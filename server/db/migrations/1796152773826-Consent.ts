import { MigrationInterface, QueryRunner } from "typeorm";

/**
 * Consent: form versions, immutable consent records (a trigger refuses UPDATE and DELETE), single-use
 * e-consent links, withdrawals and participants' withdrawal requests; e-mail attachments.
 */
export class Consent1796152773826 implements MigrationInterface {
    name = 'Consent1796152773826'

    public async up(queryRunner: QueryRunner): Promise<void> {
        await queryRunner.query(`CREATE TABLE "consent_forms" ("id" uuid NOT NULL DEFAULT gen_random_uuid(), "created_at" TIMESTAMP WITH TIME ZONE NOT NULL DEFAULT now(), "updated_at" TIMESTAMP WITH TIME ZONE NOT NULL DEFAULT now(), "study_id" uuid NOT NULL, "label" character varying(60) NOT NULL, "status" character varying(20) NOT NULL DEFAULT 'draft', "ethics_approval_date" date NOT NULL, "effective_date" date NOT NULL, "clauses" jsonb NOT NULL DEFAULT '[]', "text" text NOT NULL, "file_key" character varying(200) NOT NULL, "file_name" character varying(200) NOT NULL, "file_content_type" character varying(120) NOT NULL, "file_size" integer NOT NULL, "file_sha256" character(64) NOT NULL, "document_sha256" character(64) NOT NULL, "checklist" jsonb NOT NULL DEFAULT '{}', "approved_at" TIMESTAMP WITH TIME ZONE, "approved_by_id" uuid, "created_by_id" uuid, CONSTRAINT "PK_21e48a8207e5982a229cf6f01e3" PRIMARY KEY ("id"))`);
        await queryRunner.query(`CREATE INDEX "IDX_d8f6d49e5f9c0119ecc074c372" ON "consent_forms"  ("study_id", "status") `);
        await queryRunner.query(`CREATE TABLE "consent_links" ("id" uuid NOT NULL DEFAULT gen_random_uuid(), "created_at" TIMESTAMP WITH TIME ZONE NOT NULL DEFAULT now(), "updated_at" TIMESTAMP WITH TIME ZONE NOT NULL DEFAULT now(), "study_id" uuid NOT NULL, "participant_id" uuid NOT NULL, "form_id" uuid NOT NULL, "token_hash" character(64) NOT NULL, "expires_at" TIMESTAMP WITH TIME ZONE NOT NULL, "used_at" TIMESTAMP WITH TIME ZONE, "revoked_at" TIMESTAMP WITH TIME ZONE, "created_by_id" uuid, CONSTRAINT "PK_7a3aacd1d85f2d1b930bfd446b9" PRIMARY KEY ("id"))`);
        await queryRunner.query(`CREATE UNIQUE INDEX "IDX_9f688d4cd06d45c753e39610ac" ON "consent_links"  ("token_hash") `);
        await queryRunner.query(`CREATE INDEX "IDX_973065de1013d75485b3cec1c1" ON "consent_links"  ("participant_id", "created_at") `);
        await queryRunner.query(`CREATE TABLE "consent_records" ("id" uuid NOT NULL, "created_at" TIMESTAMP WITH TIME ZONE NOT NULL DEFAULT now(), "study_id" uuid NOT NULL, "participant_id" uuid NOT NULL, "form_id" uuid NOT NULL, "method" character varying(20) NOT NULL, "clauses" jsonb NOT NULL, "signer_name" character varying(120) NOT NULL, "signed_at" TIMESTAMP WITH TIME ZONE NOT NULL, "meaning" character varying(300) NOT NULL, "obtained_by_id" uuid, "obtained_by_name" character varying(120), "witness_name" character varying(120) NOT NULL DEFAULT '', "document_sha256" character(64) NOT NULL, "signed_file_key" character varying(200), "signed_file_name" character varying(200), "signed_file_sha256" character(64), "receipt_key" character varying(200), "address_hash" character(64), "user_agent" character varying(300), "withdrawal_token_hash" character(64), "corrects_id" uuid, "note" text NOT NULL DEFAULT '', CONSTRAINT "PK_030be152eaa44998166470b2ccc" PRIMARY KEY ("id"))`);
        await queryRunner.query(`CREATE UNIQUE INDEX "IDX_15e5570e32840a461547d5f947" ON "consent_records"  ("withdrawal_token_hash") WHERE withdrawal_token_hash IS NOT NULL`);
        await queryRunner.query(`CREATE INDEX "IDX_8d6495d384b27c744eac9a6bc1" ON "consent_records"  ("participant_id", "signed_at") `);
        await queryRunner.query(`CREATE TABLE "withdrawals" ("id" uuid NOT NULL DEFAULT gen_random_uuid(), "created_at" TIMESTAMP WITH TIME ZONE NOT NULL DEFAULT now(), "study_id" uuid NOT NULL, "participant_id" uuid NOT NULL, "scope" character varying(20) NOT NULL, "effective_date" date NOT NULL, "reason" text NOT NULL DEFAULT '', "within_deadline" boolean NOT NULL, "data_removed" boolean NOT NULL, "decision_note" text NOT NULL DEFAULT '', "recorded_by_id" uuid, "recorded_by_name" character varying(120), CONSTRAINT "PK_9871ec481baa7755f8bd8b7c7e9" PRIMARY KEY ("id"))`);
        await queryRunner.query(`CREATE UNIQUE INDEX "IDX_9f23b5fdc4745bdca4c695d73d" ON "withdrawals"  ("participant_id") `);
        await queryRunner.query(`CREATE TABLE "withdrawal_requests" ("id" uuid NOT NULL DEFAULT gen_random_uuid(), "requested_at" TIMESTAMP WITH TIME ZONE NOT NULL DEFAULT now(), "study_id" uuid NOT NULL, "participant_id" uuid NOT NULL, "scope" character varying(20) NOT NULL, "reason" text NOT NULL DEFAULT '', "status" character varying(20) NOT NULL DEFAULT 'open', CONSTRAINT "PK_e1b3734a3f3cbd46bf0ad7eedb6" PRIMARY KEY ("id"))`);
        await queryRunner.query(`CREATE INDEX "IDX_43dcdad8a90b2252ab88269209" ON "withdrawal_requests"  ("study_id", "status") `);
        await queryRunner.query(`ALTER TABLE "mail_outbox" ADD "attachments" jsonb NOT NULL DEFAULT '[]'`);
        await queryRunner.query(`CREATE FUNCTION consent_records_refuse_change() RETURNS trigger LANGUAGE plpgsql AS $$
            BEGIN
                RAISE EXCEPTION 'consent records are immutable: % is not allowed; record a correction instead', TG_OP
                    USING ERRCODE = 'insufficient_privilege';
            END $$`);
        await queryRunner.query(`CREATE TRIGGER consent_records_immutable BEFORE UPDATE OR DELETE ON "consent_records" FOR EACH ROW EXECUTE FUNCTION consent_records_refuse_change()`);
    }

    public async down(queryRunner: QueryRunner): Promise<void> {
        await queryRunner.query(`DROP TRIGGER "consent_records_immutable" ON "consent_records"`);
        await queryRunner.query(`DROP FUNCTION consent_records_refuse_change()`);
        await queryRunner.query(`ALTER TABLE "mail_outbox" DROP COLUMN "attachments"`);
        await queryRunner.query(`DROP INDEX "public"."IDX_43dcdad8a90b2252ab88269209"`);
        await queryRunner.query(`DROP TABLE "withdrawal_requests"`);
        await queryRunner.query(`DROP INDEX "public"."IDX_9f23b5fdc4745bdca4c695d73d"`);
        await queryRunner.query(`DROP TABLE "withdrawals"`);
        await queryRunner.query(`DROP INDEX "public"."IDX_8d6495d384b27c744eac9a6bc1"`);
        await queryRunner.query(`DROP INDEX "public"."IDX_15e5570e32840a461547d5f947"`);
        await queryRunner.query(`DROP TABLE "consent_records"`);
        await queryRunner.query(`DROP INDEX "public"."IDX_973065de1013d75485b3cec1c1"`);
        await queryRunner.query(`DROP INDEX "public"."IDX_9f688d4cd06d45c753e39610ac"`);
        await queryRunner.query(`DROP TABLE "consent_links"`);
        await queryRunner.query(`DROP INDEX "public"."IDX_d8f6d49e5f9c0119ecc074c372"`);
        await queryRunner.query(`DROP TABLE "consent_forms"`);
    }

}
