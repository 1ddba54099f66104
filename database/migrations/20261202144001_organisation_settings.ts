// The organisation's own settings, one row (id 1): its IANA time zone, in which people see
// local times, day filters take local days and exports write local times beside UTC.
// NULL means "not chosen yet": the server's zone (or UTC) is used until an admin sets one.
// Stored instants stay UTC whatever is chosen here.
import type { Knex } from "knex";

export async function up(knex: Knex): Promise<void> {
  await knex.schema.createTable("organisation_settings", (t) => {
    t.tinyint("id").unsigned().primary();
    t.string("time_zone", 64).nullable();
    t.integer("updated_by").unsigned().nullable().references("id").inTable("users");
    t.timestamp("updated_at", { precision: 3 }).notNullable().defaultTo(knex.raw("CURRENT_TIMESTAMP(3)"));
  });
  await knex.raw("ALTER TABLE organisation_settings ADD CONSTRAINT organisation_settings_one_row CHECK (id = 1)");
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.dropTable("organisation_settings");
}
