// Fuser qualification status for plastic-pipe joining under US 49 CFR 192.285(c):
// the current rule (Plastic Pipe Rule, Amdt. 192-124, 83 FR 58694, §192.285 at 83 FR 58718,
// effective 2019-01-22) and the older rule that governs records made before that date
// (49 CFR 192.285(c) as amended by Amdt. 192-34A, 45 FR 9935, 1980). A status before
// 2019-01-22 without the data the older rule needs says so instead of using today's rule.
// Dates are ISO 'YYYY-MM-DD' civil dates; "on" is passed in (no clock).

import { DomainError } from '@/domain/errors';
import { addMonths, daysBetween, earlierDate, parseIsoDate } from '@/domain/dates/civil';

export type QualificationState =
  | 'current'
  | 'due-soon'
  | 'lapsed'
  | 'requalification-needed'
  | 'never-qualified'
  /** Before 2019-01-22 the older §192.285(c) decides, and its data (joints made, joints failed) is missing. */
  | 'needs-legacy-data';

/** Which text of §192.285(c) decided the status. */
export type QualificationRule = 'current' | 'legacy';

export interface QualificationStatus {
  qualified: boolean;
  /** Last day the person is (or was) qualified; null when never qualified or a failed test ended it. */
  until: string | null;
  reason: string;
  state: QualificationState;
  rule: QualificationRule;
  lastQualifiedOn: string | null;
  /** With state 'needs-legacy-data': the inputs the older rule needs and did not get. */
  missing?: string[];
}

/** Date the current §192.285(c) text took effect (83 FR 58694). */
export const CURRENT_RULE_EFFECTIVE_ON = '2019-01-22';
/** Last day the older §192.285(c) text governed. */
const lastOldDay = '2019-01-21';
/** Longest requalification interval under the current rule, months (49 CFR 192.285(c)). */
export const MAX_REQUALIFICATION_MONTHS = 15;
/** A qualification that runs out within this many days of `on` is due soon (our choice). */
export const DUE_SOON_DAYS = 30;
/** Legacy rule: a 12-month period without joints, or with too many failures, ends it. */
export const LEGACY_PERIOD_MONTHS = 12;

export interface QualificationStatusInput {
  qualifiedOn: string[];
  /** Dates a production joint of this person was found unacceptable by a §192.513 test. */
  failedTestsOn?: string[];
  on: string;
  /** Operator's own interval, 1–15 months; shorter than 15 tightens. */
  intervalMonths?: number;
  /**
   * Older rule (status dates before 2019-01-22): dates of the joints the person made under the
   * procedure. Without it such a status is 'needs-legacy-data'.
   */
  jointsMadeOn?: string[];
  /** Older rule: dates joints were found unacceptable (defaults to failedTestsOn; one is needed). */
  failedJointsOn?: string[];
}

function validDates(dates: readonly string[] | undefined, field: string): string[] {
  return (dates ?? []).map((date) => {
    parseIsoDate(date, field);
    return date;
  });
}

function lastOnOrBefore(dates: readonly string[], on: string): string | null {
  let last: string | null = null;
  for (const date of dates) if (date <= on && (last === null || date > last)) last = date;
  return last;
}

const NEVER = (on: string, rule: QualificationRule): QualificationStatus => ({
  qualified: false,
  until: null,
  reason: `No qualification on or before ${on}`,
  state: 'never-qualified',
  rule,
  lastQualifiedOn: null,
});

/**
 * Qualification status on a date. Current rule (on ≥ 2019-01-22): qualified through the
 * earlier of last qualification + 15 months (or the operator's shorter `intervalMonths`;
 * month ends clamp: 2025-11-30 + 15 → 2027-02-28) and 31 Dec of the next calendar year
 * ("once each calendar year at intervals not exceeding 15 months"); a failed production-joint
 * test dated after the last qualification ends it until the person requalifies (a
 * requalification dated the same day as a failure is taken to follow it). Due soon = runs
 * out within 30 days of `on`.
 * Before 2019-01-22 the older text of §192.285(c) applies (legacyQualificationStatus); it
 * needs the joints made (`jointsMadeOn`) and the joints found unacceptable (`failedJointsOn`
 * or `failedTestsOn`). Without them the state is 'needs-legacy-data' (not qualified, no
 * date), naming what is missing; today's rule is never used for such a date.
 * Source: 49 CFR 192.285(c), current text (eCFR) and the text before 83 FR 58694.
 * Throws DomainError for a malformed date or an interval outside 1–15 months.
 */
