// The review queue read by keyset: pending joints of one outcome in (made at, id) order,
// after a cursor ("out of limits first" reads the out-of-limits part, then the rest). One
// index serves each part as a range without a sort; the oldest-first order uses the
// (review_state, made_at, joint_id) index the register migration added.
import type { Knex } from "knex";

export async function up(knex: Knex): Promise<void> {
  await knex.schema.alterTable("joint_states", (t) => {
    t.index(["review_state", "outcome", "made_at", "joint_id"], "joint_states_queue_outcome_index");
  });
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.alterTable("joint_states", (t) => {
    t.dropIndex(["review_state", "outcome", "made_at", "joint_id"], "joint_states_queue_outcome_index");
  });
}
