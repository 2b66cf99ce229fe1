import { MigrationInterface, QueryRunner } from "typeorm";

/** Export templates of a workspace, and the copies a batch was uploaded with. (TypeORM's no-op jsonb/array default re-statements for other tables were removed from the generated file.) */
export class ExportTemplates1796166577773 implements MigrationInterface {
    name = 'ExportTemplates1796166577773'

    public async up(queryRunner: QueryRunner): Promise<void> {
        await queryRunner.query(`CREATE TABLE "export_templates" ("id" uuid NOT NULL DEFAULT uuid_generate_v4(), "workspace_id" uuid NOT NULL, "name" character varying(100) NOT NULL, "file_extension" character varying(16) NOT NULL, "body" text NOT NULL, "created_at" TIMESTAMP WITH TIME ZONE NOT NULL DEFAULT now(), "updated_at" TIMESTAMP WITH TIME ZONE NOT NULL DEFAULT now(), CONSTRAINT "uq_export_templates_workspace_name" UNIQUE ("workspace_id", "name"), CONSTRAINT "PK_3777207cd282bfec6bd0261d5bc" PRIMARY KEY ("id"))`);
        await queryRunner.query(`CREATE TABLE "batch_export_templates" ("id" uuid NOT NULL DEFAULT uuid_generate_v4(), "batch_id" uuid NOT NULL, "position" integer NOT NULL, "template_id" uuid, "name" character varying(100) NOT NULL, "file_extension" character varying(16) NOT NULL, "body" text NOT NULL, CONSTRAINT "uq_batch_export_templates_position" UNIQUE ("batch_id", "position"), CONSTRAINT "PK_9925aaba21cf76c2c409f6be60a" PRIMARY KEY ("id"))`);
        await queryRunner.query(`CREATE INDEX "IDX_4ecad722eb8828f9a18a3ccbd7" ON "batch_export_templates"  ("batch_id") `);
        await queryRunner.query(`ALTER TABLE "export_templates" ADD CONSTRAINT "FK_73606b754a2e687bfee49b779e4" FOREIGN KEY ("workspace_id") REFERENCES "workspaces"("id") ON DELETE CASCADE ON UPDATE NO ACTION`);
        await queryRunner.query(`ALTER TABLE "batch_export_templates" ADD CONSTRAINT "FK_4ecad722eb8828f9a18a3ccbd7b" FOREIGN KEY ("batch_id") REFERENCES "batches"("id") ON DELETE CASCADE ON UPDATE NO ACTION`);
    }

    public async down(queryRunner: QueryRunner): Promise<void> {
        await queryRunner.query(`ALTER TABLE "batch_export_templates" DROP CONSTRAINT "FK_4ecad722eb8828f9a18a3ccbd7b"`);
        await queryRunner.query(`ALTER TABLE "export_templates" DROP CONSTRAINT "FK_73606b754a2e687bfee49b779e4"`);
        await queryRunner.query(`DROP INDEX "public"."IDX_4ecad722eb8828f9a18a3ccbd7"`);
        await queryRunner.query(`DROP TABLE "batch_export_templates"`);
        await queryRunner.query(`DROP TABLE "export_templates"`);
    }

}
