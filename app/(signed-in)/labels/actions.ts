"use server";
// Labels: stamp the coils whose labels were just sent to the printer (or downloaded from a
// coil's page). The label files themselves are served by GET, which never records anything.
import { revalidatePath } from "next/cache";
import { defineAction } from "@/app/_lib/guard";
import { markLabelsPrintedSchema } from "@/domain/coils/schemas";
import { markLabelsPrinted } from "@/app/_server/coils/mark-labels-printed";

export const markLabelsPrintedAction = defineAction({ permission: "printLabels", schema: markLabelsPrintedSchema }, async (input, ctx) => {
  const count = await markLabelsPrinted(input.coilIds, input.how, ctx);
  revalidatePath("/coils");
  return { count };
});
