// Coils: the details of a receipt inspection the core schema does not hold (which kinds of
// damage, the deepest gouge and the operator's limits it was judged against, where the
// traceability code disagreed with the typed fields), and the pulls recorded at the trench
// on each coil event (length pulled, length left, the joint), so remaining length can be
// explained line by line.
import type { Knex } from "knex";

export async function up(knex: Knex): Promise<void> {
  await knex.schema.alterTable("coils", (t) => {
    t.string("damage_kinds", 100).nullable(); // comma list of gouge,kink,flattening
    t.decimal("gouge_depth_mm", 6, 2).nullable();
    t.decimal("gouge_limit_pct", 5, 2).nullable(); // operator's limit, % of minimum wall
    t.decimal("ovality_limit_pct", 5, 2).nullable();
    t.text("trace_code_flags").nullable(); // JSON [{ field, message }]
  });
  await knex.schema.alterTable("coil_events", (t) => {
    t.decimal("pull_m", 9, 2).nullable();
    t.decimal("remaining_m", 9, 2).nullable();
    t.bigInteger("joint_id").unsigned().nullable();
    t.index(["joint_id"]);
  });
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.alterTable("coil_events", (t) => {
    t.dropIndex(["joint_id"]);
    t.dropColumn("pull_m");
    t.dropColumn("remaining_m");
    t.dropColumn("joint_id");
  });
  await knex.schema.alterTable("coils", (t) => {
    t.dropColumn("damage_kinds");
    t.dropColumn("gouge_depth_mm");
    t.dropColumn("gouge_limit_pct");
    t.dropColumn("ovality_limit_pct");
    t.dropColumn("trace_code_flags");
  });
}
