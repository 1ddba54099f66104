"use server";
// Server actions of the Jobs screen (admin only): session → role → schema → use case.
import { revalidatePath } from "next/cache";
import { defineAction } from "@/app/_lib/guard";
import { createJobSchema, setJobStatusSchema, updateJobSchema } from "@/domain/office/schemas";
import { createJob } from "@/app/_server/jobs/create-job";
import { editJob } from "@/app/_server/jobs/edit-job";
import { setJobStatus } from "@/app/_server/jobs/set-job-status";

export const createJobAction = defineAction({ audience: ["admin"], schema: createJobSchema }, async (input, ctx) => {
  const result = await createJob(input, ctx);
  revalidatePath("/jobs");
  return result;
});

export const updateJobAction = defineAction({ audience: ["admin"], schema: updateJobSchema }, async (input, ctx) => {
  const result = await editJob(input, ctx);
  revalidatePath("/jobs");
  return result;
});

export const setJobStatusAction = defineAction({ audience: ["admin"], schema: setJobStatusSchema }, async (input, ctx) => {
  const result = await setJobStatus(input, ctx);
  revalidatePath("/jobs");
  return result;
});
