"use server";
// Server actions of the Trench screen. Each opens with the guard (session → role →
// schema) and delegates to a use case in _lib; no SQL or calculation here.
import { z } from "zod";
import { defineAction } from "@/app/_lib/guard";
import { findCoilByCodeOrTrace } from "@/database/queries/coils";
import { grantOverrideSchema, recordJointSchema } from "@/domain/joints/schemas";
import { grantOverride } from "@/app/_server/joints/grant-override";
import { recordJoint } from "@/app/_server/joints/record-joint";
import { toTrenchCoil, type TrenchCoil } from "@/app/_server/trench/setup-types";

/** Record a joint (the same use case as POST /api/v1/joints). */
export const recordJointAction = defineAction({ permission: "recordJoint", schema: recordJointSchema }, async (input, ctx) => recordJoint(input, ctx));

const lookupCoilSchema = z.object({ code: z.string({ error: "Scan or type a coil id or code." }).trim().min(1, { error: "Scan or type a coil id or code." }).max(200) });

/** A coil by our id, its label's URL or its F2897 code, for the side-A/side-B pickers. */
export const lookupCoilAction = defineAction({ permission: "recordJoint", schema: lookupCoilSchema }, async ({ code }, { user }): Promise<TrenchCoil | null> => {
  const coil = await findCoilByCodeOrTrace({ code, preferCrewId: user.crewId });
  return coil ? toTrenchCoil(coil) : null;
});

/** An inspector or admin clears a blocking warning for a job (recorded, audited). */
export const grantOverrideAction = defineAction({ permission: "grantOverride", schema: grantOverrideSchema }, async (input, ctx) => grantOverride(input, ctx));
