// A pressure-trace file belongs to one joint: attaching a trace looks up the SHA-256 of its
// bytes among the stored traces first (database/queries/attachments
// findTraceAttachmentBySha256), so that lookup reads an index rather than every attachment.
import type { Knex } from "knex";

export async function up(knex: Knex): Promise<void> {
  await knex.schema.alterTable("attachments", (t) => {
    t.index(["sha256", "kind"], "attachments_sha256_kind_index");
  });
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.alterTable("attachments", (t) => {
    t.dropIndex(["sha256", "kind"], "attachments_sha256_kind_index");
  });
}
