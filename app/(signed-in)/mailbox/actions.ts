"use server";
// Mailbox actions: an admin gives a failed mail a fresh set of attempts; anyone signed in
// chooses one mail per alert or a daily summary.
import { revalidatePath } from "next/cache";
import { defineAction } from "@/app/_lib/guard";
import { db } from "@/database/client";
import { insertAuditEntry } from "@/database/queries/audit-log";
import { requeueMail, updateDailyDigest } from "@/database/queries/outbox";
import { AppError } from "@/domain/result";
import { mailPreferenceSchema, retryMailSchema } from "@/domain/review/schemas";

export const retryMailAction = defineAction({ permission: "viewMailbox", schema: retryMailSchema }, async ({ id }, { user, requestId }) => {
  await db().transaction(async (trx) => {
    const ok = await requeueMail({ id, now: new Date() }, trx);
    if (!ok) throw new AppError("conflict", "That mail is not failed any more (it may have been retried already).");
    await insertAuditEntry({ actorUserId: user.id, action: "mail-retried", entityType: "mail", entityId: id, requestId }, trx);
  });
  revalidatePath("/mailbox");
  return { id };
});

/** Anyone signed in chooses how alerts reach them (users.daily_digest). */
export const setMailPreferenceAction = defineAction({ permission: "signed-in", schema: mailPreferenceSchema }, async ({ dailyDigest }, { user, requestId }) => {
  await db().transaction(async (trx) => {
    await updateDailyDigest({ userId: user.id, dailyDigest }, trx);
    await insertAuditEntry({ actorUserId: user.id, action: "mail-preference-set", entityType: "user", entityId: user.id, details: { dailyDigest }, requestId }, trx);
  });
  return { dailyDigest };
});
