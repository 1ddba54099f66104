// Handling after fusion: no pulling, installation or rough handling for another 30 minutes
// after the joint is taken out of the machine (PPI generic butt-fusion procedure, as
// reproduced in a pipe maker's PE pipe manual; 49 CFR 192.281(a): not disturbed until
// properly set). One definition for the procedure's note and the plan panel's row.
import type { Sourced } from '@/domain/sources';

export const HANDLING_WAIT_MINUTES = 30;

export const HANDLING_WAIT_SOURCE: Sourced = { source: "PPI generic butt-fusion procedure, as reproduced in a pipe maker's manual", status: 'confirmed-2nd' };

/** The note ASTM F2620 procedures carry (stored plans keep this exact text). */
export const HANDLING_WAIT_NOTE = `After cooling in the machine, avoid pulling, installation or rough handling for another ${HANDLING_WAIT_MINUTES} minutes (confirmed in a reproduction).`;

/** A joint recently made on a coil that pipe is now being pulled from. */
export interface RecentJointOnCoil {
  coilCode: string;
  jobCode: string;
  jointNo: number;
  /** When that joint was recorded, after its cooling in the machine. */
  madeAt: Date;
}

/**
 * Warnings for pulling pipe from coils that carry a joint made less than the handling wait
 * before `at`: one per coil, naming the latest such joint and how long is left. Pulling
 * may strain a joint that has not set (49 CFR 192.281(a); the PPI handling wait).
 */
export function handlingWaitWarnings(pulledCoils: readonly string[], recent: readonly RecentJointOnCoil[], at: Date): string[] {
  const out: string[] = [];
  const waitMs = HANDLING_WAIT_MINUTES * 60_000;
  for (const coilCode of new Set(pulledCoils)) {
    const latest = recent
      .filter((r) => r.coilCode === coilCode && r.madeAt.getTime() <= at.getTime() && at.getTime() - r.madeAt.getTime() < waitMs)
      .sort((a, b) => b.madeAt.getTime() - a.madeAt.getTime())[0];
    if (!latest) continue;
    const since = Math.floor((at.getTime() - latest.madeAt.getTime()) / 60_000);
    const left = HANDLING_WAIT_MINUTES - since;
    out.push(
      `Coil ${coilCode} carries ${latest.jobCode} joint ${latest.jointNo}, made ${since} minute${since === 1 ? '' : 's'} before this one: ` +
        `pipe pulled from it now may strain that joint. No pulling, installation or rough handling for ${HANDLING_WAIT_MINUTES} minutes after a joint leaves the machine; wait about ${left} more minute${left === 1 ? '' : 's'} before pulling, or check that joint.`,
    );
  }
  return out;
}
