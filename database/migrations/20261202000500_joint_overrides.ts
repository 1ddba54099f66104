// Overrides of blocking warnings at the trench: an inspector or admin clears a heater plate
// whose check is overdue or failed, or a quarantined or used-up coil, for one job for a few
// hours (joint_overrides); each joint recorded under such a clearance names it
// (joint_override_uses), so the joint page and the audit show who allowed what and why.
import type { Knex } from "knex";

export async function up(knex: Knex): Promise<void> {
  await knex.schema.createTable("joint_overrides", (t) => {
    t.bigIncrements("id").primary();
    t.integer("job_id").unsigned().notNullable().references("id").inTable("jobs");
    t.enu("subject_type", ["heater", "coil"]).notNullable();
    t.integer("subject_id").unsigned().notNullable();
    t.string("reason", 500).notNullable();
    t.integer("granted_by").unsigned().notNullable().references("id").inTable("users");
    t.timestamp("granted_at", { precision: 3 }).notNullable().defaultTo(knex.fn.now(3));
    t.timestamp("expires_at", { precision: 3 }).notNullable();
    t.index(["job_id", "subject_type", "subject_id", "expires_at"]);
  });
  await knex.schema.createTable("joint_override_uses", (t) => {
    t.bigInteger("joint_id").unsigned().notNullable().references("id").inTable("joints");
    t.bigInteger("override_id").unsigned().notNullable().references("id").inTable("joint_overrides");
    t.string("block_kind", 40).notNullable();
    t.string("message", 500).notNullable();
    t.primary(["joint_id", "override_id"]);
  });
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.dropTableIfExists("joint_override_uses");
  await knex.schema.dropTableIfExists("joint_overrides");
}
