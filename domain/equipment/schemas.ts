// Input schemas of the Equipment screen (machines, heater plates, heater checks), used by
// react-hook-form through zodResolver and parsed again on the server. Quantities arrive in
// the units the person typed them in (`units`: si or us) and leave in canonical SI (mm², °C).
import { z } from 'zod';
import { fromDisplay, type UnitSystem } from '@/domain/units/format';
import { toNumberInput, numberField, requiredNumber, optionalNumber, requiredText, optionalText, optionalDate, idField, versionField, unitsField, toSi } from '@/domain/form-fields';

const machineFields = {
  units: unitsField,
  assetTag: requiredText('Asset tag', 2, 40),
  description: optionalText('Description', 200),
  minOd: optionalNumber('Smallest pipe OD', { positive: true }),
  maxOd: optionalNumber('Largest pipe OD', { positive: true }),
  pistonArea: optionalNumber('Total effective piston area', { positive: true }),
  gaugeResolution: optionalNumber('Gauge resolution', { positive: true }),
  thermometerResolution: optionalNumber('Thermometer resolution', { positive: true }),
  lastServiceOn: optionalDate('Last service date'),
  nextServiceDue: optionalDate('Next service due'),
};

type MachineRaw = { units: UnitSystem; minOd?: number; maxOd?: number; pistonArea?: number; gaugeResolution?: number; thermometerResolution?: number; lastServiceOn?: string; nextServiceDue?: string };

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
  // A gauge read coarser than 1 MPa (145 psi) or a thermometer coarser than 10 °C would
  // excuse most of a window: surely a unit slip (our bound).
  const gaugeMpa = toSi(value.gaugeResolution, 'pressure', value.units);
  if (gaugeMpa !== undefined && gaugeMpa > 1) {
    ctx.addIssue({ code: 'custom', path: ['gaugeResolution'], message: 'Gauge resolution is not plausible: enter the smallest step the gauge is read to.' });
  }
  const thermometerC = value.thermometerResolution === undefined ? undefined : value.units === 'us' ? (value.thermometerResolution * 5) / 9 : value.thermometerResolution;
  if (thermometerC !== undefined && thermometerC > 10) {
    ctx.addIssue({ code: 'custom', path: ['thermometerResolution'], message: 'Thermometer resolution is not plausible: enter the smallest step the thermometer reads.' });
  }
}

function machineToSi<T extends MachineRaw>(value: T) {
  const { minOd, maxOd, pistonArea, gaugeResolution, thermometerResolution, ...rest } = value;
  return {
    ...rest,
    minOdMm: toSi(minOd, 'length-mm', value.units) ?? null,
    maxOdMm: toSi(maxOd, 'length-mm', value.units) ?? null,
    pistonAreaMm2: toSi(pistonArea, 'area', value.units) ?? null,
    gaugeResolutionMpa: toSi(gaugeResolution, 'pressure', value.units) ?? null,
    // A step of temperature: °F steps are 5/9 of a °C (no 32° offset).
    thermometerResolutionC: thermometerResolution === undefined ? null : value.units === 'us' ? (thermometerResolution * 5) / 9 : thermometerResolution,
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
