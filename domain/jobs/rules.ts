// Job rules: whether a job takes joints.

export type JobStatus = 'open' | 'closed';

/** A closed job takes no new joints (issue 4). Trench uses this before recording. */
export function canRecordOnJob(job: { status: JobStatus }): boolean {
  return job.status === 'open';
}

/** Why a job cannot take joints, in words; null when it can. */
export function jobBlockReason(job: { status: JobStatus; code: string }): string | null {
  return canRecordOnJob(job) ? null : `Job ${job.code} is closed and takes no new joints.`;
}
