"use server";
// Notifications actions: anyone signed in chooses how their alerts are grouped into mail.
import { revalidatePath } from "next/cache";
import { defineAction } from "@/app/_lib/guard";
import { setMailPreference } from "@/app/_server/mail/set-mail-preference";
import { mailGroupingSchema } from "@/domain/mail/schemas";

/** Anyone signed in: as they happen, hourly or daily (users.mail_grouping). */
export const setMailPreferenceAction = defineAction({ permission: "signed-in", schema: mailGroupingSchema }, async ({ grouping }, { user, requestId }) => {
  const result = await setMailPreference({ grouping }, { user, requestId });
  revalidatePath("/notifications");
  return result;
});
