// Input schemas of the office screens (Jobs, Equipment, Procedures, Qualifications), used
// by react-hook-form through zodResolver and parsed again on the server. Every message
// names its field in plain words. Quantities arrive in the units the person typed them in
// (`units`: si or us) and leave the schema in canonical SI (mm, mm², °C, MPa, s).
import { z } from 'zod';
import { FUSION_STANDARDS } from '@/domain/fusion/procedures';
import { fromDisplay, type QuantityKind } from '@/domain/units/format';
import { isIsoDate } from '@/domain/office/dates';

const blankToUndefined = (value: unknown) => (value === '' || value === null || (typeof value === 'string' && value.trim() === '') ? undefined : value);

/** Form text → number (blank → undefined, so "Enter …" can be told from "must be a number"). */
const toNumberInput = (value: unknown) => {
  const v = blankToUndefined(value);
  return typeof v === 'string' ? Number(v.trim().replace(',', '.')) : v;
};

/** A number typed in a form (string or number); blank → undefined when optional. */
function numberField(label: string, opts: { min?: number; max?: number; positive?: boolean; integer?: boolean } = {}) {
  let n = z
    .number({ error: (issue) => (issue.input === undefined ? `Enter ${label.toLowerCase()}.` : `${label} must be a number.`) })
    .refine(Number.isFinite, { error: `${label} must be a number.` });
  if (opts.integer) n = n.refine(Number.isInteger, { error: `${label} must be a whole number.` });
  if (opts.positive) n = n.refine((v) => v > 0, { error: `${label} must be more than 0.` });
  if (opts.min !== undefined) {
    const min = opts.min;
    n = n.refine((v) => v >= min, { error: `${label} must be ${min} or more.` });
  }
  if (opts.max !== undefined) {
    const max = opts.max;
    n = n.refine((v) => v <= max, { error: `${label} must be ${max} or less.` });
  }
  return n;
}

function requiredNumber(label: string, opts: Parameters<typeof numberField>[1] = {}) {
  return z.preprocess(toNumberInput, numberField(label, opts));
}

function optionalNumber(label: string, opts: Parameters<typeof numberField>[1] = {}) {
  return z.preprocess(toNumberInput, numberField(label, opts).optional());
}

function requiredText(label: string, min: number, max: number) {
  return z
    .string({ error: `Enter ${label.toLowerCase()}.` })
    .trim()
    .min(1, { error: `Enter ${label.toLowerCase()}.`, abort: true })
    .min(min, { error: `${label} must be at least ${min} characters.` })
    .max(max, { error: `${label} must be at most ${max} characters.` });
}

function optionalText(label: string, max: number) {
  return z.preprocess(
    blankToUndefined,
    z.string({ error: `${label} must be text.` }).trim().max(max, { error: `${label} must be at most ${max} characters.` }).optional(),
  );
}

function requiredDate(label: string) {
  return z
    .string({ error: `Enter ${label.toLowerCase()}.` })
    .trim()
    .min(1, { error: `Enter ${label.toLowerCase()}.` })
    .refine(isIsoDate, { error: `${label} must be a real date (YYYY-MM-DD).` });
}

function optionalDate(label: string) {
  return z.preprocess(blankToUndefined, z.string().trim().refine(isIsoDate, { error: `${label} must be a real date (YYYY-MM-DD).` }).optional());
}

const idField = (label: string) =>
  z.preprocess(blankToUndefined, z.coerce.number({ error: `Choose ${label.toLowerCase()}.` }).int({ error: `Choose ${label.toLowerCase()}.` }).positive({ error: `Choose ${label.toLowerCase()}.` }));

const optionalIdField = (label: string) =>
  z.preprocess(blankToUndefined, z.coerce.number({ error: `${label} is not valid.` }).int().positive({ error: `${label} is not valid.` }).optional());

const versionField = z.coerce.number({ error: 'Record version is missing; reload the page.' }).int().positive({ error: 'Record version is missing; reload the page.' });

export const unitsField = z.enum(['si', 'us'], { error: 'Say which units the values are in (SI or US customary).' });

