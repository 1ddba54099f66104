// Input schemas of the Trench screen and the joints JSON API: one schema per input, used by
// react-hook-form on the device (zodResolver) and parsed again on the server. Every value
// is canonical SI (°C, MPa, mm, s, m); the screen converts at its edges. Numbers must be
// numbers: a string "450" is refused here, so an API caller learns of the mistake.
import { z } from 'zod';
import { ID_MAX, optionalId, optionalNumber, requiredId } from '@/domain/form-fields';
import { PLAN_INPUT_BOUNDS } from '@/domain/fusion/plan-bounds';
import { unitLabel } from '@/domain/units/format';
import { SHELTERS } from '@/domain/joints/shelters';
import { DEPRECATED_WIRE_NAMES, RECORDED_VALUE_DEFINITIONS, RECORDED_VALUES } from '@/domain/joints/values';
import { JOINT_KINDS, MAX_PHOTOS_PER_JOINT, TIMED_PHASES, type JointKind } from '@/domain/joints/record-words';

export { JOINT_KINDS, JOINT_KIND_LABELS, type JointKind, TIMED_PHASES, PHASE_LABELS, type TimedPhase, MAX_PHOTOS_PER_JOINT } from '@/domain/joints/record-words';
export { SHELTERS, SHELTER_LABELS, type Shelter } from '@/domain/joints/shelters';

const idOf = (what: string) =>
  z
    .number({ error: (issue) => (issue.input === undefined || issue.input === null ? `Choose the ${what}.` : `The ${what} must be given by its number id.`) })
    .int({ error: `The ${what} id must be a whole number.` })
    .positive({ error: `Choose the ${what}.` })
    .max(ID_MAX.int, { error: `The ${what} is not on file.` });

/** A measured number: required, a real number (not text), inside a plausible range. */
const measured = (name: string, { min, max, unit }: { min: number; max: number; unit: string }) =>
  z
    .number({ error: (issue) => (issue.input === undefined || issue.input === null || issue.input === '' ? `Enter the ${name}.` : `${capital(name)} must be a number.`) })
    .refine((v) => v >= min, { error: min === 0 ? `${capital(name)} cannot be negative.` : `${capital(name)} cannot be below ${min} ${unit}.` })
    .refine((v) => v <= max, { error: `${capital(name)} is implausibly high (more than ${max} ${unit}); check the value.` });

const optionalMeasured = (name: string, range: { min: number; max: number; unit: string }) => measured(name, range).nullable().optional();

function capital(text: string): string {
  return text.charAt(0).toUpperCase() + text.slice(1);
}

const optionalText = (name: string, max: number) =>
  z
    .string({ error: `${capital(name)} must be text.` })
    .trim()
    .max(max, { error: `${capital(name)} is too long (${max} characters at most).` })
    .nullable()
    .optional()
    .transform((v) => (v ? v : null));

const check = (question: string) => z.boolean({ error: `Answer: ${question.charAt(0).toLowerCase()}${question.slice(1)}` });

type ValueField = ReturnType<typeof measured> | ReturnType<typeof optionalMeasured> | ReturnType<typeof check>;
type ValueDefinition = (typeof RECORDED_VALUES)[number];
type FieldOf<D> = D extends { type: 'check' } ? ReturnType<typeof check> : D extends { required: true } ? ReturnType<typeof measured> : ReturnType<typeof optionalMeasured>;
type ValueFields = { [D in ValueDefinition as D['key']]: FieldOf<D> };

/** The recorded values' fields, one per row of domain/joints/values (bounds in canonical SI). */
const valueFields = Object.fromEntries(
  RECORDED_VALUE_DEFINITIONS.map((d): [string, ValueField] => {
    if (d.type === 'check') return [d.key, check(d.question)];
    const range = { ...d.bounds, unit: unitLabel(d.quantity, 'si') };
    return [d.key, d.required ? measured(d.inputName, range) : optionalMeasured(d.inputName, range)];
  }),
) as ValueFields;

