// Rules the Trench screen and the record-joint use case apply before a joint is written:
// flagging a size mismatch between the two sides, and the
// reasons to refuse (lapsed qualification) or to block until an inspector or admin clears
// it (heater-plate check overdue or failed, coil quarantined or used up, coil assigned to
// another crew's job). Pure: the date
// `on` ('YYYY-MM-DD') and every record are passed in.
//
// Sources: butt fusion joins pipe of the same OD and wall (SDR) — ASTM F2620 scope and the
// PPI generic procedure (PPI TR-33); a fuser must hold a current qualification for
// the procedure (49 CFR 192.285, domain/qualifications); the heater face is checked before
// the first joint of the day (PPI "Melt Procedure" page, ASTM F2620); quarantine
// and used-up are Beadline's own coil states, and a coil belongs to the crew of the job it
// is assigned to (our rule, no published source).

import { isHeaterCheckOverdue, isHeaterFlagged } from '@/domain/equipment/rules';
import { formatDayMonth } from '@/domain/dates/civil';
import type { CoilStatus } from '@/domain/coils/statuses';
import type { QualificationStatus } from '@/domain/qualifications/status';
import { formatQuantity, type UnitSystem } from '@/domain/units/format';

// ---------------------------------------------------------------------------------------
// Component mismatch

export interface ComponentSize {
  label: string;
  outsideDiameterMm: number;
  sdr: number;
}

export interface Mismatch {
  field: 'outsideDiameter' | 'sdr';
  message: string;
}

/** Sizes within these are the same size (stored at 0.01 mm / 0.01 SDR). */
const OD_TOLERANCE_MM = 0.05;
const SDR_TOLERANCE = 0.01;

/**
 * Differences between the two sides of a butt-fusion joint: a different outside diameter
 * or a different SDR (so a different wall) cannot be butt fused — the ends must match
 * (ASTM F2620 §1 scope; PPI TR-33 generic procedure). Empty when they match.
 */
export function componentMismatch(a: ComponentSize, b: ComponentSize, system: UnitSystem = 'si'): Mismatch[] {
  const out: Mismatch[] = [];
  if (Math.abs(a.outsideDiameterMm - b.outsideDiameterMm) > OD_TOLERANCE_MM) {
    out.push({
      field: 'outsideDiameter',
      message: `${a.label} is ${formatQuantity(a.outsideDiameterMm, 'length-mm', system)} OD but ${b.label} is ${formatQuantity(b.outsideDiameterMm, 'length-mm', system)} OD: butt fusion joins ends of the same size only.`,
    });
  }
  if (Math.abs(a.sdr - b.sdr) > SDR_TOLERANCE) {
    out.push({
      field: 'sdr',
      message: `${a.label} is SDR ${a.sdr} but ${b.label} is SDR ${b.sdr}: the walls differ, so the ends cannot be butt fused to each other.`,
    });
  }
  return out;
}

// ---------------------------------------------------------------------------------------
// Refusals and blocking warnings

export interface BlockingCoil {
  id: number;
  code: string;
  status: CoilStatus;
  statusReason: string | null;
  remainingM: number;
  /** The job the coil is assigned to, with that job's crew (absent or null: none). */
  assignedJob?: { id: number; code: string; name: string; crewId: number | null; crewName: string | null } | null;
}

export interface BlockingHeater {
  id: number;
  assetTag: string;
  isActive: boolean;
  lastCheck: { passed: boolean; nextDueOn: string } | null;
}

export type BlockKind = 'qualification' | 'heater-check-overdue' | 'heater-check-failed' | 'heater-retired' | 'coil-quarantined' | 'coil-used-up' | 'coil-other-crew';

/**
 * `refuse`: no joint can be recorded (only the office can change it).
 * `override`: an inspector or admin must clear it for this job; the override is recorded.
 */
export type BlockSeverity = 'refuse' | 'override';

export interface BlockReason {
  kind: BlockKind;
  severity: BlockSeverity;
  /** What the override would clear (absent for refusals). */
  subject: { type: 'heater' | 'coil'; id: number } | null;
  message: string;
}

