import { MigrationInterface, QueryRunner } from "typeorm";

export class Batches1796161670587 implements MigrationInterface {
    name = 'Batches1796161670587'

    public async up(queryRunner: QueryRunner): Promise<void> {
        await queryRunner.query(`CREATE TABLE "batches" ("id" uuid NOT NULL DEFAULT uuid_generate_v4(), "workspace_id" uuid NOT NULL, "submitter_id" uuid NOT NULL, "name" character varying(200) NOT NULL, "status" character varying(16) NOT NULL, "settings" jsonb NOT NULL, "files" jsonb NOT NULL DEFAULT '[]'::jsonb, "total" integer NOT NULL DEFAULT '0', "done_count" integer NOT NULL DEFAULT '0', "clean_count" integer NOT NULL DEFAULT '0', "over_budget_count" integer NOT NULL DEFAULT '0', "knife_edge_count" integer NOT NULL DEFAULT '0', "error_count" integer NOT NULL DEFAULT '0', "accepted_count" integer NOT NULL DEFAULT '0', "flagged_count" integer NOT NULL DEFAULT '0', "groups" jsonb NOT NULL DEFAULT '[]'::jsonb, "created_at" TIMESTAMP WITH TIME ZONE NOT NULL DEFAULT now(), "started_at" TIMESTAMP WITH TIME ZONE, "finished_at" TIMESTAMP WITH TIME ZONE, "notified_at" TIMESTAMP WITH TIME ZONE, "signed_off_by_id" uuid, "signed_off_at" TIMESTAMP WITH TIME ZONE, CONSTRAINT "PK_55e7ff646e969b61d37eea5be7a" PRIMARY KEY ("id"))`);
        await queryRunner.query(`CREATE INDEX "IDX_5f4c8e4adabf57542e48433fd0" ON "batches"  ("submitter_id") `);
        await queryRunner.query(`CREATE INDEX "ix_batches_workspace_status" ON "batches"  ("workspace_id", "status") `);
        await queryRunner.query(`CREATE INDEX "ix_batches_workspace_created" ON "batches"  ("workspace_id", "created_at") `);
        await queryRunner.query(`CREATE TABLE "structures" ("id" uuid NOT NULL DEFAULT uuid_generate_v4(), "batch_id" uuid NOT NULL, "workspace_id" uuid NOT NULL, "seq" integer NOT NULL, "source_file" character varying(1024) NOT NULL, "frame_index" integer NOT NULL, "frame_count" integer NOT NULL, "name" character varying(500) NOT NULL, "input_atoms" jsonb NOT NULL, "atom_count" integer NOT NULL, "charge" integer, "multiplicity" integer, "input_sha256" character varying(64) NOT NULL, "status" character varying(16) NOT NULL, "error" text, "revision" integer NOT NULL DEFAULT '0', "target" jsonb, "attempts" integer NOT NULL DEFAULT '0', "formula" character varying(200), "perceived_group" character varying(8), "point_group" character varying(8), "group_order" integer, "computational_subgroup" character varying(8), "symmetry_rmsd_before" double precision, "symmetry_rmsd_after" double precision, "displacement_rmsd" double precision, "max_displacement" double precision, "csm" double precision, "flags" text array NOT NULL DEFAULT '{}'::text[], "result" jsonb, "outputs" jsonb, "engine_version" character varying(64), "timings" jsonb, "review" character varying(16) NOT NULL DEFAULT 'pending', "queued_at" TIMESTAMP WITH TIME ZONE NOT NULL DEFAULT now(), "started_at" TIMESTAMP WITH TIME ZONE, "finished_at" TIMESTAMP WITH TIME ZONE, CONSTRAINT "uq_structures_batch_seq" UNIQUE ("batch_id", "seq"), CONSTRAINT "PK_392d41b28d3ff6c67a9a93c9800" PRIMARY KEY ("id"))`);
        await queryRunner.query(`CREATE INDEX "IDX_79cabbbcbce73299040cf50cae" ON "structures"  ("workspace_id") `);
        await queryRunner.query(`CREATE INDEX "ix_structures_batch_review" ON "structures"  ("batch_id", "review") `);
        await queryRunner.query(`CREATE INDEX "ix_structures_batch_point_group" ON "structures"  ("batch_id", "point_group") `);
        await queryRunner.query(`CREATE INDEX "ix_structures_batch_perceived" ON "structures"  ("batch_id", "perceived_group") `);
        await queryRunner.query(`CREATE INDEX "ix_structures_batch_status" ON "structures"  ("batch_id", "status") `);
        // Flag filters (`flags @> ARRAY['over-budget']`): GIN, written by hand (the entity marks it synchronize: false).
        await queryRunner.query(`CREATE INDEX "ix_structures_flags" ON "structures" USING GIN ("flags")`);
        await queryRunner.query(`CREATE TABLE "review_events" ("id" uuid NOT NULL DEFAULT uuid_generate_v4(), "workspace_id" uuid NOT NULL, "batch_id" uuid NOT NULL, "structure_id" uuid, "decision" character varying(16) NOT NULL, "comment" text NOT NULL DEFAULT '', "reviewer_id" uuid NOT NULL, "created_at" TIMESTAMP WITH TIME ZONE NOT NULL DEFAULT now(), CONSTRAINT "PK_56256411bd89756b5d504504f59" PRIMARY KEY ("id"))`);
        await queryRunner.query(`CREATE INDEX "IDX_853652cfb7831a75e77a746f45" ON "review_events"  ("workspace_id") `);
        await queryRunner.query(`CREATE INDEX "IDX_71266a0bc293b42842fc241748" ON "review_events"  ("structure_id") `);
        await queryRunner.query(`CREATE INDEX "ix_review_events_batch_created" ON "review_events"  ("batch_id", "created_at") `);
        await queryRunner.query(`ALTER TABLE "batches" ADD CONSTRAINT "FK_f4d41c8c3e05fb1b2991825a82d" FOREIGN KEY ("workspace_id") REFERENCES "workspaces"("id") ON DELETE CASCADE ON UPDATE NO ACTION`);
        await queryRunner.query(`ALTER TABLE "structures" ADD CONSTRAINT "FK_9eaffdde669197518366add5cce" FOREIGN KEY ("batch_id") REFERENCES "batches"("id") ON DELETE CASCADE ON UPDATE NO ACTION`);
        await queryRunner.query(`ALTER TABLE "review_events" ADD CONSTRAINT "FK_e0002c0f28dbbee3abb8c32dc4f" FOREIGN KEY ("batch_id") REFERENCES "batches"("id") ON DELETE CASCADE ON UPDATE NO ACTION`);
    }

