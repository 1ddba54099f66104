// A person chooses how alerts reach them: one mail per alert or the daily digest
// (users.daily_digest), with the audit entry, in one transaction.
import "server-only";
import { db } from "@/database/client";
import { insertAuditEntry } from "@/database/queries/audit-log";
import { updateDailyDigest } from "@/database/queries/outbox";

export async function setMailPreference({ dailyDigest }: { dailyDigest: boolean }, { user, requestId }: { user: { id: number }; requestId: string }): Promise<{ dailyDigest: boolean }> {
  await db().transaction(async (trx) => {
    await updateDailyDigest({ userId: user.id, dailyDigest }, trx);
    await insertAuditEntry({ actorUserId: user.id, action: "mail-preference-set", entityType: "user", entityId: user.id, details: { dailyDigest }, requestId }, trx);
  });
  return { dailyDigest };
}
