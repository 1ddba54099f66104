// Use cases of the Equipment screen: fusion machines (with their total effective piston
// area), heater plates, and heater surface-temperature checks judged against the chosen
// procedure's heater window. One transaction per change, audited; optimistic locking.
import "server-only";
import { db, isDuplicateKey } from "@/database/client";
import { insertAuditEntry } from "@/database/queries/audit-log";
import {
  findHeaterWithLastCheck,
  findMachineById,
  insertHeater,
  insertHeaterCheck,
  insertMachine,
  updateHeater,
  updateMachine,
} from "@/database/queries/equipment";
import { currentProcedureVersion, findProcedureById } from "@/database/queries/procedures";
import { isoDateOf } from "@/domain/office/dates";
import { heaterNextDueOn, judgeHeaterCheck } from "@/domain/office/rules";
import type { CreateHeaterInput, CreateMachineInput, RecordHeaterCheckInput, UpdateHeaterInput, UpdateMachineInput } from "@/domain/office/schemas";
import { AppError } from "@/domain/result";
import { CONFLICT_MESSAGE } from "@/app/_server/jobs/jobs";

type Ctx = { user: { id: number }; requestId: string };

function takenTag(tag: string): AppError {
  return new AppError("invalid", `Asset tag ${tag} is already in use.`, { assetTag: [`Asset tag ${tag} is already in use.`] });
}

