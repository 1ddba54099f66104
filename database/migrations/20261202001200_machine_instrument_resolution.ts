// The reading resolution of each fusion machine's gauge (MPa) and heater thermometer (°C),
// copied into each joint's plan so a reading passes a limit within half a step of it.
// Nullable (null = unknown, no tolerance); existing and new machines start at the common
// practice of a 0.05 MPa gauge division and a thermometer reading whole °C.
import type { Knex } from "knex";

export async function up(knex: Knex): Promise<void> {
  await knex.schema.alterTable("fusion_machines", (t) => {
    t.decimal("gauge_resolution_mpa", 8, 4).nullable().defaultTo(0.05).after("piston_area_mm2");
    t.decimal("thermometer_resolution_c", 6, 3).nullable().defaultTo(1).after("gauge_resolution_mpa");
  });
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.alterTable("fusion_machines", (t) => {
    t.dropColumn("thermometer_resolution_c");
    t.dropColumn("gauge_resolution_mpa");
  });
}
