import { describe, expect, test } from 'vitest';
import {
  fusionPlanSchema,
  jointMeasurementsSchema,
  procedureTighteningSchema,
} from '@/domain/fusion/schemas';

const valid = { standard: 'astm-f2620', outsideDiameterMm: 60.325, sdr: 11, pistonAreaMm2: 3000, dragPressureMpa: 0.2 };

const messages = (result: { success: boolean; error?: { issues: { path: PropertyKey[]; message: string }[] } }) =>
  Object.fromEntries((result.error?.issues ?? []).map((issue) => [issue.path.join('.'), issue.message]));

describe('fusionPlanSchema', () => {
  test('accepts a standard or a procedure id', () => {
    expect(fusionPlanSchema.safeParse(valid).success).toBe(true);
    const { standard: _standard, ...withoutStandard } = valid;
    expect(fusionPlanSchema.safeParse({ ...withoutStandard, procedureId: 'proc-17' }).success).toBe(true);
  });
  test.each([
    // common practice (no published source): plain-language messages naming the field
    [{ outsideDiameterMm: 0 }, 'outsideDiameterMm', 'Outside diameter must be more than 0 mm'],
    [{ outsideDiameterMm: '60' }, 'outsideDiameterMm', 'Outside diameter must be a number in mm'],
    [{ sdr: 2 }, 'sdr', 'SDR must be more than 2'],
    [{ pistonAreaMm2: -1 }, 'pistonAreaMm2', 'Piston area must be more than 0 mm²'],
    [{ dragPressureMpa: -0.1 }, 'dragPressureMpa', 'Drag pressure cannot be negative'],
    [{ standard: 'astm-f9999' }, 'standard', 'Standard must be one of astm-f2620, iso-21307-slp, iso-21307-dlp, iso-21307-shp, dvs-2207-1'],
    [{ standard: undefined }, 'procedureId', 'Choose a procedure or a standard'],
    [{ procedureId: 'proc-17' }, 'procedureId', 'Choose either a procedure or a standard, not both'],
    [{ wallMm: 40 }, 'wallMm', 'Wall must be less than half the outside diameter'],
  ])('%o → %s: %s', (change, field, message) => {
    expect(messages(fusionPlanSchema.safeParse({ ...valid, ...change }))[field]).toBe(message);
  });
  test('lists every bad field at once', () => {
    const result = fusionPlanSchema.safeParse({ standard: 'astm-f2620', outsideDiameterMm: -1, sdr: 1, pistonAreaMm2: 0, dragPressureMpa: -1 });
    expect(Object.keys(messages(result)).sort()).toEqual(['dragPressureMpa', 'outsideDiameterMm', 'pistonAreaMm2', 'sdr']);
  });
});

describe('jointMeasurementsSchema', () => {
  test('null means not recorded and is allowed', () => {
    expect(jointMeasurementsSchema.safeParse({ heaterTemperatureC: null, coolingS: 400, facingOk: true }).success).toBe(true);
  });
  test('out-of-range values name the field', () => {
    expect(messages(jointMeasurementsSchema.safeParse({ coolingS: -5 })).coolingS).toBe('Cooling time must be at least 0 s');
    expect(messages(jointMeasurementsSchema.safeParse({ facingOk: 'yes' })).facingOk).toBe('Facing check must be yes or no');
  });
});

describe('procedureTighteningSchema', () => {
  test('accepts a tightening and refuses text numbers', () => {
    expect(procedureTighteningSchema.safeParse({ heaterTemperatureC: { min: 210 }, minCoolingS: { factor: 1.2 } }).success).toBe(true);
    expect(messages(procedureTighteningSchema.safeParse({ maxChangeoverS: { atMost: 'ten' } }))['maxChangeoverS.atMost']).toBe('Maximum changeover must be a number in s');
  });
});
