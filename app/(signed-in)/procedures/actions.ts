"use server";
// Server actions of the Procedures screen (admin only; fusers and inspectors may read the page).
import { revalidatePath } from "next/cache";
import { defineAction } from "@/app/_lib/guard";
import { createProcedureSchema, editVersionNotesSchema, tightenProcedureSchema } from "@/domain/office/schemas";
import { createProcedure, editVersionNotes, publishTightenedVersion } from "@/app/_server/procedures/procedures";

const done = <T>(value: T): T => {
  revalidatePath("/procedures");
  return value;
};

export const createProcedureAction = defineAction({ audience: ["admin"], schema: createProcedureSchema }, async (input, ctx) => done(await createProcedure(input, ctx)));

export const publishProcedureVersionAction = defineAction({ audience: ["admin"], schema: tightenProcedureSchema }, async (input, ctx) => done(await publishTightenedVersion(input, ctx)));

export const editVersionNotesAction = defineAction({ audience: ["admin"], schema: editVersionNotesSchema }, async (input, ctx) => done(await editVersionNotes(input, ctx)));
