// joint_findings also holds the findings of pressure traces checked after recording, so
// "the joint has finding X" is one table for the review queue and the Register alike.
// Schema is unchanged; this fills the rows for traces stored before (new traces add their
// own in database/queries/reviews.ts insertJointTrace).
import type { Knex } from "knex";

export async function up(knex: Knex): Promise<void> {
  await knex.raw(`
    INSERT IGNORE INTO joint_findings (joint_id, parameter, made_at)
    SELECT t.joint_id, LEFT(TRIM(f.p), 40), j.made_at
    FROM joint_traces t
      JOIN joints j ON j.id = t.joint_id,
      JSON_TABLE(CONCAT('["', REPLACE(t.finding_parameters, ',', '","'), '"]'), '$[*]' COLUMNS (p VARCHAR(400) PATH '$')) f
    WHERE t.finding_parameters IS NOT NULL AND t.finding_parameters <> '' AND TRIM(f.p) <> ''`);
}

export async function down(): Promise<void> {
  // Rows of trace findings cannot be told from the joint's own; they are left in place.
}
