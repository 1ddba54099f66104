// The organisation's time zone as an admin chooses it (Crew screen): kept apart from
// domain/dates/zone so the screens that only format times carry no schema code.
import { z } from 'zod';
import { canonicalTimeZone, isTimeZone } from '@/domain/dates/zone';

/** Schema of the organisation's time zone as the admin chooses it (message names the field "Time zone"). */
export const timeZoneSchema = z
  .string({ error: 'Time zone must be chosen from the list.' })
  .trim()
  .min(1, { error: 'Time zone must be chosen from the list.', abort: true })
  .max(64, { error: 'Time zone is too long (64 characters at most).' })
  .refine(isTimeZone, { error: (issue) => `Time zone "${String(issue.input)}" is not a known time zone: choose one from the list (e.g. America/Chicago).` })
  .transform(canonicalTimeZone);

export const organisationSettingsSchema = z.object({ timeZone: timeZoneSchema });
export type OrganisationSettingsInput = z.input<typeof organisationSettingsSchema>;
