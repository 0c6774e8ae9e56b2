import type { Knex } from "knex";

// Who follows what. A row names either a build or a project. The people who created or built a build follow it
// without a row; a build row with following = false records that someone stopped (so the default does not come
// back), and it also mutes that build when they follow its project.
export async function up(knex: Knex): Promise<void> {
  await knex.schema.createTable("follows", (t) => {
    t.uuid("id").primary().defaultTo(knex.raw("gen_random_uuid()"));
    t.text("user_id").notNullable().references("id").inTable("auth_user").onDelete("CASCADE");
    t.uuid("build_id").nullable().references("id").inTable("builds").onDelete("CASCADE");
    t.uuid("project_id").nullable().references("id").inTable("projects").onDelete("CASCADE");
    t.boolean("following").notNullable().defaultTo(true);
    t.timestamp("created_at", { useTz: true }).notNullable().defaultTo(knex.fn.now());
    t.timestamp("updated_at", { useTz: true }).notNullable().defaultTo(knex.fn.now());
  });
  await knex.raw(
    "alter table follows add constraint follows_one_target_check check ((build_id is null) <> (project_id is null))",
  );
  await knex.raw("create unique index follows_user_build_unique on follows (user_id, build_id) where build_id is not null");
  await knex.raw("create unique index follows_user_project_unique on follows (user_id, project_id) where project_id is not null");
  await knex.raw("create index follows_build on follows (build_id) where build_id is not null");
  await knex.raw("create index follows_project on follows (project_id) where project_id is not null");
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.dropTable("follows");
}
