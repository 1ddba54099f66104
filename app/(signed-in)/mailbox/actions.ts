"use server";
// Mailbox actions (admin): give a failed mail a fresh set of attempts.
import { revalidatePath } from "next/cache";
import { defineAction } from "@/app/_lib/guard";
import { db } from "@/database/client";
import { insertAuditEntry } from "@/database/queries/audit-log";
import { requeueMail } from "@/database/queries/outbox";
import { AppError } from "@/domain/result";
import { retryMailSchema } from "@/domain/review/schemas";

export const retryMailAction = defineAction({ audience: ["admin"], schema: retryMailSchema }, async ({ id }, { user, requestId }) => {
  await db().transaction(async (trx) => {
    const ok = await requeueMail({ id, now: new Date() }, trx);
    if (!ok) throw new AppError("conflict", "That mail is not failed any more (it may have been retried already).");
    await insertAuditEntry({ actorUserId: user.id, action: "mail-retried", entityType: "mail", entityId: id, requestId }, trx);
  });
  revalidatePath("/mailbox");
  return { id };
});