export interface BlockReasonsInput {
  qualification: QualificationStatus;
  procedureLabel: string;
  heater: BlockingHeater | null;
  coils: BlockingCoil[];
  /**
   * The job the joint is recorded on and the crew recording it (the job's crew, or the
   * fuser's for a job without one). Absent: coil ownership is not judged.
   */
  job?: { id: number; crewId: number | null };
  /** The joint's date, 'YYYY-MM-DD'. */
  on: string;
  /** People who can help: admins for qualifications, inspectors and admins for overrides. */
  admins: string[];
  inspectors: string[];
}

function askList(names: string[], role: string): string {
  if (names.length === 0) return `an ${role}`;
  if (names.length === 1) return names[0] as string;
  return `${names.slice(0, -1).join(', ')} or ${names[names.length - 1]}`;
}

/**
 * Every reason this joint must not be recorded as it stands. A lapsed, never-held or
 * failed-test qualification refuses (49 CFR 192.285(c), via qualificationStatus) and says
 * whom to ask; a heater plate whose check is overdue or failed, or a coil that is
 * quarantined or used up, or assigned to another crew's job (coilOwnerElsewhere), needs an
 * inspector's or admin's override. A retired heater plate refuses. Order: refusals first,
 * then overrides, heater before coils.
 */
export function blockReasons(input: BlockReasonsInput): BlockReason[] {
  const out: BlockReason[] = [];
  const q = input.qualification;
  if (!q.qualified) {
    out.push({
      kind: 'qualification',
      severity: 'refuse',
      subject: null,
      message: `You cannot record joints under ${input.procedureLabel} on ${input.on}: ${q.reason}. Ask ${askList(input.admins, 'administrator')} to record your requalification.`,
    });
  }
  const who = askList(input.inspectors, 'inspector or admin');
  const h = input.heater;
  if (h) {
    if (!h.isActive) {
      out.push({ kind: 'heater-retired', severity: 'refuse', subject: null, message: `Heater plate ${h.assetTag} is retired; use another plate.` });
    } else if (isHeaterFlagged(h)) {
      out.push({
        kind: 'heater-check-failed',
        severity: 'override',
        subject: { type: 'heater', id: h.id },
        message: `Heater plate ${h.assetTag} failed its last surface-temperature check. Check it again, or ask ${who} to clear it for this job.`,
      });
    } else if (isHeaterCheckOverdue(h, input.on)) {
      out.push({
        kind: 'heater-check-overdue',
        severity: 'override',
        subject: { type: 'heater', id: h.id },
        message: h.lastCheck
          ? `Heater plate ${h.assetTag}: surface-temperature check overdue since ${formatDayMonth(h.lastCheck.nextDueOn)} (due ${h.lastCheck.nextDueOn}). Check the plate face, or ask ${who} to clear it for this job.`
          : `Heater plate ${h.assetTag} has no surface-temperature check on record. Check the plate face, or ask ${who} to clear it for this job.`,
      });
    }
  }
  for (const coil of input.coils) {
    if (coil.status === 'quarantined') {
      out.push({
        kind: 'coil-quarantined',
        severity: 'override',
        subject: { type: 'coil', id: coil.id },
        message: `Coil ${coil.code} is quarantined${coil.statusReason ? ` (${coil.statusReason})` : ''}. Do not use it unless ${who} clears it for this job.`,
      });
    } else if (coil.status === 'used-up') {
      out.push({
        kind: 'coil-used-up',
        severity: 'override',
        subject: { type: 'coil', id: coil.id },
        message: `Coil ${coil.code} is recorded as used up. Check the label; if the coil really has pipe left, ask ${who} to clear it for this job.`,
      });
    }
    const owner = coilOwnerElsewhere(coil, input.job);
    if (owner) {
      out.push({
        kind: 'coil-other-crew',
        severity: 'override',
        subject: { type: 'coil', id: coil.id },
        message: `Coil ${coil.code} is assigned to job ${owner.code}${owner.name ? ` (${owner.name})` : ''} of ${crewPhrase(owner.crewName)}, not to this job. Use one of your crew's coils, or ask ${who} to clear it for this job before drawing it down.`,
      });
    }
  }
  return out;
}

