import { MigrationInterface, QueryRunner } from "typeorm";

export class Identity1796161344465 implements MigrationInterface {
    name = 'Identity1796161344465'

    public async up(queryRunner: QueryRunner): Promise<void> {
        await queryRunner.query(`CREATE TABLE "api_tokens" ("id" uuid NOT NULL DEFAULT uuid_generate_v4(), "user_id" uuid NOT NULL, "workspace_id" uuid NOT NULL, "label" character varying(200) NOT NULL, "token_hash" character varying(64) NOT NULL, "created_at" TIMESTAMP WITH TIME ZONE NOT NULL DEFAULT now(), "last_used_at" TIMESTAMP WITH TIME ZONE, "revoked_at" TIMESTAMP WITH TIME ZONE, CONSTRAINT "PK_c587455266b5fa8dace7194caac" PRIMARY KEY ("id"))`);
        await queryRunner.query(`CREATE INDEX "IDX_b74883f5884a42fd8496d389b2" ON "api_tokens"  ("user_id") `);
        await queryRunner.query(`CREATE INDEX "IDX_9c644dd21cac1a0e8fca944337" ON "api_tokens"  ("workspace_id") `);
        await queryRunner.query(`CREATE UNIQUE INDEX "IDX_bbd687a104e1921e6702c6e3aa" ON "api_tokens"  ("token_hash") `);
        await queryRunner.query(`CREATE TABLE "users" ("id" uuid NOT NULL DEFAULT uuid_generate_v4(), "login" character varying(100) NOT NULL, "email" character varying(320) NOT NULL, "name" character varying(200) NOT NULL, "provider_id" character varying(100), "created_at" TIMESTAMP WITH TIME ZONE NOT NULL DEFAULT now(), CONSTRAINT "UQ_6425135effde2ab8322f8464932" UNIQUE ("provider_id"), CONSTRAINT "PK_a3ffb1c0c8416b9fc6f907b7433" PRIMARY KEY ("id"))`);
        await queryRunner.query(`CREATE UNIQUE INDEX "IDX_2d443082eccd5198f95f2a36e2" ON "users"  ("login") `);
        await queryRunner.query(`CREATE UNIQUE INDEX "IDX_97672ac88f789774dd47f7c8be" ON "users"  ("email") `);
        await queryRunner.query(`CREATE TABLE "workspaces" ("id" uuid NOT NULL DEFAULT uuid_generate_v4(), "slug" character varying(64) NOT NULL, "name" character varying(200) NOT NULL, "defaults" jsonb NOT NULL DEFAULT '{}'::jsonb, "created_at" TIMESTAMP WITH TIME ZONE NOT NULL DEFAULT now(), CONSTRAINT "PK_098656ae401f3e1a4586f47fd8e" PRIMARY KEY ("id"))`);
        await queryRunner.query(`CREATE UNIQUE INDEX "IDX_b8e9fe62e93d60089dfc4f175f" ON "workspaces"  ("slug") `);
        await queryRunner.query(`CREATE TABLE "memberships" ("id" uuid NOT NULL DEFAULT uuid_generate_v4(), "workspace_id" uuid NOT NULL, "user_id" uuid NOT NULL, "role" character varying(16) NOT NULL, "created_at" TIMESTAMP WITH TIME ZONE NOT NULL DEFAULT now(), CONSTRAINT "uq_membership_workspace_user" UNIQUE ("workspace_id", "user_id"), CONSTRAINT "PK_25d28bd932097a9e90495ede7b4" PRIMARY KEY ("id"))`);
        await queryRunner.query(`CREATE INDEX "IDX_9b76ecf1dda18a6adec17fe71c" ON "memberships"  ("workspace_id") `);
        await queryRunner.query(`CREATE INDEX "IDX_7c1e2fdfed4f6838e0c05ae505" ON "memberships"  ("user_id") `);
    }

    public async down(queryRunner: QueryRunner): Promise<void> {
        await queryRunner.query(`DROP INDEX "public"."IDX_7c1e2fdfed4f6838e0c05ae505"`);
        await queryRunner.query(`DROP INDEX "public"."IDX_9b76ecf1dda18a6adec17fe71c"`);
        await queryRunner.query(`DROP TABLE "memberships"`);
        await queryRunner.query(`DROP INDEX "public"."IDX_b8e9fe62e93d60089dfc4f175f"`);
        await queryRunner.query(`DROP TABLE "workspaces"`);
        await queryRunner.query(`DROP INDEX "public"."IDX_97672ac88f789774dd47f7c8be"`);
        await queryRunner.query(`DROP INDEX "public"."IDX_2d443082eccd5198f95f2a36e2"`);
        await queryRunner.query(`DROP TABLE "users"`);
        await queryRunner.query(`DROP INDEX "public"."IDX_bbd687a104e1921e6702c6e3aa"`);
        await queryRunner.query(`DROP INDEX "public"."IDX_9c644dd21cac1a0e8fca944337"`);
        await queryRunner.query(`DROP INDEX "public"."IDX_b74883f5884a42fd8496d389b2"`);
        await queryRunner.query(`DROP TABLE "api_tokens"`);
    }

}
