"use server";
// Review screen actions: decide a joint. The inspector role is checked by the wrapper; the
// "never your own joint" rule and the optimistic lock are checked in the use case.
import { revalidatePath } from "next/cache";
import { defineAction } from "@/app/_lib/guard";
import { decideJointSchema } from "@/domain/review/schemas";
import { decideJoint } from "@/app/_server/review/decide-joint";

export const decideJointAction = defineAction({ permission: "decideJoint", schema: decideJointSchema }, async (input, { user, requestId }) => {
  const result = await decideJoint(input, { user, requestId });
  revalidatePath("/review");
  return result;
});
