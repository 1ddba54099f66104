// Office set-up: which procedure version's heater window a heater check was judged
// against, and one qualification record per person, procedure and date (a second
// submission of the same record is a conflict, not a duplicate row).
import type { Knex } from "knex";

export async function up(knex: Knex): Promise<void> {
  await knex.schema.alterTable("heater_checks", (t) => {
    t.integer("procedure_version_id").unsigned().nullable().references("id").inTable("procedure_versions");
  });
  await knex.schema.alterTable("qualifications", (t) => {
    t.unique(["user_id", "procedure_id", "qualified_on"], { indexName: "qualifications_person_procedure_date_unique" });
  });
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.alterTable("qualifications", (t) => {
    t.dropUnique(["user_id", "procedure_id", "qualified_on"], "qualifications_person_procedure_date_unique");
  });
  await knex.schema.alterTable("heater_checks", (t) => {
    t.dropForeign(["procedure_version_id"]);
    t.dropColumn("procedure_version_id");
  });
}
