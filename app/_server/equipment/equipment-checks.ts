// What the equipment use cases share: the taken-asset-tag refusal, the transaction that
// answers with it, and a machine's stored fields.
import "server-only";
import type { Knex } from "knex";
import { db, isDuplicateKey } from "@/database/client";
import type { CreateMachineInput } from "@/domain/equipment/schemas";
import { AppError } from "@/domain/result";

export function takenTag(tag: string): AppError {
  return new AppError("invalid", `Asset tag ${tag} is already in use.`, { assetTag: [`Asset tag ${tag} is already in use.`] });
}

/** Runs an add or edit of a machine or heater plate in one transaction; the unique asset-tag key answers as `takenTag`. */
export async function inAssetTransaction<T>(assetTag: string, work: (trx: Knex.Transaction) => Promise<T>): Promise<T> {
  try {
    return await db().transaction(work);
  } catch (error) {
    if (isDuplicateKey(error)) throw takenTag(assetTag);
    throw error;
  }
}

export function machineFields(input: CreateMachineInput) {
  return {
    assetTag: input.assetTag,
    description: input.description ?? null,
    minOdMm: input.minOdMm,
    maxOdMm: input.maxOdMm,
    pistonAreaMm2: input.pistonAreaMm2,
    gaugeResolutionMpa: input.gaugeResolutionMpa,
    thermometerResolutionC: input.thermometerResolutionC,
    lastServiceOn: input.lastServiceOn ?? null,
    nextServiceDue: input.nextServiceDue ?? null,
  };
}
