// Input schemas (zod) for the fusion domain: the pressure-plan request, recorded joint
// values, an operator's tightening of a procedure, and a stored procedure definition.
// Values in canonical SI (mm, mm², MPa, °C, s); forms convert from the user's units with
// fromDisplay and coerce strings before parsing. Messages name the field in plain words.

import { z } from 'zod';
import {
  FUSION_STANDARDS,
  type ProcedureDefinition,
  type ProcedureFieldError,
  type SizeRule,
} from '@/domain/procedures';
import { VALUE_STATUSES } from '@/domain/sources';
import { PLAN_INPUT_BOUNDS } from '@/domain/fusion/plan-bounds';

export { PLAN_INPUT_BOUNDS } from '@/domain/fusion/plan-bounds';

const number = (label: string, unit: string) => z.number({ error: `${label} must be a number${unit ? ` in ${unit}` : ''}` });

/** Request for a pressure plan: a built-in standard or a stored procedure version, the pipe and the machine. */
export const fusionPlanSchema = z
  .object({
    standard: z.enum(FUSION_STANDARDS, { error: `Standard must be one of ${FUSION_STANDARDS.join(', ')}` }).optional(),
    procedureId: z.string({ error: 'Procedure must be chosen from the list' }).trim().min(1, { error: 'Procedure must be chosen from the list' }).optional(),
    outsideDiameterMm: number('Outside diameter', 'mm')
      .gt(PLAN_INPUT_BOUNDS.outsideDiameterMm.above, { error: 'Outside diameter must be more than 0 mm' })
      .max(PLAN_INPUT_BOUNDS.outsideDiameterMm.max, { error: `Outside diameter must be at most ${PLAN_INPUT_BOUNDS.outsideDiameterMm.max} mm` }),
    sdr: number('SDR', '').gt(PLAN_INPUT_BOUNDS.sdr.above, { error: `SDR must be more than ${PLAN_INPUT_BOUNDS.sdr.above}` }).max(PLAN_INPUT_BOUNDS.sdr.max, { error: `SDR must be at most ${PLAN_INPUT_BOUNDS.sdr.max}` }),
    wallMm: number('Wall', 'mm').gt(0, { error: 'Wall must be more than 0 mm' }).optional(),
    pistonAreaMm2: number('Piston area', 'mm²').gt(0, { error: 'Piston area must be more than 0 mm²' }),
    dragPressureMpa: number('Drag pressure', 'MPa')
      .min(PLAN_INPUT_BOUNDS.dragPressureMpa.min, { error: 'Drag pressure cannot be negative' })
      .max(PLAN_INPUT_BOUNDS.dragPressureMpa.max, { error: `Drag pressure must be at most ${PLAN_INPUT_BOUNDS.dragPressureMpa.max} MPa` }),
  })
  .superRefine((value, ctx) => {
    if (value.standard === undefined && value.procedureId === undefined) {
      ctx.addIssue({ code: 'custom', path: ['procedureId'], message: 'Choose a procedure or a standard' });
    }
    if (value.standard !== undefined && value.procedureId !== undefined) {
      ctx.addIssue({ code: 'custom', path: ['procedureId'], message: 'Choose either a procedure or a standard, not both' });
    }
    if (value.wallMm !== undefined && value.wallMm >= value.outsideDiameterMm / 2) {
      ctx.addIssue({ code: 'custom', path: ['wallMm'], message: 'Wall must be less than half the outside diameter' });
    }
  });

export type FusionPlanInput = z.infer<typeof fusionPlanSchema>;

const optionalMeasurement = (label: string, unit: string, min: number, max: number) =>
  number(label, unit)
    .min(min, { error: `${label} must be at least ${min} ${unit}` })
    .max(max, { error: `${label} must be at most ${max} ${unit}` })
    .nullable()
    .optional();

/** Values recorded for a joint (SI). null = not recorded (the check makes a finding of it). */
export const jointMeasurementsSchema = z.object({
  heaterTemperatureC: optionalMeasurement('Heater temperature', '°C', -50, 400),
  fusionGaugePressureMpa: optionalMeasurement('Fusion gauge pressure', 'MPa', 0, 100),
  beadUpGaugePressureMpa: optionalMeasurement('Bead-up gauge pressure', 'MPa', 0, 100),
  beadMm: optionalMeasurement('Bead size', 'mm', 0, 100),
  heatSoakS: optionalMeasurement('Heat-soak time', 's', 0, 36_000),
  changeoverS: optionalMeasurement('Changeover time', 's', 0, 3_600),
  pressureBuildUpS: optionalMeasurement('Pressure build-up time', 's', 0, 3_600),
  coolingS: optionalMeasurement('Cooling time', 's', 0, 86_400),
  facingOk: z.boolean({ error: 'Facing check must be yes or no' }).nullable().optional(),
  alignmentOk: z.boolean({ error: 'Alignment check must be yes or no' }).nullable().optional(),
  visualBeadOk: z.boolean({ error: 'Visual bead check must be yes or no' }).nullable().optional(),
});

export type JointMeasurementsInput = z.infer<typeof jointMeasurementsSchema>;

const windowTightening = (label: string, unit: string) =>
  z.object({ min: number(`${label} minimum`, unit).optional(), max: number(`${label} maximum`, unit).optional() }).optional();
const minimumTightening = (label: string, unit: string) =>
  z.object({ factor: number(`${label} factor`, '').optional(), atLeast: number(label, unit).optional() }).optional();
