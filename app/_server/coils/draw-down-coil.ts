// Draw a pull recorded at the trench off a coil, inside the caller's transaction (the
// record-joint use case): locks the coil row FOR UPDATE, asks the domain whether the pull
// may be taken (planPull: positive, not longer than what is left, not from a quarantined
// or used-up coil) and writes it. The audit entry is the caller's (the joint record).
import "server-only";
import type { Knex } from "knex";
import { lockCoil, writeCoilLength, writeCoilPull, type DrawDownResult, type LockedCoil } from "@/database/queries/coils";
import { planPull } from "@/domain/coils/life";
import { AppError } from "@/domain/result";
import type { UnitSystem } from "@/domain/units/format";

export type { DrawDownResult };

/**
 * Refusals are AppError("invalid", message, { [field]: [message] }), `field` defaulting to
 * "pullM" ("LV-C0001 has only 12.00 m left; the pull of 20.00 m is longer"); lengths in m,
 * messages in `unitSystem`.
 */
export async function drawDownCoil(
  {
    coilId,
    pullM,
    jointId,
    userId,
    jobId,
    field = "pullM",
    unitSystem = "si",
  }: { coilId: number; pullM: number; jointId?: number | null; userId: number; jobId?: number | null; field?: string; unitSystem?: UnitSystem },
  trx: Knex.Transaction,
): Promise<DrawDownResult> {
  const coil = await lockCoil({ id: coilId }, trx);
  if (!coil) throw new AppError("invalid", `Coil ${coilId} is not on file.`, { [field]: [`Coil ${coilId} is not on file.`] });
  const pull = planPull(coil, pullM, unitSystem);
  if (!pull.ok) throw new AppError("invalid", pull.message, { [field]: [pull.message] });
  return writeCoilPull({ coil, pull, pullM, jointId, userId, jobId }, trx);
}

/**
 * drawDownCoil's first half for a coil the caller locked with its other coils (lockCoils):
 * judges the pull and writes the coil's length and status; the event naming the joint is
 * written once the joint exists (insertPullEvents). `coil` null: no such coil. Same refusals.
 */
export async function drawDownLockedCoil(
  { coilId, coil, pullM, jobId, field = "pullM", unitSystem = "si" }: { coilId: number; coil: LockedCoil | null | undefined; pullM: number; jobId: number | null; field?: string; unitSystem?: UnitSystem },
  trx: Knex.Transaction,
): Promise<DrawDownResult> {
  if (!coil) throw new AppError("invalid", `Coil ${coilId} is not on file.`, { [field]: [`Coil ${coilId} is not on file.`] });
  const pull = planPull(coil, pullM, unitSystem);
  if (!pull.ok) throw new AppError("invalid", pull.message, { [field]: [pull.message] });
  return writeCoilLength({ coil, pull, pullM, jobId }, trx);
}
