"use server";
// Server actions of the Procedures screen (admin only; fusers and inspectors may read the page).
import { revalidatePath } from "next/cache";
import { defineAction } from "@/app/_lib/guard";
import { createProcedureSchema, editVersionNotesSchema, tightenProcedureSchema } from "@/domain/office/schemas";
import { createProcedure, editVersionNotes, publishTightenedVersion } from "./_lib/procedures";

const done = <T>(value: T): T => {
  revalidatePath("/procedures");
  return value;
};

export const createProcedureAction = defineAction({ permission: "manageProcedures", schema: createProcedureSchema }, async (input, ctx) => done(await createProcedure(input, ctx)));

export const publishProcedureVersionAction = defineAction({ permission: "manageProcedures", schema: tightenProcedureSchema }, async (input, ctx) => done(await publishTightenedVersion(input, ctx)));

export const editVersionNotesAction = defineAction({ permission: "manageProcedures", schema: editVersionNotesSchema }, async (input, ctx) => done(await editVersionNotes(input, ctx)));