    public async down(queryRunner: QueryRunner): Promise<void> {
        await queryRunner.query(`ALTER TABLE "review_events" DROP CONSTRAINT "FK_e0002c0f28dbbee3abb8c32dc4f"`);
        await queryRunner.query(`ALTER TABLE "structures" DROP CONSTRAINT "FK_9eaffdde669197518366add5cce"`);
        await queryRunner.query(`ALTER TABLE "batches" DROP CONSTRAINT "FK_f4d41c8c3e05fb1b2991825a82d"`);
        await queryRunner.query(`DROP INDEX "public"."ix_review_events_batch_created"`);
        await queryRunner.query(`DROP INDEX "public"."IDX_71266a0bc293b42842fc241748"`);
        await queryRunner.query(`DROP INDEX "public"."IDX_853652cfb7831a75e77a746f45"`);
        await queryRunner.query(`DROP TABLE "review_events"`);
        await queryRunner.query(`DROP INDEX "public"."ix_structures_flags"`);
        await queryRunner.query(`DROP INDEX "public"."ix_structures_batch_status"`);
        await queryRunner.query(`DROP INDEX "public"."ix_structures_batch_perceived"`);
        await queryRunner.query(`DROP INDEX "public"."ix_structures_batch_point_group"`);
        await queryRunner.query(`DROP INDEX "public"."ix_structures_batch_review"`);
        await queryRunner.query(`DROP INDEX "public"."IDX_79cabbbcbce73299040cf50cae"`);
        await queryRunner.query(`DROP TABLE "structures"`);
        await queryRunner.query(`DROP INDEX "public"."ix_batches_workspace_created"`);
        await queryRunner.query(`DROP INDEX "public"."ix_batches_workspace_status"`);
        await queryRunner.query(`DROP INDEX "public"."IDX_5f4c8e4adabf57542e48433fd0"`);
        await queryRunner.query(`DROP TABLE "batches"`);
    }

}
