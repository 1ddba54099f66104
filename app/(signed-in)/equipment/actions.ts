"use server";
// Server actions of the Equipment screen (admin only): machines, heater plates, heater checks.
import { revalidatePath } from "next/cache";
import { defineAction } from "@/app/_lib/guard";
import { createHeaterSchema, createMachineSchema, recordHeaterCheckSchema, updateHeaterSchema, updateMachineSchema } from "@/domain/equipment/schemas";
import { createHeater } from "@/app/_server/equipment/create-heater";
import { createMachine } from "@/app/_server/equipment/create-machine";
import { editHeater } from "@/app/_server/equipment/edit-heater";
import { editMachine } from "@/app/_server/equipment/edit-machine";
import { recordHeaterCheck } from "@/app/_server/equipment/record-heater-check";

const done = <T>(value: T): T => {
  revalidatePath("/equipment");
  revalidatePath("/");
  return value;
};

export const createMachineAction = defineAction({ permission: "manageEquipment", schema: createMachineSchema }, async (input, ctx) => done(await createMachine(input, ctx)));

export const updateMachineAction = defineAction({ permission: "manageEquipment", schema: updateMachineSchema }, async (input, ctx) => done(await editMachine(input, ctx)));

export const createHeaterAction = defineAction({ permission: "manageEquipment", schema: createHeaterSchema }, async (input, ctx) => done(await createHeater(input, ctx)));

export const updateHeaterAction = defineAction({ permission: "manageEquipment", schema: updateHeaterSchema }, async (input, ctx) => done(await editHeater(input, ctx)));

export const recordHeaterCheckAction = defineAction({ permission: "manageEquipment", schema: recordHeaterCheckSchema }, async (input, ctx) => done(await recordHeaterCheck(input, ctx)));
