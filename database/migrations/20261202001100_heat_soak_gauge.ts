// The gauge pressure held during heat soak, so the soak can be checked against the plan
// (ASTM F2620 / ISO 21307: at drag, without force; DVS 2207-1: at most 0.02 N/mm² at the
// pipe ends). Nullable: joints recorded before it have no reading. Revisions keep their
// changes as JSON, so only `joints` gains the column.
import type { Knex } from "knex";

export async function up(knex: Knex): Promise<void> {
  await knex.schema.alterTable("joints", (t) => {
    t.decimal("heat_soak_gauge_mpa", 8, 4).nullable().after("heat_soak_s");
  });
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.alterTable("joints", (t) => {
    t.dropColumn("heat_soak_gauge_mpa");
  });
}
