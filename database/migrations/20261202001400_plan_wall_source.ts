// Every stored plan says where its wall came from. Plans stored before `wallSource` was
// kept were all made with wall = OD / SDR (the table walls came later), so they are marked
// so rather than left silent. Only rows without the key change; re-running changes nothing.
import type { Knex } from "knex";

export async function up(knex: Knex): Promise<void> {
  await knex.raw(
    `UPDATE joints SET plan = JSON_SET(plan, '$.wallSource', JSON_OBJECT('kind', 'od-over-sdr'))
      WHERE JSON_VALID(plan) AND JSON_EXTRACT(plan, '$.wallSource') IS NULL`,
  );
}

export async function down(): Promise<void> {
  // The marking is true of those plans; nothing to undo.
}
