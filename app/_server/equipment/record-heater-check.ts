// Record a heater surface-temperature check judged against the chosen procedure's heater
// window, with the next due date and the audit entry.
import "server-only";
import { db } from "@/database/client";
import { insertAuditEntry } from "@/database/queries/audit-log";
import { findHeaterWithLastCheck, insertHeaterCheck } from "@/database/queries/equipment";
import { currentProcedureVersion, findProcedureById } from "@/database/queries/procedures";
import { isoDateIn } from "@/domain/dates/zone";
import { organisationTimeZone } from "@/app/_server/organisation/get-time-zone";
import { heaterNextDueOn, judgeHeaterCheck } from "@/domain/equipment/rules";
import type { RecordHeaterCheckInput } from "@/domain/equipment/schemas";
import { AppError } from "@/domain/result";

type Ctx = { user: { id: number }; requestId: string };

export type HeaterCheckOutcome = { id: number; passed: boolean; misses: string[]; nextDueOn: string; windowMinC: number; windowMaxC: number };

/**
 * Records a surface-temperature check made now by the signed-in person, judged against
 * the heater window of the chosen procedure's current version. A failed check flags the
 * plate until a passing one is recorded.
 */
export async function recordHeaterCheck(input: RecordHeaterCheckInput, ctx: Ctx, now = new Date()): Promise<HeaterCheckOutcome> {
  // The next due date counts from the organisation's local day.
  const timeZone = await organisationTimeZone();
  return db().transaction(async (trx) => {
    // Lock the plate so two checks recorded at once are ordered (the latest one decides the flag).
    const heater = await findHeaterWithLastCheck({ id: input.heaterId, now, timeZone, forUpdate: true }, trx);
    if (!heater) throw new AppError("invalid", "Heater plate does not exist.", { heaterId: ["Heater plate does not exist."] });
    if (!heater.isActive) throw new AppError("invalid", `Heater plate ${heater.assetTag} is retired; put it back in service before recording checks.`, { heaterId: [`Heater plate ${heater.assetTag} is retired.`] });
    const procedure = await findProcedureById({ id: input.procedureId }, trx);
    const version = procedure ? await currentProcedureVersion({ procedureId: procedure.id }, trx) : null;
    if (!procedure || !version) throw new AppError("invalid", "Procedure does not exist.", { procedureId: ["Procedure does not exist."] });
    const window = version.definition.windows.heaterTemperatureC;
    const judgement = judgeHeaterCheck({ faceA: input.faceA, faceB: input.faceB }, { minC: window.min, maxC: window.max });
    const nextDueOn = heaterNextDueOn(isoDateIn(now, timeZone), heater.checkIntervalDays);
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
