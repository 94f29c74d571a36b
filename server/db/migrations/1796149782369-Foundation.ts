import { MigrationInterface, QueryRunner } from "typeorm";

/**
 * The first schema: accounts, studies and memberships, invitations, password-reset tokens, the e-mail
 * outbox, the append-only audit trail (a trigger refuses UPDATE, DELETE and TRUNCATE), the session
 * table of connect-pg-simple and the shared sign-in throttling table of rate-limiter-flexible.
 */
export class Foundation1796149782369 implements MigrationInterface {
    name = 'Foundation1796149782369'

    public async up(queryRunner: QueryRunner): Promise<void> {
        await queryRunner.query(`CREATE TABLE "audit_events" ("id" BIGSERIAL NOT NULL, "at" TIMESTAMP WITH TIME ZONE NOT NULL DEFAULT now(), "study_id" uuid, "actor_id" uuid, "actor_email" character varying(254), "action" character varying(60) NOT NULL, "target_type" character varying(40), "target_id" character varying(64), "ip" character varying(64), "details" jsonb NOT NULL DEFAULT '{}', CONSTRAINT "PK_910f64d901a5c3e9878f0d4a407" PRIMARY KEY ("id"))`);
        await queryRunner.query(`CREATE INDEX "IDX_ffa62e8d8b31e6734a233b84ab" ON "audit_events"  ("study_id", "at") `);
        await queryRunner.query(`CREATE TABLE "users" ("id" uuid NOT NULL DEFAULT gen_random_uuid(), "created_at" TIMESTAMP WITH TIME ZONE NOT NULL DEFAULT now(), "updated_at" TIMESTAMP WITH TIME ZONE NOT NULL DEFAULT now(), "email" character varying(254) NOT NULL, "name" character varying(120) NOT NULL, "password_hash" character varying(255), "site_admin" boolean NOT NULL DEFAULT false, "disabled" boolean NOT NULL DEFAULT false, "password_changed_at" TIMESTAMP WITH TIME ZONE, CONSTRAINT "PK_a3ffb1c0c8416b9fc6f907b7433" PRIMARY KEY ("id"))`);
        await queryRunner.query(`CREATE UNIQUE INDEX "IDX_97672ac88f789774dd47f7c8be" ON "users"  ("email") `);
        await queryRunner.query(`CREATE TABLE "password_reset_tokens" ("id" uuid NOT NULL DEFAULT gen_random_uuid(), "created_at" TIMESTAMP WITH TIME ZONE NOT NULL DEFAULT now(), "updated_at" TIMESTAMP WITH TIME ZONE NOT NULL DEFAULT now(), "user_id" uuid NOT NULL, "token_hash" character(64) NOT NULL, "expires_at" TIMESTAMP WITH TIME ZONE NOT NULL, "used_at" TIMESTAMP WITH TIME ZONE, CONSTRAINT "PK_d16bebd73e844c48bca50ff8d3d" PRIMARY KEY ("id"))`);
        await queryRunner.query(`CREATE UNIQUE INDEX "IDX_91185d86d5d7557b19abbb2868" ON "password_reset_tokens"  ("token_hash") `);
        await queryRunner.query(`CREATE TABLE "mail_outbox" ("id" uuid NOT NULL DEFAULT gen_random_uuid(), "created_at" TIMESTAMP WITH TIME ZONE NOT NULL DEFAULT now(), "updated_at" TIMESTAMP WITH TIME ZONE NOT NULL DEFAULT now(), "to_address" character varying(254) NOT NULL, "subject" character varying(300) NOT NULL, "body" text NOT NULL, "message_id" character varying(200) NOT NULL, "status" character varying(20) NOT NULL DEFAULT 'pending', "attempts" integer NOT NULL DEFAULT '0', "last_error" text, "sent_at" TIMESTAMP WITH TIME ZONE, CONSTRAINT "PK_fecc63c96385bc35a39ccf2a72e" PRIMARY KEY ("id"))`);
        await queryRunner.query(`CREATE INDEX "IDX_fdcc9a9fae0784a11963ea218a" ON "mail_outbox"  ("status", "created_at") `);
        await queryRunner.query(`CREATE TABLE "studies" ("id" uuid NOT NULL DEFAULT gen_random_uuid(), "created_at" TIMESTAMP WITH TIME ZONE NOT NULL DEFAULT now(), "updated_at" TIMESTAMP WITH TIME ZONE NOT NULL DEFAULT now(), "code" character varying(20) NOT NULL, "title" character varying(200) NOT NULL, "summary" text NOT NULL DEFAULT '', "ethics_board" character varying(200) NOT NULL DEFAULT '', "ethics_reference" character varying(100) NOT NULL DEFAULT '', "approval_date" date, "approval_expiry" date, "target_sample_size" integer, CONSTRAINT "PK_b100ff0c4a0ad02a9c2270d45b6" PRIMARY KEY ("id"))`);
        await queryRunner.query(`CREATE UNIQUE INDEX "IDX_70bc3802c9dc98aa38a6422cb6" ON "studies"  ("code") `);
        await queryRunner.query(`CREATE TABLE "invitations" ("id" uuid NOT NULL DEFAULT gen_random_uuid(), "created_at" TIMESTAMP WITH TIME ZONE NOT NULL DEFAULT now(), "updated_at" TIMESTAMP WITH TIME ZONE NOT NULL DEFAULT now(), "study_id" uuid NOT NULL, "email" character varying(254) NOT NULL, "role" character varying(20) NOT NULL, "token_hash" character(64) NOT NULL, "invited_by_id" uuid, "expires_at" TIMESTAMP WITH TIME ZONE NOT NULL, "accepted_at" TIMESTAMP WITH TIME ZONE, "revoked_at" TIMESTAMP WITH TIME ZONE, CONSTRAINT "PK_5dec98cfdfd562e4ad3648bbb07" PRIMARY KEY ("id"))`);
        await queryRunner.query(`CREATE UNIQUE INDEX "IDX_872ac94a64b3d44fc4b554780c" ON "invitations"  ("token_hash") `);
        await queryRunner.query(`CREATE TABLE "memberships" ("id" uuid NOT NULL DEFAULT gen_random_uuid(), "created_at" TIMESTAMP WITH TIME ZONE NOT NULL DEFAULT now(), "updated_at" TIMESTAMP WITH TIME ZONE NOT NULL DEFAULT now(), "study_id" uuid NOT NULL, "user_id" uuid NOT NULL, "role" character varying(20) NOT NULL, CONSTRAINT "PK_25d28bd932097a9e90495ede7b4" PRIMARY KEY ("id"))`);
        await queryRunner.query(`CREATE UNIQUE INDEX "IDX_b2e032aa68c69ac0494bb7dca8" ON "memberships"  ("study_id", "user_id") `);
        await queryRunner.query(`ALTER TABLE "password_reset_tokens" ADD CONSTRAINT "FK_52ac39dd8a28730c63aeb428c9c" FOREIGN KEY ("user_id") REFERENCES "users"("id") ON DELETE CASCADE ON UPDATE NO ACTION`);
        await queryRunner.query(`ALTER TABLE "invitations" ADD CONSTRAINT "FK_8b298d1a4cb73a57e8db9edeff3" FOREIGN KEY ("study_id") REFERENCES "studies"("id") ON DELETE CASCADE ON UPDATE NO ACTION`);
        await queryRunner.query(`ALTER TABLE "invitations" ADD CONSTRAINT "FK_d4de0403dd012cf87b430af70ef" FOREIGN KEY ("invited_by_id") REFERENCES "users"("id") ON DELETE SET NULL ON UPDATE NO ACTION`);
        await queryRunner.query(`ALTER TABLE "memberships" ADD CONSTRAINT "FK_3301d7d278a3ece92ea757db4d4" FOREIGN KEY ("study_id") REFERENCES "studies"("id") ON DELETE CASCADE ON UPDATE NO ACTION`);
        await queryRunner.query(`ALTER TABLE "memberships" ADD CONSTRAINT "FK_7c1e2fdfed4f6838e0c05ae5051" FOREIGN KEY ("user_id") REFERENCES "users"("id") ON DELETE CASCADE ON UPDATE NO ACTION`);

        // connect-pg-simple's table (its table.sql), created here rather than at run time.
        await queryRunner.query(`CREATE TABLE "session" ("sid" varchar NOT NULL COLLATE "default", "sess" json NOT NULL, "expire" timestamp(6) NOT NULL, CONSTRAINT "session_pkey" PRIMARY KEY ("sid"))`);
        await queryRunner.query(`CREATE INDEX "IDX_session_expire" ON "session" ("expire")`);
        // rate-limiter-flexible's Postgres store, shared by every app instance.
        await queryRunner.query(`CREATE TABLE "rate_limits" ("key" varchar(255) PRIMARY KEY, "points" integer NOT NULL DEFAULT 0, "expire" bigint)`);
        // The audit trail is append-only: corrections are new rows, never edits.
        await queryRunner.query(`CREATE FUNCTION audit_events_refuse_change() RETURNS trigger LANGUAGE plpgsql AS $$
            BEGIN
                RAISE EXCEPTION 'the audit trail is append-only: % is not allowed on audit_events', TG_OP
                    USING ERRCODE = 'insufficient_privilege';
            END $$`);
        await queryRunner.query(`CREATE TRIGGER audit_events_append_only BEFORE UPDATE OR DELETE ON "audit_events" FOR EACH ROW EXECUTE FUNCTION audit_events_refuse_change()`);
        await queryRunner.query(`CREATE TRIGGER audit_events_no_truncate BEFORE TRUNCATE ON "audit_events" FOR EACH STATEMENT EXECUTE FUNCTION audit_events_refuse_change()`);
    }

