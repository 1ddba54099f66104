// Coil planning: joints and fusion time for a run laid from straight lengths versus coils,
// which coil to use next, and coil status moves (the length left after a pull is
// domain/coils/life's planPull).
// Common practice of PE gas crews (no published source): a run of n pieces needs n − 1
// butt-fusion joints between pieces plus the joints at its two ends (tie-ins/fittings).

import { DomainError } from '@/domain/errors';
import { COIL_STATUS_PHRASES, type CoilStatus } from '@/domain/coils/statuses';

/** Length tolerance, m, so that 304.8 m of 12.192 m sticks is exactly 25 pieces. */
const LENGTH_TOLERANCE_M = 1e-9;

export interface CoilRunInput {
  /** Length of the run, m. */
  runLengthM: number;
  /** Length of one stick or coil, m. */
  pieceLengthM: number;
  /** Joints at the ends of the run (tie-ins, fittings), usually 2. */
  endJoints: number;
  /** Time for one joint including cooling, minutes. */
  minutesPerJoint: number;
}

export interface CoilRunPlan {
  pieces: number;
  joints: number;
  fusionMinutes: number;
}

function assertNonNegative(value: number, label: string): void {
  if (typeof value !== 'number' || !Number.isFinite(value) || value < 0) {
    throw new DomainError('invalid-input', `${label} must be a number of 0 or more (got ${String(value)})`);
  }
}

/**
 * Joints and fusion minutes for a run: pieces = ⌈run ÷ piece⌉, joints = pieces − 1 + end
 * joints, minutes = joints × minutes per joint. Lengths in m; no rounding beyond ⌈ ⌉.
 * Check value (common practice): 1,000 ft from 40 ft sticks → 26 joints; from one coil → 2.
 * Throws DomainError for a run or piece length ≤ 0 or negative joints/minutes.
 */
export function planCoilRun(input: CoilRunInput): CoilRunPlan {
  if (!(input.runLengthM > 0)) throw new DomainError('invalid-input', `Run length must be more than 0 m (got ${String(input.runLengthM)})`);
  if (!(input.pieceLengthM > 0)) throw new DomainError('invalid-input', `Piece length must be more than 0 m (got ${String(input.pieceLengthM)})`);
  assertNonNegative(input.endJoints, 'End joints');
  assertNonNegative(input.minutesPerJoint, 'Minutes per joint');
  if (!Number.isInteger(input.endJoints)) throw new DomainError('invalid-input', `End joints must be a whole number (got ${input.endJoints})`);
  const pieces = Math.max(1, Math.ceil(input.runLengthM / input.pieceLengthM - LENGTH_TOLERANCE_M));
  const joints = pieces - 1 + input.endJoints;
  return { pieces, joints, fusionMinutes: joints * input.minutesPerJoint };
}

/**
 * Joints and fusion minutes saved by laying a run from coils instead of sticks, minutes.
 * Check value (common practice): 1,000 ft, 40 ft sticks vs one coil, 20 min a joint → 480 min.
 */
export function coilSavings(input: { runLengthM: number; stickLengthM: number; coilLengthM: number; endJoints: number; minutesPerJoint: number }): {
  sticks: CoilRunPlan;
  coils: CoilRunPlan;
  jointsSaved: number;
  minutesSaved: number;
} {
  const sticks = planCoilRun({ runLengthM: input.runLengthM, pieceLengthM: input.stickLengthM, endJoints: input.endJoints, minutesPerJoint: input.minutesPerJoint });
  const coils = planCoilRun({ runLengthM: input.runLengthM, pieceLengthM: input.coilLengthM, endJoints: input.endJoints, minutesPerJoint: input.minutesPerJoint });
  return { sticks, coils, jointsSaved: sticks.joints - coils.joints, minutesSaved: sticks.fusionMinutes - coils.fusionMinutes };
}

export { COIL_STATUSES, type CoilStatus } from '@/domain/coils/statuses';

/** What nextCoil needs to know of a coil. */
export interface CoilForPlanning {
  id: string;
  status: CoilStatus;
  remainingM: number;
  /** ISO date the coil was received; oldest goes first. */
  receivedOn: string;
}

/**
 * Which coil to lay the next run from: a coil already in use before one on the trailer
 * (finish the open coil), then the oldest received (first in, first out), then by id;
 * only coils with at least `runLengthM` left. null when no coil on hand is long enough.
 * Our rule of thumb (common practice, no published source).
 */
export function nextCoil<T extends CoilForPlanning>(coils: readonly T[], runLengthM: number): T | null {
  const rank = (status: CoilStatus) => (status === 'in-use' ? 0 : 1);
  const candidates = coils
    .filter((coil) => (coil.status === 'in-use' || coil.status === 'on-trailer') && coil.remainingM + LENGTH_TOLERANCE_M >= runLengthM)
    .sort((a, b) => rank(a.status) - rank(b.status) || a.receivedOn.localeCompare(b.receivedOn) || a.id.localeCompare(b.id));
  return candidates[0] ?? null;
}

// Status moves (our rules): quarantine is allowed from any state and needs a reason;
// used-up is terminal except for quarantine (a recall can reach pipe already laid);
// a quarantined coil may be released to the yard (with a reason) or written off as used up.
const MOVES: Readonly<Record<CoilStatus, readonly CoilStatus[]>> = {
  'in-yard': ['on-trailer', 'quarantined'],
  'on-trailer': ['in-yard', 'in-use', 'quarantined'],
  'in-use': ['on-trailer', 'in-yard', 'used-up', 'quarantined'],
  'used-up': ['quarantined'],
  quarantined: ['in-yard', 'used-up'],
};

/** Plain-language reason a status move is refused, or null when it is allowed. */
export function coilMoveProblem(from: CoilStatus, to: CoilStatus, reason?: string): string | null {
  if (!MOVES[from] || !MOVES[to]) return `Unknown coil status "${!MOVES[from] ? from : to}"`;
  if (from === to) return `The coil is already ${COIL_STATUS_PHRASES[from]}`;
  if (!MOVES[from].includes(to)) return `A coil that is ${COIL_STATUS_PHRASES[from]} cannot be moved to ${COIL_STATUS_PHRASES[to]}`;
  const needsReason = to === 'quarantined' || from === 'quarantined';
  if (needsReason && !(reason && reason.trim().length > 0)) {
    return to === 'quarantined' ? 'Say why the coil is quarantined' : 'Say why the coil leaves quarantine';
  }
  return null;
}

/** Whether a coil may move from one status to another (see coilMoveProblem for the reason). */
export function canMoveCoil(from: CoilStatus, to: CoilStatus, reason?: string): boolean {
  return coilMoveProblem(from, to, reason) === null;
}
