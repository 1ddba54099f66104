// Input schemas of the Procedures screen: a new procedure, a tightened version (values in
// the person's units, see procedures/form.ts) and version notes.
import { z } from 'zod';
import { FUSION_STANDARDS } from '@/domain/procedures/types';
import { blankToUndefined, optionalNumber, requiredText, optionalText, idField, unitsField } from '@/domain/form-fields';

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
  ambientMin: { path: 'weather.ambientMinC', kind: 'temperature', label: 'Coldest ambient temperature' },
  ambientMax: { path: 'weather.ambientMaxC', kind: 'temperature', label: 'Warmest ambient temperature' },
  coldShelterBelow: { path: 'weather.coldShelterBelowC', kind: 'temperature', label: 'Shelter needed below' },
} as const;

/** The weather rule's shelters: chosen from a list, not typed (see TIGHTENING_FIELDS for the numbers). */
export const SHELTER_RULE_FIELDS = {
  shelterAlways: { path: 'weather.shelterAlways', label: 'Shelter at any temperature (wind, rain)' },
  coldShelter: { path: 'weather.coldShelter', label: 'Shelter needed in the cold' },
} as const;
export type ShelterRuleField = keyof typeof SHELTER_RULE_FIELDS;
export const SHELTER_RULE_FORM_FIELDS = Object.keys(SHELTER_RULE_FIELDS) as ShelterRuleField[];
const ruleShelter = (label: string) =>
  z.preprocess(blankToUndefined, z.enum(['windbreak', 'tent', 'heated-tent'], { error: `${label}: choose a windbreak, a tent or a heated tent.` }).optional());

export type TighteningFormField = keyof typeof TIGHTENING_FIELDS;
export const TIGHTENING_FORM_FIELDS = Object.keys(TIGHTENING_FIELDS) as TighteningFormField[];

/** The tighten form's field labels as the admin sees them, to name failing fields in messages. */
export const TIGHTEN_FORM_LABELS: Readonly<Record<string, string>> = {
  ...Object.fromEntries(TIGHTENING_FORM_FIELDS.map((key) => [key, TIGHTENING_FIELDS[key].label])),
  label: 'Version label',
  note: 'Note on the change',
};

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
    shelterAlways: ruleShelter(SHELTER_RULE_FIELDS.shelterAlways.label),
    coldShelter: ruleShelter(SHELTER_RULE_FIELDS.coldShelter.label),
  })
  .superRefine((value, ctx) => {
    if (TIGHTENING_FORM_FIELDS.every((key) => value[key] === undefined) && SHELTER_RULE_FORM_FIELDS.every((key) => value[key] === undefined)) {
      ctx.addIssue({ code: 'custom', path: ['_form'], message: 'Change at least one window: a new version must tighten something.' });
    }
  });
export type TightenProcedureInput = z.output<typeof tightenProcedureSchema>;

export const editVersionNotesSchema = z.object({
  versionId: idField('Procedure version'),
  notes: requiredText('Notes', 3, 1000),
});
export type EditVersionNotesInput = z.output<typeof editVersionNotesSchema>;
