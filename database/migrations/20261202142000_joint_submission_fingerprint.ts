// The fingerprint of the submission that recorded a joint: SHA-256 (hex) of the canonical
// text of its parsed input (domain/joints/submission.ts). A client id sent again with the
// same fingerprint answers with the joint it made; with another, it is refused (409).
// Joints recorded before this column have none and are compared value by value.
// A nullable column added at the end of the table: MariaDB 10.3+ adds it in place
// (ALGORITHM=INSTANT), without copying the joints.
import type { Knex } from "knex";

export async function up(knex: Knex): Promise<void> {
  await knex.schema.alterTable("joints", (t) => {
    t.specificType("submission_sha256", "CHAR(64)").nullable();
  });
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.alterTable("joints", (t) => {
    t.dropColumn("submission_sha256");
  });
}