function machineFields(input: CreateMachineInput) {
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

export async function createMachine(input: CreateMachineInput, ctx: Ctx): Promise<{ id: number }> {
  try {
    return await db().transaction(async (trx) => {
      const fields = machineFields(input);
      const id = await insertMachine(fields, trx);
      await insertAuditEntry({ actorUserId: ctx.user.id, action: "machine-added", entityType: "fusion-machine", entityId: id, details: { ...fields, enteredIn: input.units }, requestId: ctx.requestId }, trx);
      return { id };
    });
  } catch (error) {
    if (isDuplicateKey(error)) throw takenTag(input.assetTag);
    throw error;
  }
}

export async function editMachine(input: UpdateMachineInput, ctx: Ctx): Promise<{ id: number; version: number }> {
  try {
    return await db().transaction(async (trx) => {
      const before = await findMachineById({ id: input.id, forUpdate: true }, trx);
      if (!before) throw new AppError("not-found", "That machine does not exist.");
      const fields = machineFields(input);
      if (!(await updateMachine({ ...fields, id: input.id, version: input.version, isActive: input.isActive }, trx))) {
        throw new AppError("conflict", CONFLICT_MESSAGE(`Machine ${before.assetTag}`));
      }
      await insertAuditEntry(
        {
          actorUserId: ctx.user.id,
          action: before.isActive && !input.isActive ? "machine-retired" : "machine-updated",
          entityType: "fusion-machine",
          entityId: input.id,
          details: { before: { pistonAreaMm2: before.pistonAreaMm2, isActive: before.isActive, assetTag: before.assetTag }, after: { ...fields, isActive: input.isActive }, enteredIn: input.units },
          requestId: ctx.requestId,
        },
        trx,
      );
      return { id: input.id, version: input.version + 1 };
    });
  } catch (error) {
    if (isDuplicateKey(error)) throw takenTag(input.assetTag);
    throw error;
  }
}

export async function createHeater(input: CreateHeaterInput, ctx: Ctx): Promise<{ id: number }> {
  try {
    return await db().transaction(async (trx) => {
      const id = await insertHeater(input, trx);
      await insertAuditEntry({ actorUserId: ctx.user.id, action: "heater-added", entityType: "heater-plate", entityId: id, details: { ...input }, requestId: ctx.requestId }, trx);
      return { id };
    });
  } catch (error) {
    if (isDuplicateKey(error)) throw takenTag(input.assetTag);
    throw error;
  }
}

export async function editHeater(input: UpdateHeaterInput, ctx: Ctx): Promise<{ id: number; version: number }> {
  try {
    return await db().transaction(async (trx) => {
      const before = await findHeaterWithLastCheck({ id: input.id, forUpdate: true }, trx);
      if (!before) throw new AppError("not-found", "That heater plate does not exist.");
      if (!(await updateHeater(input, trx))) throw new AppError("conflict", CONFLICT_MESSAGE(`Heater plate ${before.assetTag}`));
      await insertAuditEntry(
        {
          actorUserId: ctx.user.id,
          action: before.isActive && !input.isActive ? "heater-retired" : "heater-updated",
          entityType: "heater-plate",
          entityId: input.id,
          details: { before: { assetTag: before.assetTag, checkIntervalDays: before.checkIntervalDays, isActive: before.isActive }, after: { assetTag: input.assetTag, checkIntervalDays: input.checkIntervalDays, isActive: input.isActive } },
          requestId: ctx.requestId,
        },
        trx,
      );
      return { id: input.id, version: input.version + 1 };
    });
  } catch (error) {
    if (isDuplicateKey(error)) throw takenTag(input.assetTag);
    throw error;
  }
}

export type HeaterCheckOutcome = { id: number; passed: boolean; misses: string[]; nextDueOn: string; windowMinC: number; windowMaxC: number };

/**
 * Records a surface-temperature check made now by the signed-in person, judged against
 * the heater window of the chosen procedure's current version. A failed check flags the
 * plate until a passing one is recorded.
 */
export async function recordHeaterCheck(input: RecordHeaterCheckInput, ctx: Ctx, now = new Date()): Promise<HeaterCheckOutcome> {
  return db().transaction(async (trx) => {
    // Lock the plate so two checks recorded at once are ordered (the latest one decides the flag).
    const heater = await findHeaterWithLastCheck({ id: input.heaterId, now, forUpdate: true }, trx);
    if (!heater) throw new AppError("invalid", "Heater plate does not exist.", { heaterId: ["Heater plate does not exist."] });
    if (!heater.isActive) throw new AppError("invalid", `Heater plate ${heater.assetTag} is retired; put it back in service before recording checks.`, { heaterId: [`Heater plate ${heater.assetTag} is retired.`] });
    const procedure = await findProcedureById({ id: input.procedureId }, trx);
    const version = procedure ? await currentProcedureVersion({ procedureId: procedure.id }, trx) : null;
    if (!procedure || !version) throw new AppError("invalid", "Procedure does not exist.", { procedureId: ["Procedure does not exist."] });
    const window = version.definition.windows.heaterTemperatureC;
    const judgement = judgeHeaterCheck({ faceA: input.faceA, faceB: input.faceB }, { minC: window.min, maxC: window.max });
    const nextDueOn = heaterNextDueOn(isoDateOf(now), heater.checkIntervalDays);
    const id = await insertHeaterCheck(
      {
        heaterId: heater.id,
        checkedAt: now,
        checkedBy: ctx.user.id,
        instrument: input.instrument,
        readings: { faceA: input.faceA, faceB: input.faceB },
        windowMinC: window.min,
        windowMaxC: window.max,
        passed: judgement.passed,
        nextDueOn,
        notes: input.notes ?? null,
        procedureVersionId: version.id,
      },
      trx,
    );
    await insertAuditEntry(
      {
        actorUserId: ctx.user.id,
        action: judgement.passed ? "heater-check-passed" : "heater-check-failed",
        entityType: "heater-plate",
        entityId: heater.id,
        details: { checkId: id, procedureVersionId: version.id, windowC: [window.min, window.max], lowestC: judgement.lowestC, highestC: judgement.highestC, misses: judgement.misses, nextDueOn },
        requestId: ctx.requestId,
      },
      trx,
    );
    return { id, passed: judgement.passed, misses: judgement.misses, nextDueOn, windowMinC: window.min, windowMaxC: window.max };
  });
}