const maximumTightening = (label: string, unit: string) =>
  z.object({ factor: number(`${label} factor`, '').optional(), atMost: number(label, unit).optional() }).optional();

/** An operator's tightening of a base procedure (see deriveProcedure for the rules). */
export const procedureTighteningSchema = z.object({
  heaterTemperatureC: windowTightening('Heater temperature', '°C'),
  beadUpInterfacialPressureMpa: windowTightening('Bead-up interfacial pressure', 'MPa'),
  fusionInterfacialPressureMpa: windowTightening('Fusion interfacial pressure', 'MPa'),
  coolingInterfacialPressureMpa: windowTightening('Cooling interfacial pressure', 'MPa'),
  minBeadMm: minimumTightening('Minimum bead', 'mm'),
  heatSoakMinS: minimumTightening('Heat-soak minimum', 's'),
  heatSoakMaxS: maximumTightening('Heat-soak maximum', 's'),
  maxChangeoverS: maximumTightening('Maximum changeover', 's'),
  maxPressureBuildUpS: maximumTightening('Maximum pressure build-up', 's'),
  minCoolingS: minimumTightening('Minimum cooling', 's'),
  wallRangeMm: windowTightening('Wall range', 'mm'),
  outsideDiameterRangeMm: windowTightening('Outside-diameter range', 'mm'),
});

// --- Stored procedure definitions (JSON) -----------------------------------------------

const finite = z.number().refine(Number.isFinite, { error: 'must be a finite number' });
const sourced = { source: z.string().min(1), status: z.enum(VALUE_STATUSES) };
const basis = z.enum(['wall-mm', 'outside-diameter-mm']);

const sizeRuleSchema: z.ZodType<SizeRule> = z.lazy(() =>
  z.union([
    z.object({ kind: z.literal('constant'), value: finite }),
    z.object({ kind: z.literal('linear'), basis, perMm: finite, offset: finite }),
    z.object({
      kind: z.literal('bands'),
      basis,
      interpolate: z.boolean(),
      startMm: finite,
      bands: z.array(z.object({ upToMm: finite, upperInclusive: z.boolean(), from: finite, to: finite })).min(1),
    }),
    z.object({ kind: z.literal('adjusted'), rule: sizeRuleSchema, factor: finite, atLeast: finite.nullable(), atMost: finite.nullable() }),
  ]),
);

const sourcedWindow = z.object({ min: finite, max: finite, ...sourced }).refine((w) => w.min <= w.max, { error: 'min must not be above max' });
const sourcedRule = z.object({ rule: sizeRuleSchema, ...sourced, whereNone: z.object({ value: z.number().positive(), ...sourced }).nullable().optional() });
const sourcedRange = z.object({ min: finite.nullable(), max: finite.nullable(), ...sourced });

const sourcedShelter = z.object({ shelter: z.enum(['windbreak', 'tent', 'heated-tent']), ...sourced });
const weatherRules = z.object({
  ambientRangeC: sourcedRange.nullable(),
  shelterAlways: sourcedShelter.nullable(),
  coldShelter: sourcedShelter.extend({ belowC: finite }).nullable(),
  coolingAdjustment: z.object({ referenceC: finite, percentPerC: z.number().min(0).max(10), ...sourced }).nullable(),
});

/** A procedure definition as stored in the database (plain JSON). */
export const procedureDefinitionSchema = z.object({
  standard: z.enum(FUSION_STANDARDS),
  label: z.string().min(1),
  windows: z.object({
    heaterTemperatureC: sourcedWindow,
    beadUpInterfacialPressureMpa: sourcedWindow,
    fusionInterfacialPressureMpa: sourcedWindow,
    coolingInterfacialPressureMpa: sourcedWindow.nullable(),
    heatSoakInterfacialPressureMpa: z.object({ max: finite, ...sourced }).nullable().optional(),
    minBeadMm: sourcedRule.nullable(),
    heatSoakS: z.object({ target: sizeRuleSchema.nullable(), min: sizeRuleSchema.nullable(), max: sizeRuleSchema.nullable(), ...sourced }).nullable(),
    maxChangeoverS: sourcedRule.nullable(),
    maxPressureBuildUpS: sourcedRule.nullable(),
    minCoolingS: sourcedRule.nullable(),
    wallRangeMm: sourcedRange.nullable(),
    outsideDiameterRangeMm: sourcedRange.nullable(),
    weather: weatherRules.nullable().optional(),
  }),
  notes: z.array(z.string()),
});

export type ParseProcedureDefinitionResult =
  | { ok: true; procedure: ProcedureDefinition }
  | { ok: false; errors: ProcedureFieldError[] };

/**
 * Rebuild a procedure definition from stored JSON (a string or an already-parsed value).
 * Returns every problem with its field path; never throws.
 */
export function parseProcedureDefinition(json: unknown): ParseProcedureDefinitionResult {
  let value = json;
  if (typeof json === 'string') {
    try {
      value = JSON.parse(json);
    } catch {
      return { ok: false, errors: [{ field: '', message: 'The stored procedure is not valid JSON' }] };
    }
  }
  const result = procedureDefinitionSchema.safeParse(value);
  if (!result.success) {
    return { ok: false, errors: result.error.issues.map((issue) => ({ field: issue.path.join('.'), message: issue.message })) };
  }
  return { ok: true, procedure: result.data as ProcedureDefinition };
}

/** Serialise a procedure definition for storage (plain JSON text). */
export function serializeProcedureDefinition(procedure: ProcedureDefinition): string {
  return JSON.stringify(procedure);
}
