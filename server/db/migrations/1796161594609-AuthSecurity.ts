import { MigrationInterface, QueryRunner } from "typeorm";

/** Invitations, the audit log, and the express-session table used by connect-pg-simple. */
export class AuthSecurity1796161594609 implements MigrationInterface {
    name = 'AuthSecurity1796161594609'

    public async up(queryRunner: QueryRunner): Promise<void> {
        await queryRunner.query(`CREATE TABLE "audit_entries" ("id" uuid NOT NULL DEFAULT uuid_generate_v4(), "workspace_id" uuid, "actor_id" uuid, "action" character varying(64) NOT NULL, "detail" jsonb NOT NULL DEFAULT '{}'::jsonb, "created_at" TIMESTAMP WITH TIME ZONE NOT NULL DEFAULT now(), CONSTRAINT "PK_6b1623bcad4d04530b76548d619" PRIMARY KEY ("id"))`);
        await queryRunner.query(`CREATE INDEX "IDX_c2d369a2e8a9e3773f1682b8ac" ON "audit_entries"  ("actor_id") `);
        await queryRunner.query(`CREATE INDEX "idx_audit_workspace_created" ON "audit_entries"  ("workspace_id", "created_at") `);
        await queryRunner.query(`CREATE TABLE "sessions" ("sid" character varying(255) NOT NULL, "sess" json NOT NULL, "expire" TIMESTAMP(6) NOT NULL, CONSTRAINT "PK_e2d6172ca19b8ebef797c362b05" PRIMARY KEY ("sid"))`);
        await queryRunner.query(`CREATE INDEX "idx_sessions_expire" ON "sessions"  ("expire") `);
        await queryRunner.query(`CREATE TABLE "invitations" ("id" uuid NOT NULL DEFAULT uuid_generate_v4(), "workspace_id" uuid NOT NULL, "email" character varying(320) NOT NULL, "role" character varying(16) NOT NULL, "invited_by" uuid NOT NULL, "expires_at" TIMESTAMP WITH TIME ZONE NOT NULL, "accepted_at" TIMESTAMP WITH TIME ZONE, "accepted_by" uuid, "revoked_at" TIMESTAMP WITH TIME ZONE, "created_at" TIMESTAMP WITH TIME ZONE NOT NULL DEFAULT now(), CONSTRAINT "PK_5dec98cfdfd562e4ad3648bbb07" PRIMARY KEY ("id"))`);
        await queryRunner.query(`CREATE INDEX "IDX_37d2c3ed527014368be5302bde" ON "invitations"  ("workspace_id") `);
    }

    public async down(queryRunner: QueryRunner): Promise<void> {
        await queryRunner.query(`DROP INDEX "public"."IDX_37d2c3ed527014368be5302bde"`);
        await queryRunner.query(`DROP TABLE "invitations"`);
        await queryRunner.query(`DROP INDEX "public"."idx_sessions_expire"`);
        await queryRunner.query(`DROP TABLE "sessions"`);
        await queryRunner.query(`DROP INDEX "public"."idx_audit_workspace_created"`);
        await queryRunner.query(`DROP INDEX "public"."IDX_c2d369a2e8a9e3773f1682b8ac"`);
        await queryRunner.query(`DROP TABLE "audit_entries"`);
    }

}