const toSi = (value: number | undefined, kind: QuantityKind, units: 'si' | 'us') => (value === undefined ? undefined : fromDisplay(value, kind, units));

// ---------------------------------------------------------------------------------------
// Jobs

const jobFields = {
  code: requiredText('Job code', 2, 40).regex(/^[A-Za-z0-9][A-Za-z0-9._/-]*$/, { error: 'Job code may hold letters, digits and . _ / - only (no spaces).' }),
  name: requiredText('Job name', 2, 200),
  place: optionalText('Place', 300),
  latitude: optionalNumber('Latitude', { min: -90, max: 90 }),
  longitude: optionalNumber('Longitude', { min: -180, max: 180 }),
  startsOn: optionalDate('Start date'),
  endsOn: optionalDate('End date'),
  procedureId: idField('Procedure'),
  crewId: optionalIdField('Crew'),
  pipeSizes: optionalText('Pipe sizes in use', 300),
  coilIds: z.array(z.coerce.number().int().positive(), { error: 'Coils must be a list.' }).max(500, { error: 'Assign at most 500 coils at once.' }).default([]),
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

// ---------------------------------------------------------------------------------------
// Equipment

const machineFields = {
  units: unitsField,
  assetTag: requiredText('Asset tag', 2, 40),
  description: optionalText('Description', 200),
  minOd: optionalNumber('Smallest pipe OD', { positive: true }),
  maxOd: optionalNumber('Largest pipe OD', { positive: true }),
  pistonArea: optionalNumber('Total effective piston area', { positive: true }),
  lastServiceOn: optionalDate('Last service date'),
  nextServiceDue: optionalDate('Next service due'),
};

type MachineRaw = { units: 'si' | 'us'; minOd?: number; maxOd?: number; pistonArea?: number; lastServiceOn?: string; nextServiceDue?: string };

function checkMachine(value: MachineRaw, ctx: z.RefinementCtx) {
  if (value.minOd !== undefined && value.maxOd !== undefined && value.minOd > value.maxOd) {
    ctx.addIssue({ code: 'custom', path: ['maxOd'], message: 'Largest pipe OD must not be smaller than the smallest.' });
  }
  if (value.lastServiceOn && value.nextServiceDue && value.nextServiceDue < value.lastServiceOn) {
    ctx.addIssue({ code: 'custom', path: ['nextServiceDue'], message: 'Next service due must be after the last service date.' });
  }
  const areaMm2 = toSi(value.pistonArea, 'area', value.units);
  // Carriage cylinders of field butt-fusion machines: a few hundred to some tens of
  // thousands of mm² (our reading, no published source); outside 10–100,000 mm²
  // (about 0.016–155 in²) the value is surely a unit slip.
  if (areaMm2 !== undefined && (areaMm2 < 10 || areaMm2 > 100_000)) {
    ctx.addIssue({ code: 'custom', path: ['pistonArea'], message: `Total effective piston area ${value.pistonArea} ${value.units === 'us' ? 'in²' : 'mm²'} is not plausible; check the unit on the data plate.` });
  }
}

function machineToSi<T extends MachineRaw>(value: T) {
  const { minOd, maxOd, pistonArea, ...rest } = value;
  return {
    ...rest,
    minOdMm: toSi(minOd, 'length-mm', value.units) ?? null,
    maxOdMm: toSi(maxOd, 'length-mm', value.units) ?? null,
    pistonAreaMm2: toSi(pistonArea, 'area', value.units) ?? null,
  };
}

export const createMachineSchema = z.object(machineFields).superRefine(checkMachine).transform(machineToSi);
export type CreateMachineInput = z.output<typeof createMachineSchema>;

export const updateMachineSchema = z
  .object({ id: idField('Machine'), version: versionField, isActive: z.boolean({ error: 'Say whether the machine is in service.' }), ...machineFields })
  .superRefine(checkMachine)
  .transform(machineToSi);
export type UpdateMachineInput = z.output<typeof updateMachineSchema>;

const heaterFields = {
  assetTag: requiredText('Asset tag', 2, 40),
  description: optionalText('Description', 200),
  checkIntervalDays: requiredNumber('Check interval', { integer: true, min: 1, max: 365 }),
};

export const createHeaterSchema = z.object(heaterFields);
export type CreateHeaterInput = z.output<typeof createHeaterSchema>;

export const updateHeaterSchema = z.object({ id: idField('Heater plate'), version: versionField, isActive: z.boolean({ error: 'Say whether the heater plate is in service.' }), ...heaterFields });
export type UpdateHeaterInput = z.output<typeof updateHeaterSchema>;

/** At least this many points per face (several points of each face; our choice). */
export const MIN_POINTS_PER_FACE = 3;
export const MAX_POINTS_PER_FACE = 8;

const readingList = (face: 'A' | 'B') =>
  z
    .array(z.preprocess(toNumberInput, numberField(`Face ${face} reading`).optional()), { error: `Enter the face ${face} readings.` })
    .max(MAX_POINTS_PER_FACE, { error: `Face ${face}: at most ${MAX_POINTS_PER_FACE} readings.` })
    .transform((list) => list.filter((v): v is number => v !== undefined))
    .refine((list) => list.length >= MIN_POINTS_PER_FACE, { error: `Face ${face}: enter at least ${MIN_POINTS_PER_FACE} readings (several points of the face).` });

export const recordHeaterCheckSchema = z
  .object({
    units: unitsField,
    heaterId: idField('Heater plate'),
    procedureId: idField('Procedure whose heater window applies'),
    instrument: requiredText('Instrument', 2, 120),
    faceA: readingList('A'),
    faceB: readingList('B'),
    notes: optionalText('Notes', 500),
  })
  .superRefine((value, ctx) => {
    // Surface thermometers read 0–400 °C here; anything outside is a typing or unit slip.
    for (const face of ['faceA', 'faceB'] as const) {
      value[face].forEach((reading) => {
        const c = fromDisplay(reading, 'temperature', value.units);
        if (c < 0 || c > 400) {
          ctx.addIssue({ code: 'custom', path: [face], message: `Face ${face === 'faceA' ? 'A' : 'B'} reading ${reading} ${value.units === 'us' ? '°F' : '°C'} is not a plausible heater surface temperature.` });
        }
      });
    }
  })
  .transform((value) => ({
    ...value,
    faceA: value.faceA.map((r) => fromDisplay(r, 'temperature', value.units)),
    faceB: value.faceB.map((r) => fromDisplay(r, 'temperature', value.units)),
  }));
export type RecordHeaterCheckInput = z.output<typeof recordHeaterCheckSchema>;

// ---------------------------------------------------------------------------------------
// Procedures

export const createProcedureSchema = z.object({
  code: requiredText('Procedure code', 2, 40).regex(/^[A-Za-z0-9][A-Za-z0-9._/-]*$/, { error: 'Procedure code may hold letters, digits and . _ / - only (no spaces).' }),
  name: requiredText('Procedure name', 3, 200),
  standard: z.enum(FUSION_STANDARDS as unknown as [string, ...string[]], { error: 'Choose the published standard the procedure is based on.' }),
  notes: optionalText('Notes', 1000),
});
export type CreateProcedureInput = z.output<typeof createProcedureSchema>;

/** Form field → where it goes in the domain's ProcedureTightening, and its kind. */
export const TIGHTENING_FIELDS = {
  heaterMin: { path: 'heaterTemperatureC.min', kind: 'temperature', label: 'Heater temperature minimum' },
  heaterMax: { path: 'heaterTemperatureC.max', kind: 'temperature', label: 'Heater temperature maximum' },
  beadUpPressureMin: { path: 'beadUpInterfacialPressureMpa.min', kind: 'pressure', label: 'Bead-up pressure minimum' },
  beadUpPressureMax: { path: 'beadUpInterfacialPressureMpa.max', kind: 'pressure', label: 'Bead-up pressure maximum' },
  fusionPressureMin: { path: 'fusionInterfacialPressureMpa.min', kind: 'pressure', label: 'Fusion pressure minimum' },
  fusionPressureMax: { path: 'fusionInterfacialPressureMpa.max', kind: 'pressure', label: 'Fusion pressure maximum' },
  minBeadAtLeast: { path: 'minBeadMm.atLeast', kind: 'length-mm', label: 'Minimum bead floor' },
  maxChangeoverAtMost: { path: 'maxChangeoverS.atMost', kind: 'duration', label: 'Maximum changeover cap' },
  minCoolingFactor: { path: 'minCoolingS.factor', kind: 'factor', label: 'Cooling-time factor' },
  minCoolingAtLeastMin: { path: 'minCoolingS.atLeast', kind: 'minutes', label: 'Minimum cooling floor' },
  odMin: { path: 'outsideDiameterRangeMm.min', kind: 'length-mm', label: 'Smallest OD covered' },
  odMax: { path: 'outsideDiameterRangeMm.max', kind: 'length-mm', label: 'Largest OD covered' },
} as const;

export type TighteningFormField = keyof typeof TIGHTENING_FIELDS;
export const TIGHTENING_FORM_FIELDS = Object.keys(TIGHTENING_FIELDS) as TighteningFormField[];

const tighteningNumbers = Object.fromEntries(
  TIGHTENING_FORM_FIELDS.map((key) => {
    const f = TIGHTENING_FIELDS[key];
    return [key, optionalNumber(f.label, f.kind === 'temperature' ? {} : { positive: true })];
  }),
) as Record<TighteningFormField, ReturnType<typeof optionalNumber>>;

export const tightenProcedureSchema = z
  .object({
    units: unitsField,
    procedureId: idField('Procedure'),
    /** The version the admin looked at; publishing fails with a conflict if a newer one exists. */
    basedOnVersionId: idField('Version to tighten'),
    label: optionalText('Version label', 200),
    note: requiredText('Note on the change', 3, 1000),
    ...tighteningNumbers,
  })
  .superRefine((value, ctx) => {
    if (TIGHTENING_FORM_FIELDS.every((key) => value[key] === undefined)) {
      ctx.addIssue({ code: 'custom', path: ['_form'], message: 'Change at least one window: a new version must tighten something.' });
    }
  });
export type TightenProcedureInput = z.output<typeof tightenProcedureSchema>;

export const editVersionNotesSchema = z.object({
  versionId: idField('Procedure version'),
  notes: requiredText('Notes', 3, 1000),
});
export type EditVersionNotesInput = z.output<typeof editVersionNotesSchema>;

// ---------------------------------------------------------------------------------------
// Qualifications (49 CFR 192.285)

export const QUALIFICATION_METHODS = ['visual-bend', 'visual-tensile', 'ultrasonic'] as const;
export type QualificationMethod = (typeof QUALIFICATION_METHODS)[number];

/** Words for each §192.285(b) specimen test. */
export const QUALIFICATION_METHOD_LABELS: Record<QualificationMethod, string> = {
  'visual-bend': 'Visual examination and bend test (at least 3 longitudinal straps)',
  'visual-tensile': 'Visual examination and tensile test',
  ultrasonic: 'Ultrasonic inspection',
};

export const recordQualificationSchema = z.object({
  userId: idField('Person'),
  procedureId: idField('Procedure'),
  qualifiedOn: requiredDate('Qualification date'),
  method: z.enum(QUALIFICATION_METHODS, { error: 'Choose the test method (visual plus bend, visual plus tensile, or ultrasonic).' }),
  specimenResult: requiredText("Specimen joint's result", 3, 300),
  evaluator: requiredText('Evaluator', 2, 160),
});
export type RecordQualificationInput = z.output<typeof recordQualificationSchema>;

export const recordQualificationFailureSchema = z.object({
  userId: idField('Person'),
  procedureId: idField('Procedure'),
  failedOn: requiredDate('Date the joint failed its test'),
  jointId: optionalIdField('Joint number'),
  notes: requiredText('What was found', 3, 500),
});
export type RecordQualificationFailureInput = z.output<typeof recordQualificationFailureSchema>;
