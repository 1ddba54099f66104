// How alerts reach a person becomes one choice, users.mail_grouping: "immediate" (a burst
// within a couple of minutes comes as one mail), "hourly" or "daily". It replaces the
// yes/no users.daily_digest (daily digest on → "daily", off → "immediate").
// Every alert for a person is now first a notification (the old digest items, renamed):
// the mail worker folds a person's waiting notifications into one outbox mail when their
// window closes. Each notification keeps the in-app link it points to; each outbox mail
// names the person it is for (mail_outbox.user_id), so a person can read their own mail in
// Beadline. Mail queued before this change is matched to its person by address.
import type { Knex } from "knex";

export async function up(knex: Knex): Promise<void> {
  await knex.schema.alterTable("users", (t) => {
    t.enu("mail_grouping", ["immediate", "hourly", "daily"]).notNullable().defaultTo("immediate");
  });
  await knex("users").where({ daily_digest: true }).update({ mail_grouping: "daily" });
  await knex.schema.alterTable("users", (t) => {
    t.dropColumn("daily_digest");
  });

  await knex.schema.renameTable("mail_digest_items", "notifications");
  await knex.schema.alterTable("notifications", (t) => {
    t.string("link_path", 300).nullable();
    t.index(["user_id", "id"]);
  });
  await knex.schema.alterTable("notifications", (t) => {
    t.dropColumn("to_address"); // the person's address when the mail is made
  });

  await knex.schema.alterTable("mail_outbox", (t) => {
    t.integer("user_id").unsigned().nullable().references("id").inTable("users");
    t.index(["user_id", "id"]);
  });
  await knex.raw("UPDATE mail_outbox o JOIN users u ON u.email = o.to_address SET o.user_id = u.id");
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.alterTable("mail_outbox", (t) => {
    t.dropForeign(["user_id"]);
    t.dropIndex(["user_id", "id"]);
  });
  await knex.schema.alterTable("mail_outbox", (t) => {
    t.dropColumn("user_id");
  });
  // MariaDB let the (user_id, id) index stand in for the user_id foreign key's own index:
  // drop the key, the index and the new column, then put the key back as it was.
  await knex.schema.alterTable("notifications", (t) => {
    t.dropForeign(["user_id"], "mail_digest_items_user_id_foreign");
  });
  await knex.schema.alterTable("notifications", (t) => {
    t.dropIndex(["user_id", "id"]);
    t.dropColumn("link_path");
    t.string("to_address", 254).notNullable().defaultTo("");
  });
  await knex.raw("UPDATE notifications n JOIN users u ON u.id = n.user_id SET n.to_address = u.email");
  await knex.schema.renameTable("notifications", "mail_digest_items");
  await knex.schema.alterTable("mail_digest_items", (t) => {
    t.foreign("user_id").references("id").inTable("users");
  });
  await knex.schema.alterTable("users", (t) => {
    t.boolean("daily_digest").notNullable().defaultTo(false);
  });
  await knex("users").where({ mail_grouping: "daily" }).update({ daily_digest: true });
  await knex.schema.alterTable("users", (t) => {
    t.dropColumn("mail_grouping");
  });
}