export function qualificationStatus(input: QualificationStatusInput): QualificationStatus {
  parseIsoDate(input.on, 'Status date');
  if (input.on < CURRENT_RULE_EFFECTIVE_ON) {
    const failed = input.failedJointsOn ?? input.failedTestsOn;
    const missing = [
      ...(input.jointsMadeOn === undefined ? ['the dates of the joints made under the procedure'] : []),
      ...(failed === undefined ? ['the dates of joints found unacceptable by testing'] : []),
    ];
    if (input.jointsMadeOn === undefined || failed === undefined) {
      const qualifiedOn = validDates(input.qualifiedOn, 'Qualification date');
      return {
        qualified: false,
        until: null,
        reason: `Needs the older rule's data: ${missing.join(' and ')}. On ${input.on} 49 CFR 192.285(c) as in force before ${CURRENT_RULE_EFFECTIVE_ON} decides (requalify after 12 months without joints under the procedure, or after 3 joints or 3 % of the joints made, whichever is greater, found unacceptable); today's rule does not apply`,
        state: 'needs-legacy-data',
        rule: 'legacy',
        lastQualifiedOn: lastOnOrBefore(qualifiedOn, input.on),
        missing,
      };
    }
    return legacyQualificationStatus({
      qualifiedOn: input.qualifiedOn,
      jointsMadeOn: input.jointsMadeOn,
      failedJointsOn: failed,
      on: input.on,
    });
  }
  const interval = input.intervalMonths ?? MAX_REQUALIFICATION_MONTHS;
  if (!Number.isInteger(interval) || interval < 1 || interval > MAX_REQUALIFICATION_MONTHS) {
    throw new DomainError('invalid-input', `Requalification interval must be a whole number of months from 1 to 15 (49 CFR 192.285(c)); got ${String(interval)}`);
  }
  const qualifiedOn = validDates(input.qualifiedOn, 'Qualification date');
  const failures = validDates(input.failedTestsOn, 'Failed test date');
  const on = input.on;
  const last = lastOnOrBefore(qualifiedOn, on);
  if (last === null) return NEVER(on, 'current');

  const failure = failures.filter((date) => date > last && date <= on).sort()[0];
  if (failure !== undefined) {
    return {
      qualified: false,
      until: null,
      reason: `A production joint failed a §192.513 test on ${failure}, after the qualification on ${last}; requalify before making more joints (49 CFR 192.285(c))`,
      state: 'requalification-needed',
      rule: 'current',
      lastQualifiedOn: last,
    };
  }

  const byInterval = addMonths(last, interval);
  const byCalendarYear = `${parseIsoDate(last).year + 1}-12-31`;
  const until = earlierDate(byInterval, byCalendarYear);
  const why = until === byCalendarYear
    ? `31 December of the year after the qualification on ${last}`
    : `${interval} months after the qualification on ${last}`;
  if (on > until) {
    return {
      qualified: false,
      until,
      reason: `Qualification ran out on ${until} (${why}); requalify before making more joints (49 CFR 192.285(c))`,
      state: 'lapsed',
      rule: 'current',
      lastQualifiedOn: last,
    };
  }
  const daysLeft = daysBetween(on, until);
  return {
    qualified: true,
    until,
    reason: `Qualified until ${until} (${why}; 49 CFR 192.285(c))${daysLeft <= DUE_SOON_DAYS ? `: ${daysLeft} days left` : ''}`,
    state: daysLeft <= DUE_SOON_DAYS ? 'due-soon' : 'current',
    rule: 'current',
    lastQualifiedOn: last,
  };
}

export interface LegacyQualificationStatusInput {
  qualifiedOn: string[];
  jointsMadeOn: string[];
  /** Dates joints were found unacceptable by a §192.513 test. */
  failedJointsOn: string[];
  on: string;
}

