"use server";
// Mailbox actions: an admin gives a failed mail a fresh set of attempts; anyone signed in
// chooses one mail per alert or a daily summary.
import { revalidatePath } from "next/cache";
import { defineAction } from "@/app/_lib/guard";
import { retryMail } from "@/app/_server/mail/retry-mail";
import { setMailPreference } from "@/app/_server/mail/set-mail-preference";
import { mailPreferenceSchema, retryMailSchema } from "@/domain/review/schemas";

export const retryMailAction = defineAction({ permission: "viewMailbox", schema: retryMailSchema }, async ({ id }, { user, requestId }) => {
  const result = await retryMail({ id }, { user, requestId });
  revalidatePath("/mailbox");
  return result;
});

/** Anyone signed in chooses how alerts reach them (users.daily_digest). */
export const setMailPreferenceAction = defineAction({ permission: "signed-in", schema: mailPreferenceSchema }, async ({ dailyDigest }, { user, requestId }) => setMailPreference({ dailyDigest }, { user, requestId }));
