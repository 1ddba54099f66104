// The heater surface read with a pyrometer (apart from the dial, which is only a general
// indicator) and the outside misalignment (hi-lo) of the two ends, mm, checked against 10 %
// of the wall. Nullable: both are optional and joints recorded before have neither.
// Revisions keep their changes as JSON, so only `joints` gains the columns.
import type { Knex } from "knex";

export async function up(knex: Knex): Promise<void> {
  await knex.schema.alterTable("joints", (t) => {
    t.decimal("heater_surface_temperature_c", 6, 2).nullable().after("heater_temperature_c");
    t.decimal("misalignment_mm", 8, 3).nullable().after("alignment_ok");
  });
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.alterTable("joints", (t) => {
    t.dropColumn("misalignment_mm");
    t.dropColumn("heater_surface_temperature_c");
  });
}
