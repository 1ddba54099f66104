"use server";
// Mailbox actions: an admin gives a failed mail a fresh set of attempts.
import { revalidatePath } from "next/cache";
import { defineAction } from "@/app/_lib/guard";
import { retryMail } from "@/app/_server/mail/retry-mail";
import { retryMailSchema } from "@/domain/review/schemas";

export const retryMailAction = defineAction({ permission: "viewMailbox", schema: retryMailSchema }, async ({ id }, { user, requestId }) => {
  const result = await retryMail({ id }, { user, requestId });
  revalidatePath("/mailbox");
  return result;
});

