"use server";
// Server actions of the Jobs screen (admin only): session → role → schema → use case.
import { revalidatePath } from "next/cache";
import { defineAction } from "@/app/_lib/guard";
import { createJobSchema, setJobStatusSchema, updateJobSchema } from "@/domain/jobs/schemas";
import { createJob } from "@/app/_server/jobs/create-job";
import { editJob } from "@/app/_server/jobs/edit-job";
import { setJobStatus } from "@/app/_server/jobs/set-job-status";

export const createJobAction = defineAction({ permission: "manageJobs", schema: createJobSchema }, async (input, ctx) => {
  const result = await createJob(input, ctx);
  revalidatePath("/jobs");
  return result;
});

export const updateJobAction = defineAction({ permission: "manageJobs", schema: updateJobSchema }, async (input, ctx) => {
  const result = await editJob(input, ctx);
  revalidatePath("/jobs");
  return result;
});

export const setJobStatusAction = defineAction({ permission: "manageJobs", schema: setJobStatusSchema }, async (input, ctx) => {
  const result = await setJobStatus(input, ctx);
  revalidatePath("/jobs");
  return result;
});
