// Input schemas of the Jobs screen, used by react-hook-form through zodResolver and parsed
// again on the server. Every message names its field in plain words.
import { z } from 'zod';
import { optionalNumber, requiredText, optionalText, optionalDate, idField, optionalIdField, versionField, requiredId } from '@/domain/form-fields';

/** What a job code may hold: letters, digits and . _ / - (no spaces), starting with a letter or digit. */
export const JOB_CODE_PATTERN = /^[A-Za-z0-9][A-Za-z0-9._/-]*$/;

const jobFields = {
  code: requiredText('Job code', 2, 40).regex(JOB_CODE_PATTERN, { error: 'Job code may hold letters, digits and . _ / - only (no spaces).' }),
  name: requiredText('Job name', 2, 200),
  place: optionalText('Place', 300),
  latitude: optionalNumber('Latitude', { min: -90, max: 90 }),
  longitude: optionalNumber('Longitude', { min: -180, max: 180 }),
  startsOn: optionalDate('Start date'),
  endsOn: optionalDate('End date'),
  procedureId: idField('Procedure'),
  crewId: optionalIdField('Crew'),
  pipeSizes: optionalText('Pipe sizes in use', 300),
  coilIds: z.array(requiredId('Choose coils from the list.'), { error: 'Coils must be a list.' }).max(500, { error: 'Assign at most 500 coils at once.' }).default([]),
};

function checkJob(value: { latitude?: number; longitude?: number; startsOn?: string; endsOn?: string }, ctx: z.RefinementCtx) {
  if ((value.latitude === undefined) !== (value.longitude === undefined)) {
    const path = value.latitude === undefined ? 'latitude' : 'longitude';
    ctx.addIssue({ code: 'custom', path: [path], message: 'Give both latitude and longitude, or neither.' });
  }
  if (value.startsOn && value.endsOn && value.endsOn < value.startsOn) {
    ctx.addIssue({ code: 'custom', path: ['endsOn'], message: 'End date must be on or after the start date.' });
  }
}

export const createJobSchema = z.object(jobFields).superRefine(checkJob);
export type CreateJobInput = z.output<typeof createJobSchema>;

export const updateJobSchema = z.object({ id: idField('Job'), version: versionField, ...jobFields }).superRefine(checkJob);
export type UpdateJobInput = z.output<typeof updateJobSchema>;

export const setJobStatusSchema = z.object({
  id: idField('Job'),
  version: versionField,
  status: z.enum(['open', 'closed'], { error: 'Status must be open or closed.' }),
});
export type SetJobStatusInput = z.output<typeof setJobStatusSchema>;
