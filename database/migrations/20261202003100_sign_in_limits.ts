// Sign-in throttling moves to rate-limiter-flexible's MySQL store (database/queries/
// sign-in-attempts.ts): one row per counter key with its points and expiry (epoch ms), the
// shape that store reads and writes. The table is made here (the store runs with
// tableCreated: true), so the application's database user needs no CREATE right. The old
// per-attempt rows (sign_in_attempts) are no longer read or written and go.
import type { Knex } from "knex";

export async function up(knex: Knex): Promise<void> {
  await knex.raw(
    "CREATE TABLE sign_in_limits (`key` VARCHAR(255) CHARACTER SET ascii COLLATE ascii_bin NOT NULL, `points` INT NOT NULL DEFAULT 0, `expire` BIGINT UNSIGNED NULL, PRIMARY KEY (`key`), KEY sign_in_limits_expire (`expire`)) ENGINE = InnoDB",
  );
  await knex.schema.dropTableIfExists("sign_in_attempts");
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.createTable("sign_in_attempts", (t) => {
    t.bigIncrements("id").primary();
    t.string("email", 254).notNullable();
    t.string("address", 64).notNullable();
    t.boolean("succeeded").notNullable();
    t.timestamp("attempted_at", { precision: 3 }).notNullable().defaultTo(knex.fn.now(3));
    t.index(["email", "attempted_at"]);
    t.index(["address", "attempted_at"]);
  });
  await knex.schema.dropTable("sign_in_limits");
}
