"use server";
import { updateUnitSystem } from "@/database/queries/users";
import { unitPreferenceSchema } from "@/domain/crew/schemas";
import { defineAction } from "@/app/_lib/guard";

export const setUnitSystemAction = defineAction({ permission: "signed-in", schema: unitPreferenceSchema }, async (input, { user }) => {
  await updateUnitSystem({ id: user.id, unitSystem: input.unitSystem });
  return { unitSystem: input.unitSystem };
});