/** Fields shared by the device form and the server; see recordJointSchema. */
const jointFields = {
  /** Client-generated id (UUID) that makes a resubmission idempotent. */
  clientId: z.uuid({ error: 'The submission id is missing or is not a UUID.' }),
  jobId: idOf('job'),
  kind: z.enum(JOINT_KINDS, { error: 'Choose what is joined: coil to coil, a tie-in or a fitting.' }),
  /** Side A: our coil id, the coil label's URL or its F2897 traceability code. */
  coilA: z.string({ error: 'Scan or type the coil on side A.' }).trim().min(1, { error: 'Scan or type the coil on side A.' }).max(200, { error: 'Coil A is too long to be a coil id or code.' }),
  /** Side B for coil-to-coil joints. */
  coilB: optionalText('coil B', 200),
  /** Side B for tie-ins (the pipe in the ground) and fittings (what the fitting is). */
  componentBText: optionalText('side B description', 200),
  /** Pipe laid from each coil with this joint, m (drawn down from the coil's remaining length). */
  lengthAM: optionalMeasured('length laid from coil A', { min: 0, max: 2000, unit: 'm' }),
  lengthBM: optionalMeasured('length laid from coil B', { min: 0, max: 2000, unit: 'm' }),
  machineId: idOf('fusion machine'),
  heaterId: idOf('heater plate'),
  /** Heater temperature, pressures, bead, durations and the yes/no checks (domain/joints/values). */
  ...valueFields,
  /** Which durations came from the phase timer; the others were typed. */
  timedFields: z.array(z.enum(TIMED_PHASES, { error: 'Unknown timed phase.' }), { error: 'Timed phases must be a list.' }).max(3).default([]),
  station: optionalText('station', 120),
  latitude: z.number({ error: 'Latitude must be a number.' }).min(-90, { error: 'Latitude must be −90 to 90.' }).max(90, { error: 'Latitude must be −90 to 90.' }).nullable().optional(),
  longitude: z.number({ error: 'Longitude must be a number.' }).min(-180, { error: 'Longitude must be −180 to 180.' }).max(180, { error: 'Longitude must be −180 to 180.' }).nullable().optional(),
  ambientC: measured('ambient temperature', { min: -50, max: 60, unit: '°C' }),
  shelter: z.enum(SHELTERS, { error: 'Say what shelter there was (none, windbreak, tent, heated tent).' }),
  /** The cut-out joint this one remakes. */
  replacesJointId: idOf('joint this remakes').nullable().optional(),
};

type JointShape = {
  kind: JointKind;
  coilB?: string | null;
  componentBText?: string | null;
  lengthBM?: number | null;
};

/** Rules across fields: what side B is depends on the kind of joint. */
function checkSides(value: JointShape, ctx: z.RefinementCtx): void {
  if (value.kind === 'coil-to-coil') {
    if (!value.coilB) ctx.addIssue({ code: 'custom', path: ['coilB'], message: 'Scan or type the coil on side B.' });
  } else {
    if (!value.componentBText) {
      ctx.addIssue({
        code: 'custom',
        path: ['componentBText'],
        message: value.kind === 'fitting' ? 'Say which fitting is on side B.' : 'Describe the pipe in the ground on side B.',
      });
    }
    if (value.lengthBM) ctx.addIssue({ code: 'custom', path: ['lengthBM'], message: 'Only a coil-to-coil joint draws length from a second coil.' });
  }
}

/**
 * Run the side-B rules even when other fields fail, so every missing field is named at
 * once; they need only a known kind.
 */
const sidesWhen = {
  when: (payload: { value: unknown }) => {
    const kind = (payload.value as { kind?: unknown } | null)?.kind;
    return typeof kind === 'string' && (JOINT_KINDS as readonly string[]).includes(kind);
  },
};

const formObject = z.object(jointFields);

/**
 * The device's form: everything but the moment of recording and the photo ids, which the
 * device adds when the fuser taps "Record joint" (the photos upload first).
 */
export const recordJointFormSchema = formObject.superRefine(checkSides, sidesWhen);
export type RecordJointFormInput = z.input<typeof recordJointFormSchema>;
export type RecordJointFormValues = z.output<typeof recordJointFormSchema>;

/**
 * Deprecated JSON API names of recorded values (`fusionGaugeMpa`, `beadUpGaugeMpa`; see
 * README "JSON API"): renamed to the current key before parsing, unless the current key is
 * given too. Joints queued on a device before the rename are accepted the same way.
 */
function acceptDeprecatedNames(input: unknown): unknown {
  if (typeof input !== 'object' || input === null || Array.isArray(input)) return input;
  const out: Record<string, unknown> = { ...input };
  for (const [old, key] of Object.entries(DEPRECATED_WIRE_NAMES)) {
    if (!(old in out)) continue;
    if (!(key in out)) out[key] = out[old];
    delete out[old];
  }
  return out;
}

const deprecatedNameOf = new Map(Object.entries(DEPRECATED_WIRE_NAMES).map(([old, key]) => [key as string, old]));

