// Input schemas for sign-in and people (Crew screen), shared by forms and server.
import { z } from "zod";
import { ROLES } from "../roles";
import { UNIT_SYSTEMS } from "@/domain/units/format";
import { optionalId, requiredId } from "@/domain/form-fields";

export const MIN_PASSWORD_LENGTH = 12;

export const signInSchema = z.object({
  email: z.string({ error: "Enter your e-mail address." }).trim().toLowerCase().email({ error: "Enter a valid e-mail address." }).max(254),
  password: z.string({ error: "Enter your password." }).min(1, { error: "Enter your password." }).max(200, { error: "Password is too long." }),
});
export type SignInInput = z.infer<typeof signInSchema>;

const passwordField = z
  .string({ error: "Enter a password." })
  .min(MIN_PASSWORD_LENGTH, { error: `Password must be at least ${MIN_PASSWORD_LENGTH} characters.` })
  .max(200, { error: "Password must be at most 200 characters." });

const rolesField = z
  .array(z.enum(ROLES, { error: "Unknown role." }), { error: "Choose at least one role." })
  .min(1, { error: "Choose at least one role." });

export const addPersonSchema = z.object({
  name: z.string({ error: "Enter the person's name." }).trim().min(2, { error: "Enter the person's name." }).max(160, { error: "Name is too long (160 characters at most)." }),
  email: z.string({ error: "Enter an e-mail address." }).trim().toLowerCase().email({ error: "Enter a valid e-mail address." }).max(254),
  roles: rolesField,
  password: passwordField,
  unitSystem: z.enum(UNIT_SYSTEMS, { error: "Choose SI or US customary units." }).default("si"),
  crewId: optionalId("Crew is not valid.").nullable(),
});
export type AddPersonInput = z.infer<typeof addPersonSchema>;

export const updatePersonSchema = z.object({
  id: requiredId("Person id is missing."),
  version: requiredId("Record version is missing."),
  roles: rolesField,
  isActive: z.boolean({ error: "Say whether the person is active." }),
  crewId: optionalId("Crew is not valid.").nullable(),
});
export type UpdatePersonInput = z.infer<typeof updatePersonSchema>;

export const resetPasswordSchema = z.object({
  id: requiredId("Person id is missing."),
  password: passwordField,
});
export type ResetPasswordInput = z.infer<typeof resetPasswordSchema>;

export const unitPreferenceSchema = z.object({
  unitSystem: z.enum(UNIT_SYSTEMS, { error: "Choose SI or US customary units." }),
});
