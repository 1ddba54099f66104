// What the equipment use cases share: the taken-asset-tag refusal and a machine's stored
// fields.
import "server-only";
import type { CreateMachineInput } from "@/domain/equipment/schemas";
import { AppError } from "@/domain/result";

export function takenTag(tag: string): AppError {
  return new AppError("invalid", `Asset tag ${tag} is already in use.`, { assetTag: [`Asset tag ${tag} is already in use.`] });
}

export function machineFields(input: CreateMachineInput) {
  return {
    assetTag: input.assetTag,
    description: input.description ?? null,
    minOdMm: input.minOdMm,
    maxOdMm: input.maxOdMm,
    pistonAreaMm2: input.pistonAreaMm2,
    lastServiceOn: input.lastServiceOn ?? null,
    nextServiceDue: input.nextServiceDue ?? null,
  };
}
