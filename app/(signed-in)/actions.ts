"use server";
import { setUnitSystem } from "@/app/_server/crew/set-unit-system";
import { unitPreferenceSchema } from "@/domain/crew/schemas";
import { defineAction } from "@/app/_lib/guard";

export const setUnitSystemAction = defineAction({ permission: "signed-in", schema: unitPreferenceSchema }, async (input, { user }) => setUnitSystem(input, { user }));
