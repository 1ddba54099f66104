"use server";
// Server actions of the Crew screen (admin only): people, roles, passwords, qualifications,
// and the organisation's time zone.
import { revalidatePath } from "next/cache";
import { z } from "zod";
import { defineAction } from "@/app/_lib/guard";
import { addPersonSchema, resetPasswordSchema, updatePersonSchema } from "@/domain/crew/schemas";
import { recordQualificationFailureSchema, recordQualificationSchema } from "@/domain/qualifications/schemas";
import { addPerson } from "@/app/_server/crew/add-person";
import { resetPassword } from "@/app/_server/crew/reset-password";
import { updatePersonAccess } from "@/app/_server/crew/update-person-access";
import { recordQualification } from "@/app/_server/crew/record-qualification";
import { recordQualificationFailure } from "@/app/_server/crew/record-qualification-failure";
import { setOrganisationTimeZone } from "@/app/_server/organisation/set-time-zone";
import { organisationSettingsSchema } from "@/domain/dates/zone-schema";

const done = <T>(value: T): T => {
  revalidatePath("/crew");
  revalidatePath("/");
  return value;
};

export const addPersonAction = defineAction({ permission: "manageCrew", schema: addPersonSchema }, async (input, ctx) => done(await addPerson(input, ctx)));

export const updatePersonAction = defineAction({ permission: "manageCrew", schema: updatePersonSchema }, async (input, ctx) => done(await updatePersonAccess(input, ctx)));

export const resetPasswordAction = defineAction({ permission: "manageCrew", schema: resetPasswordSchema }, async (input, ctx) => done(await resetPassword(input, ctx)));

/** The qualification form posts FormData (fields + optional evidence file); plain objects work too. */
function fromFormData(raw: unknown): unknown {
  if (!(raw instanceof FormData)) return raw;
  const out: Record<string, unknown> = {};
  for (const [key, value] of raw.entries()) {
    if (key === "evidence") {
      if (typeof value !== "string" && value.size > 0) out.evidence = value;
    } else out[key] = value;
  }
  return out;
}

const qualificationWithEvidenceSchema = z.preprocess(
  fromFormData,
  recordQualificationSchema.extend({
    evidence: z.custom<Blob>((v) => v instanceof Blob, { error: "Evidence must be a file." }).optional(),
  }),
);

export const recordQualificationAction = defineAction({ permission: "manageCrew", schema: qualificationWithEvidenceSchema }, async ({ evidence, ...input }, ctx) => {
  const file = evidence ? { bytes: new Uint8Array(await evidence.arrayBuffer()), contentType: evidence.type, name: (evidence as File).name ?? "evidence" } : null;
  return done(await recordQualification(input, ctx, { evidence: file }));
});

export const recordQualificationFailureAction = defineAction({ permission: "manageCrew", schema: recordQualificationFailureSchema }, async (input, ctx) => done(await recordQualificationFailure(input, ctx)));

/** The organisation's time zone (the Organisation section of this screen). */
export const setOrganisationTimeZoneAction = defineAction({ permission: "manageOrganisation", schema: organisationSettingsSchema }, async (input, ctx) => {
  const result = await setOrganisationTimeZone(input, ctx);
  // Every screen shows times in this zone.
  revalidatePath("/", "layout");
  return result;
});
