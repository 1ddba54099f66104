// Daily digest: events for people who chose one mail a day (users.daily_digest) wait here
// instead of going straight to the outbox; the alert scan folds each person's waiting
// events into one outbox mail per day and links each event to that mail.
import type { Knex } from "knex";

export async function up(knex: Knex): Promise<void> {
  await knex.schema.createTable("mail_digest_items", (t) => {
    t.bigIncrements("id").primary();
    t.integer("user_id").unsigned().notNullable().references("id").inTable("users");
    t.string("to_address", 254).notNullable();
    t.string("kind", 60).notNullable();
    t.string("subject", 300).notNullable();
    t.text("body_text").notNullable();
    // Same key space as mail_outbox.dedupe_key: one event is kept once, digest or not.
    t.string("dedupe_key", 200).nullable().unique();
    t.timestamp("created_at", { precision: 3 }).notNullable().defaultTo(knex.fn.now(3));
    t.bigInteger("outbox_id").unsigned().nullable(); // the digest mail it went into
    t.index(["outbox_id", "user_id", "created_at"]);
  });
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.dropTableIfExists("mail_digest_items");
}