    public async down(queryRunner: QueryRunner): Promise<void> {
        await queryRunner.query(`DROP TRIGGER "audit_events_no_truncate" ON "audit_events"`);
        await queryRunner.query(`DROP TRIGGER "audit_events_append_only" ON "audit_events"`);
        await queryRunner.query(`DROP FUNCTION audit_events_refuse_change()`);
        await queryRunner.query(`DROP TABLE "rate_limits"`);
        await queryRunner.query(`DROP TABLE "session"`);
        await queryRunner.query(`ALTER TABLE "memberships" DROP CONSTRAINT "FK_7c1e2fdfed4f6838e0c05ae5051"`);
        await queryRunner.query(`ALTER TABLE "memberships" DROP CONSTRAINT "FK_3301d7d278a3ece92ea757db4d4"`);
        await queryRunner.query(`ALTER TABLE "invitations" DROP CONSTRAINT "FK_d4de0403dd012cf87b430af70ef"`);
        await queryRunner.query(`ALTER TABLE "invitations" DROP CONSTRAINT "FK_8b298d1a4cb73a57e8db9edeff3"`);
        await queryRunner.query(`ALTER TABLE "password_reset_tokens" DROP CONSTRAINT "FK_52ac39dd8a28730c63aeb428c9c"`);
        await queryRunner.query(`DROP INDEX "public"."IDX_b2e032aa68c69ac0494bb7dca8"`);
        await queryRunner.query(`DROP TABLE "memberships"`);
        await queryRunner.query(`DROP INDEX "public"."IDX_872ac94a64b3d44fc4b554780c"`);
        await queryRunner.query(`DROP TABLE "invitations"`);
        await queryRunner.query(`DROP INDEX "public"."IDX_70bc3802c9dc98aa38a6422cb6"`);
        await queryRunner.query(`DROP TABLE "studies"`);
        await queryRunner.query(`DROP INDEX "public"."IDX_fdcc9a9fae0784a11963ea218a"`);
        await queryRunner.query(`DROP TABLE "mail_outbox"`);
        await queryRunner.query(`DROP INDEX "public"."IDX_91185d86d5d7557b19abbb2868"`);
        await queryRunner.query(`DROP TABLE "password_reset_tokens"`);
        await queryRunner.query(`DROP INDEX "public"."IDX_97672ac88f789774dd47f7c8be"`);
        await queryRunner.query(`DROP TABLE "users"`);
        await queryRunner.query(`DROP INDEX "public"."IDX_ffa62e8d8b31e6734a233b84ab"`);
        await queryRunner.query(`DROP TABLE "audit_events"`);
    }

}
