// The same two coils joined again. A coil's end is butt fused to the next coil's start
// once; a second joint between the same two coils is either the remake of a joint that was
// cut out, or a mistake (a label scanned twice, the wrong coil typed). The Trench screen
// asks which before recording. Common practice (no published source). Pure: the joints
// already known (the server's and this device's) are passed in.
import type { JointOutcome } from '@/domain/joints/outcomes';
import type { ReviewState } from '@/domain/joints/review-states';

/** A joint between two coils, as the device knows it. */
export interface CoilPairJoint {
  /** Null while the joint waits on this device to be sent. */
  id: number | null;
  jointNo: number | null;
  jobId: number;
  coilACode: string;
  coilBCode: string;
  /** ISO instant. */
  madeAt: string;
  outcome: JointOutcome | null;
  reviewState: ReviewState | null;
  replacedByJointId: number | null;
}

const same = (a: string, b: string) => a.trim().toUpperCase() === b.trim().toUpperCase();

/**
 * The latest joint that joined these two coils (in either order), or null. Codes are
 * compared without regard to case or surrounding spaces.
 */
export function earlierJointOfCoils(joints: CoilPairJoint[], coilA: string, coilB: string): CoilPairJoint | null {
  if (!coilA.trim() || !coilB.trim() || same(coilA, coilB)) return null;
  const matches = joints.filter((j) => (same(j.coilACode, coilA) && same(j.coilBCode, coilB)) || (same(j.coilACode, coilB) && same(j.coilBCode, coilA)));
  if (!matches.length) return null;
  return matches.reduce((latest, j) => (j.madeAt > latest.madeAt ? j : latest));
}

/** How the earlier joint is named in the question ("joint 12", or the one waiting on this device). */
export function describePairJoint(j: CoilPairJoint): string {
  return j.jointNo !== null ? `joint ${j.jointNo}` : 'a joint recorded on this device and not yet sent';
}

/**
 * Why the new joint cannot be recorded as the remake of `j` (null when it can): the same
 * conditions the server's record-joint applies — a remake replaces a joint on the same job
 * that is out of limits or was cut out, and that no other joint has replaced yet.
 */
export function whyNotRemakeOf(j: CoilPairJoint, jobId: number | undefined): string | null {
  if (j.id === null || j.jointNo === null) return 'That joint is still waiting on this device to be sent; a remake can link to it once it has a joint number.';
  if (jobId !== undefined && j.jobId !== jobId) return `Joint ${j.jointNo} is on another job; a remake replaces a joint on the same job.`;
  if (j.replacedByJointId !== null) return `Joint ${j.jointNo} has already been remade.`;
  if (j.outcome === 'within-limits' && j.reviewState !== 'cut-out') return `Joint ${j.jointNo} is within limits and was not cut out, so there is nothing to remake. If it was cut out, an inspector records the cut-out first.`;
  return null;
}
