"use server";
// Server actions of the Procedures screen (admin only; fusers and inspectors may read the page).
import { revalidatePath } from "next/cache";
import { defineAction } from "@/app/_lib/guard";
import { TIGHTEN_FORM_LABELS, createProcedureSchema, editVersionNotesSchema, tightenProcedureSchema } from "@/domain/procedures/schemas";
import { createProcedure } from "@/app/_server/procedures/create-procedure";
import { editVersionNotes } from "@/app/_server/procedures/edit-version-notes";
import { publishTightenedVersion } from "@/app/_server/procedures/publish-tightened-version";

const done = <T>(value: T): T => {
  revalidatePath("/procedures");
  return value;
};

export const createProcedureAction = defineAction({ permission: "manageProcedures", schema: createProcedureSchema }, async (input, ctx) => done(await createProcedure(input, ctx)));

export const publishProcedureVersionAction = defineAction({ permission: "manageProcedures", schema: tightenProcedureSchema, labels: TIGHTEN_FORM_LABELS }, async (input, ctx) => done(await publishTightenedVersion(input, ctx)));

export const editVersionNotesAction = defineAction({ permission: "manageProcedures", schema: editVersionNotesSchema }, async (input, ctx) => done(await editVersionNotes(input, ctx)));
