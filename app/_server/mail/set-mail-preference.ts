// A person chooses how their alerts are grouped into mail — as they happen, hourly or
// daily (users.mail_grouping) — with the audit entry, in one transaction.
import "server-only";
import { db } from "@/database/client";
import { insertAuditEntry } from "@/database/queries/audit-log";
import { updateMailGrouping } from "@/database/queries/outbox";
import type { MailGrouping } from "@/domain/mail/grouping";

export async function setMailPreference({ grouping }: { grouping: MailGrouping }, { user, requestId }: { user: { id: number }; requestId: string }): Promise<{ grouping: MailGrouping }> {
  await db().transaction(async (trx) => {
    await updateMailGrouping({ userId: user.id, grouping }, trx);
    await insertAuditEntry({ actorUserId: user.id, action: "mail-preference-set", entityType: "user", entityId: user.id, details: { grouping }, requestId }, trx);
  });
  return { grouping };
}
