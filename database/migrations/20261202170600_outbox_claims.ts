// Who holds a mail being sent: the sender's claim (a random id per claim) and when it was
// taken. A sender marks the mail sent or failed only while its own claim still stands, so a
// sender whose lease ran out (it stalled or died mid-send) and was replaced cannot overwrite
// the result of the sender that took the mail over (database/queries/outbox.ts claimDueMails).
import type { Knex } from "knex";

export async function up(knex: Knex): Promise<void> {
  await knex.schema.alterTable("mail_outbox", (t) => {
    t.specificType("claimed_by", "CHAR(36) CHARACTER SET ascii COLLATE ascii_bin").nullable();
    t.timestamp("claimed_at", { precision: 3 }).nullable();
  });
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.alterTable("mail_outbox", (t) => {
    t.dropColumn("claimed_by");
    t.dropColumn("claimed_at");
  });
}
