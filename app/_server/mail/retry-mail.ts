// Retry a failed mail (Mailbox, admins): a fresh set of attempts and the audit entry, in
// one transaction.
import "server-only";
import { db } from "@/database/client";
import { insertAuditEntry } from "@/database/queries/audit-log";
import { requeueMail } from "@/database/queries/outbox";
import { AppError } from "@/domain/result";

/** Throws AppError("conflict") when the mail is not failed any more. */
export async function retryMail({ id }: { id: number }, { user, requestId, now = new Date() }: { user: { id: number }; requestId: string; now?: Date }): Promise<{ id: number }> {
  await db().transaction(async (trx) => {
    const ok = await requeueMail({ id, now }, trx);
    if (!ok) throw new AppError("conflict", "That mail is not failed any more (it may have been retried already).");
    await insertAuditEntry({ actorUserId: user.id, action: "mail-retried", entityType: "mail", entityId: id, requestId }, trx);
  });
  return { id };
}
