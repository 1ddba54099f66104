// Who is qualified for which procedure on a date: the Crew screen's overview, built on the
// domain's 49 CFR 192.285(c) rule (qualificationStatus). Pure; `on` is passed in.
import { qualificationStatus, type QualificationStatus } from '@/domain/qualifications/status';

export interface QualificationRecord {
  userId: number;
  procedureId: number;
  qualifiedOn: string;
}

export interface FailureRecord {
  userId: number;
  procedureId: number;
  failedOn: string;
}

export interface PersonProcedureStatus {
  userId: number;
  procedureId: number;
  status: QualificationStatus;
}

/**
 * Status for every person × procedure that has at least one qualification or failure on
 * record (people never qualified for a procedure are left out). Sorted by person, then
 * procedure id. Source of the rule: 49 CFR 192.285(c) (see domain/qualifications).
 */
export function qualificationOverview(input: { qualifications: QualificationRecord[]; failures: FailureRecord[]; on: string }): PersonProcedureStatus[] {
  const keys = new Map<string, { userId: number; procedureId: number; dates: string[]; failures: string[] }>();
  const entry = (userId: number, procedureId: number) => {
    const key = `${userId}:${procedureId}`;
    let e = keys.get(key);
    if (!e) keys.set(key, (e = { userId, procedureId, dates: [], failures: [] }));
    return e;
  };
  for (const q of input.qualifications) entry(q.userId, q.procedureId).dates.push(q.qualifiedOn);
  for (const f of input.failures) entry(f.userId, f.procedureId).failures.push(f.failedOn);
  return [...keys.values()]
    .map((e) => ({ userId: e.userId, procedureId: e.procedureId, status: qualificationStatus({ qualifiedOn: e.dates, failedTestsOn: e.failures, on: input.on }) }))
    .sort((a, b) => a.userId - b.userId || a.procedureId - b.procedureId);
}

/** Words for each state, for badges. */
export const QUALIFICATION_STATE_LABELS: Record<QualificationStatus['state'], string> = {
  current: 'Qualified',
  'due-soon': 'Lapses within 30 days',
  lapsed: 'Lapsed',
  'requalification-needed': 'Requalification needed',
  'never-qualified': 'Not qualified',
  'needs-legacy-data': "Needs the older rule's data (before 2019-01-22)",
};

/**
 * The jobs a person may record joints on: those whose procedure they hold a current
 * qualification for on the day of `statuses` (49 CFR 192.285(c)). A procedure with no
 * qualification on record is not qualified.
 */
export function jobsQualifiedFor<J extends { procedureId: number }>(jobs: J[], statuses: { procedureId: number; status: QualificationStatus }[]): J[] {
  return jobs.filter((j) => statuses.some((s) => s.procedureId === j.procedureId && s.status.qualified));
}