/** A crew in a sentence: "the River crew" (a name that already ends in "crew" is not doubled), or "another crew". */
export function crewPhrase(name: string | null | undefined): string {
  if (!name) return 'another crew';
  return /\bcrew$/i.test(name.trim()) ? `the ${name.trim()}` : `the ${name.trim()} crew`;
}

/**
 * The other crew's job a coil is assigned to, when it is not the joint's job and that job
 * belongs to a crew other than the recording one (a coil on a job without a crew, or on
 * another job of the same crew, is free to use); null otherwise.
 */
export function coilOwnerElsewhere(coil: Pick<BlockingCoil, 'assignedJob'>, job: BlockReasonsInput['job']): NonNullable<BlockingCoil['assignedJob']> | null {
  const assigned = coil.assignedJob ?? null;
  if (!assigned || !job || assigned.id === job.id) return null;
  if (assigned.crewId === null || assigned.crewId === job.crewId) return null;
  return assigned;
}

/**
 * Block kinds whose override lets a joint name the coil but not draw it down: the pull is not
 * taken off a quarantined or used-up coil (domain/coils/life planPull refuses it). A coil of
 * another crew's job, once cleared, is drawn down like any other.
 */
export const NO_PULL_BLOCKS: readonly BlockKind[] = ['coil-quarantined', 'coil-used-up'];

/**
 * A grant also covers a joint made up to 2 hours before it was given: the fuser is often
 * blocked with the joint already made and cooling. Our choice (no published source).
 */
export const OVERRIDE_LOOKBACK_MS = 2 * 60 * 60_000;

export interface OverrideGrant {
  id: number;
  jobId: number;
  subjectType: 'heater' | 'coil';
  subjectId: number;
  grantedAt: Date;
  expiresAt: Date;
}

/**
 * Splits blocking reasons into those an override grant covers (same job and subject, and
 * the joint's moment inside the grant's hours) and those still open. Refusals are never
 * covered. Each covered reason names the grant that cleared it. A grant holds from 2 hours
 * before it was given until it expires.
 */
export function applyOverrides(
  reasons: BlockReason[],
  grants: OverrideGrant[],
  at: { jobId: number; madeAt: Date },
): { open: BlockReason[]; covered: { reason: BlockReason; grant: OverrideGrant }[] } {
  const open: BlockReason[] = [];
  const covered: { reason: BlockReason; grant: OverrideGrant }[] = [];
  for (const reason of reasons) {
    const grant =
      reason.severity === 'override' && reason.subject
        ? grants.find(
            (g) =>
              g.jobId === at.jobId &&
              g.subjectType === reason.subject!.type &&
              g.subjectId === reason.subject!.id &&
              g.grantedAt.getTime() - OVERRIDE_LOOKBACK_MS <= at.madeAt.getTime() &&
              at.madeAt.getTime() <= g.expiresAt.getTime(),
          )
        : undefined;
    if (grant) covered.push({ reason, grant });
    else open.push(reason);
  }
  return { open, covered };
}

/**
 * Longest a device may take to deliver a joint made offline (days), and how far its clock
 * may run ahead of the server's (minutes). Our choice (no published source).
 */
export const MAX_DELIVERY_DELAY_DAYS = 14;
export const MAX_CLOCK_AHEAD_MIN = 10;

/** Why a joint's made-at moment is not acceptable at `now`, or null. */
export function madeAtProblem(madeAt: Date, now: Date): string | null {
  if (Number.isNaN(madeAt.getTime())) return 'When the joint was made is not a date-time.';
  if (madeAt.getTime() > now.getTime() + MAX_CLOCK_AHEAD_MIN * 60_000) {
    return 'The joint is dated in the future: check the device clock.';
  }
  if (madeAt.getTime() < now.getTime() - MAX_DELIVERY_DELAY_DAYS * 86_400_000) {
    return `The joint is dated more than ${MAX_DELIVERY_DELAY_DAYS} days ago; ask an inspector to enter it from the paper record.`;
  }
  return null;
}