/** An error on a renamed value is named by both names, so a caller of either finds it. */
function nameDeprecatedToo(_value: unknown, ctx: z.RefinementCtx): void {
  for (const issue of [...ctx.issues]) {
    const [head, ...rest] = issue.path ?? [];
    const old = typeof head === 'string' ? deprecatedNameOf.get(head) : undefined;
    if (old) ctx.issues.push({ ...issue, path: [old, ...rest] });
  }
}

const recordObject = formObject.extend({
  /** When the joint was made, from the device (ISO 8601 with zone); offline joints keep it. */
  madeAt: z.iso.datetime({ offset: true, error: 'When the joint was made must be an ISO date-time such as 2026-12-02T09:30:00Z.' }),
  /** Uploaded bead photos (POST /api/v1/attachments), at most 6. */
  photoIds: z
    .array(z.number({ error: 'Photo ids must be numbers.' }).int().positive(), { error: 'Photo ids must be a list.' })
    .max(MAX_PHOTOS_PER_JOINT, { error: `At most ${MAX_PHOTOS_PER_JOINT} photos per joint.` })
    .default([]),
});

/** One joint as recorded at the trench (server action and POST /api/v1/joints). */
export const recordJointSchema = z
  .preprocess(acceptDeprecatedNames, recordObject)
  .superRefine(checkSides, sidesWhen)
  .superRefine(nameDeprecatedToo, { when: () => true });
export type RecordJointInput = z.output<typeof recordJointSchema>;
export type RecordJointRawInput = z.input<typeof recordObject>;

/** GET /api/v1/fusion-plan: a pipe on a machine under the job's procedure. */
export const fusionPlanQuerySchema = z
  .object({
    jobId: requiredId('Give the job id (jobId).', 'int', 'jobId must be a job id (a whole number).'),
    machineId: requiredId('Give the machine id (machineId).', 'int', 'machineId must be a machine id (a whole number).'),
    coil: z.string().trim().min(1).max(200).optional(),
    // The pipe bounds the plan itself accepts (domain/fusion/schemas PLAN_INPUT_BOUNDS).
    outsideDiameterMm: optionalNumber('outsideDiameterMm', { positive: true, max: PLAN_INPUT_BOUNDS.outsideDiameterMm.max }),
    sdr: optionalNumber('sdr', { max: PLAN_INPUT_BOUNDS.sdr.max }).refine((v) => v === undefined || v > PLAN_INPUT_BOUNDS.sdr.above, { error: `sdr must be more than ${PLAN_INPUT_BOUNDS.sdr.above}.` }),
    dragPressureMpa: optionalNumber('dragPressureMpa', { min: 0, max: PLAN_INPUT_BOUNDS.dragPressureMpa.max }).transform((v) => v ?? 0),
  })
  .superRefine((v, ctx) => {
    if (!v.coil && (v.outsideDiameterMm === undefined || v.sdr === undefined)) {
      ctx.addIssue({ code: 'custom', path: ['coil'], message: 'Give a coil (coil) or the pipe size (outsideDiameterMm and sdr).' });
    }
  });
export type FusionPlanQuery = z.output<typeof fusionPlanQuerySchema>;

/** GET /api/v1/joints: a page of joints, newest first (keyset on made-at and id). */
export const listJointsQuerySchema = z.object({
  jobId: optionalId('jobId must be a job id (a whole number).'),
  clientId: z.uuid({ error: 'clientId must be a UUID.' }).optional(),
  mine: z.enum(['1', 'true', '0', 'false']).optional(),
  limit: optionalNumber('limit', { integer: true, min: 1, max: 200 }).transform((v) => v ?? 50),
  before: optionalId('before must be a joint id (a whole number).', 'bigint'),
});
export type ListJointsQuery = z.output<typeof listJointsQuerySchema>;

/** An inspector or admin clears a blocking warning (heater check overdue, coil quarantined or used up). */
export const grantOverrideSchema = z.object({
  jobId: idOf('job'),
  subject: z.enum(['heater', 'coil'], { error: 'Say whether a heater plate or a coil is cleared.' }),
  subjectId: idOf('heater plate or coil'),
  reason: z.string({ error: 'Say why it is safe to go on.' }).trim().min(10, { error: 'Say why it is safe to go on (10 characters at least).' }).max(500, { error: 'The reason is too long (500 characters at most).' }),
  /** How long the override holds, hours (1–24). */
  hours: z.number({ error: 'Say for how many hours (1–24).' }).int({ error: 'Whole hours, 1–24.' }).min(1, { error: 'Whole hours, 1–24.' }).max(24, { error: 'Whole hours, 1–24.' }).default(12),
});
export type GrantOverrideInput = z.output<typeof grantOverrideSchema>;