/**
 * Status under the older §192.285(c) text (in force until 2019-01-21): a person must requalify
 * if during any 12-month period they (1) make no joints under the procedure, or (2) have
 * 3 joints or 3 % of the joints made, whichever is greater, found unacceptable by testing.
 * Reading (our choice, documented): the 12-month clock runs from the last qualification
 * or joint — qualified through that date + 12 months; failures and joints count only after
 * the last qualification; failures are counted over the shortest span that holds them
 * within 12 months, with the joints made in that span as the 3 % base (the strictest
 * reading). Source: 49 CFR 192.285(c) as amended by Amdt. 192-34A (45 FR 9935, 1980), the
 * text replaced by 83 FR 58694 (from memory: the 1980–2018 text was not found in a public copy).
 */
export function legacyQualificationStatus(input: LegacyQualificationStatusInput): QualificationStatus {
  const on = input.on;
  parseIsoDate(on, 'Status date');
  const qualifiedOn = validDates(input.qualifiedOn, 'Qualification date');
  const joints = validDates(input.jointsMadeOn, 'Joint date').sort();
  const failures = validDates(input.failedJointsOn, 'Failed joint date').sort();
  const last = lastOnOrBefore(qualifiedOn, on);
  if (last === null) return NEVER(on, 'legacy');

  // (1) No joints in a 12-month period.
  let activity = last;
  for (const joint of joints) {
    if (joint <= last || joint > on) continue;
    if (joint > addMonths(activity, LEGACY_PERIOD_MONTHS)) break;
    activity = joint;
  }
  const until = addMonths(activity, LEGACY_PERIOD_MONTHS);

  // (2) Too many failures within 12 months.
  const counted = failures.filter((date) => date > last && date <= on && date <= until);
  for (let i = 0; i < counted.length; i += 1) {
    const start = counted[i] as string;
    const periodEnd = addMonths(start, LEGACY_PERIOD_MONTHS);
    for (let k = i; k < counted.length && (counted[k] as string) < periodEnd; k += 1) {
      const end = counted[k] as string;
      const failed = k - i + 1;
      const made = joints.filter((date) => date > last && date >= start && date <= end).length;
      const threshold = Math.max(3, 0.03 * made);
      if (failed >= threshold) {
        return {
          qualified: false,
          until: null,
          reason: `${failed} joints were found unacceptable between ${start} and ${end} (the limit is 3 joints or 3 % of joints made, whichever is greater, in 12 months); requalify before making more joints (49 CFR 192.285(c), text before 2019-01-22)`,
          state: 'requalification-needed',
          rule: 'legacy',
          lastQualifiedOn: last,
        };
      }
    }
  }

  if (on > until) {
    return {
      qualified: false,
      until,
      reason: `No joints for 12 months after ${activity}; qualification ran out on ${until} (49 CFR 192.285(c), text before 2019-01-22)`,
      state: 'lapsed',
      rule: 'legacy',
      lastQualifiedOn: last,
    };
  }
  // The older text governs only until 2019-01-21; from 2019-01-22 the current text decides,
  // which counts from the last qualification (15 months / end of the next calendar year)
  // whatever joints were made. So a qualification the older rule would carry past that date
  // ends on 2019-01-21 unless the current rule keeps it longer.
  const currentUntil = earlierDate(addMonths(last, MAX_REQUALIFICATION_MONTHS), `${parseIsoDate(last).year + 1}-12-31`);
  const carried = until >= CURRENT_RULE_EFFECTIVE_ON;
  const effectiveUntil = !carried ? until : currentUntil >= CURRENT_RULE_EFFECTIVE_ON ? currentUntil : lastOldDay;
  const daysLeft = daysBetween(on, effectiveUntil);
  const why = !carried
    ? `unless a joint is made under the procedure before then (12 months after ${activity}; 49 CFR 192.285(c), text before 2019-01-22)`
    : effectiveUntil === lastOldDay
      ? `the text of 49 CFR 192.285(c) before 2019-01-22 ends then; under the current text the qualification on ${last} has run out`
      : `from 2019-01-22 the current 49 CFR 192.285(c) counts from the qualification on ${last}`;
  return {
    qualified: true,
    until: effectiveUntil,
    reason: `Qualified until ${effectiveUntil} (${why})`,
    state: daysLeft <= DUE_SOON_DAYS ? 'due-soon' : 'current',
    rule: 'legacy',
    lastQualifiedOn: last,
  };
}
