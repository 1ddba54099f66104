"use server";
// Review screen actions: decide a joint, accept many joints within limits. The inspector
// role is checked by the wrapper; the "never your own joint" rule, "never out of limits in a
// batch" and the optimistic lock are checked in the use case.
import { revalidatePath } from "next/cache";
import { defineAction } from "@/app/_lib/guard";
import { batchAcceptSchema, decideJointSchema } from "@/domain/review/schemas";
import { decideJoint } from "@/app/_server/review/decide-joint";
import { acceptBatch } from "@/app/_server/review/accept-batch";

export const decideJointAction = defineAction({ permission: "decideJoint", schema: decideJointSchema }, async (input, { user, requestId }) => {
  const result = await decideJoint(input, { user, requestId });
  revalidatePath("/review");
  return result;
});

export const acceptBatchAction = defineAction({ permission: "decideJoint", schema: batchAcceptSchema, labels: { joints: "Joints", note: "Note" } }, async (input, { user, requestId }) => {
  const result = await acceptBatch(input, { user, requestId });
  revalidatePath("/review");
  return result;
});
