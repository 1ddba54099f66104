// The mail-grouping migration keeps each person's choice: daily digest on → "daily", off →
// "immediate"; a digest item still waiting stays waiting (as a notification); mail queued
// before is matched to its person by address. Run on a fresh schema (a second database on
// the test server): the migration is taken down, the old shape filled, and brought up again.
import { afterAll, describe, expect, it } from "vitest";
import { rootSql } from "@/database/local/mariadb";
import { ownerKnex } from "@/database/migrate";

const dir = process.env.BEADLINE_DB_DIR!;
const url = new URL(process.env.MIGRATION_DATABASE_URL!);
const freshName = `beadline_mailmig_${process.pid}`;
const NAME = "20261202002200_mail_grouping.ts";

describe("the mail-grouping migration", () => {
  rootSql(dir, `CREATE DATABASE IF NOT EXISTS ${freshName}; GRANT ALL ON ${freshName}.* TO '${url.username}'@'127.0.0.1';`);
  url.pathname = `/${freshName}`;
  const k = ownerKnex(url.toString());

  afterAll(async () => {
    await k.destroy();
    rootSql(dir, `DROP DATABASE IF EXISTS ${freshName}`);
  });

  it("turns daily digest into the daily choice and keeps waiting items and queued mail with their person", async () => {
    await k.migrate.latest();
    await k.migrate.down({ name: NAME });
    const user = (email: string, daily: boolean) => ({ name: email, email, password_hash: "x", roles: "inspector", unit_system: "si", is_active: true, daily_digest: daily });
    const [dailyId] = await k("users").insert(user("daily@test.example", true));
    const [eachId] = await k("users").insert(user("each@test.example", false));
    await k("mail_digest_items").insert({ user_id: dailyId, to_address: "daily@test.example", kind: "joint-out-of-limits", subject: "Waiting", body_text: "b", dedupe_key: "k1" });
    await k("mail_outbox").insert({ to_address: "each@test.example", subject: "Sent before", body_text: "b", kind: "joint-out-of-limits" });

    await k.migrate.up({ name: NAME });
    expect(await k("users").orderBy("id").pluck("mail_grouping")).toEqual(["daily", "immediate"]);
    expect(await k("notifications").whereNull("outbox_id").select("user_id", "subject", "link_path")).toEqual([{ user_id: dailyId, subject: "Waiting", link_path: null }]);
    expect(await k("mail_outbox").pluck("user_id")).toEqual([eachId]);

    await k.migrate.down({ name: NAME });
    expect(await k("users").orderBy("id").pluck("daily_digest")).toEqual([1, 0]);
    expect(await k("mail_digest_items").pluck("to_address")).toEqual(["daily@test.example"]);
    await k.migrate.up({ name: NAME });
  });
});
