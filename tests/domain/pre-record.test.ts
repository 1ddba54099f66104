// The checks the Trench screen and the record-joint use case share (domain/joints/pre-record.ts)
// and the one scanned-coil resolver (domain/coils/scanned-coil.ts).
import { describe, expect, test } from 'vitest';
import { resolveScannedCoil, type ScannableCoil } from '@/domain/coils/scanned-coil';
import { planButtFusion } from '@/domain/fusion/plan';
import { buttFusionPlanInput, machineTakesPipe, MACHINE_OD_TOLERANCE_MM, noPublishedVersionMessage, preRecordProblems } from '@/domain/joints/pre-record';
import { inToMm } from '@/domain/units';

// IPS outside diameters: 2" = 2.375 in = 60.33 mm, 4" = 4.500 in = 114.3 mm
// source: ASTM D2513 IPS sizes (ASME B36.10M outside diameters)
const TWO_IN = 60.33;
const FOUR_IN = 114.3;

describe('machine size range', () => {
  const machine = { assetTag: 'FM-201', minOdMm: TWO_IN, maxOdMm: FOUR_IN };
  test.each([
    // common practice (no published source): a stored OD within 0.05 mm of a bound is inside it
    [TWO_IN, true],
    [FOUR_IN, true],
    [TWO_IN - MACHINE_OD_TOLERANCE_MM, true],
    [FOUR_IN + MACHINE_OD_TOLERANCE_MM, true],
    [TWO_IN - 0.06, false],
    [FOUR_IN + 0.06, false],
    [inToMm(6.625), false],
  ])('OD %s mm → takes it: %s', (od, takes) => {
    expect(machineTakesPipe(machine, od)).toBe(takes);
  });

  test('an open end takes any size on that side', () => {
    expect(machineTakesPipe({ minOdMm: null, maxOdMm: FOUR_IN }, 20)).toBe(true);
  });
});

describe('pre-record problems, in the order the server refuses', () => {
  const a = { id: 1, code: 'LV-C0001', outsideDiameterMm: TWO_IN, sdr: 11 };
  const machine = { assetTag: 'FM-114', minOdMm: 90, maxOdMm: 315 };
  test('same coil on both sides, then the machine', () => {
    expect(preRecordProblems({ sideA: a, sideB: { ...a }, machine }).map((p) => [p.kind, p.field])).toEqual([
      ['same-coil', 'coilB'],
      ['machine-size', 'machineId'],
    ]);
    expect(preRecordProblems({ sideA: a, sideB: { ...a }, machine: null })[0]!.message).toBe('Side B is the same coil as side A (LV-C0001).');
  });
  test('a size mismatch names both sides; a tie-in has no side B', () => {
    const b = { id: 2, code: 'LV-C0002', outsideDiameterMm: FOUR_IN, sdr: 11 };
    expect(preRecordProblems({ sideA: a, sideB: b, machine: null }).map((p) => p.kind)).toEqual(['size-mismatch']);
    expect(preRecordProblems({ sideA: a, sideB: null, machine: { ...machine, minOdMm: null } })).toEqual([]);
  });
  test('one wording for a job without a published procedure version', () => {
    expect(noPublishedVersionMessage('WO-24117')).toBe('Job WO-24117 has no published procedure version; ask an administrator.');
  });
  test('the plan inputs come from the coil, the machine and the measured drag', () => {
    const input = buttFusionPlanInput({ procedure: undefined as never, pipe: { outsideDiameterMm: TWO_IN, sdr: 11 }, machine: { pistonAreaMm2: 3000 }, dragPressureMpa: 0.1 });
    expect(input).toMatchObject({ outsideDiameterMm: TWO_IN, sdr: 11, pistonAreaMm2: 3000, dragPressureMpa: 0.1 });
    expect(() => planButtFusion({ ...input, procedure: undefined, standard: 'astm-f2620' })).not.toThrow();
  });
});

describe('which coil a scanned text means', () => {
  const code = 'QFivfn5SWH123Kj0'; // an ASTM F2897 code shared by one lot (tests/database/coils.test.ts)
  const coil = (id: number, over: Partial<ScannableCoil>): ScannableCoil => ({ id, code: `LV-C000${id}`, traceCode: code, status: 'in-yard', crewId: null, ...over });
  const coils = [coil(1, { status: 'used-up' }), coil(2, {}), coil(3, { status: 'on-trailer', crewId: 7 }), coil(4, { status: 'in-use', traceCode: null })];
  test.each([
    ['LV-C0004', null, 4], // our coil id
    ['lv-c0004', null, 4], // ignoring case
    ['https://beadline.example/coils/LV-C0002', null, 2], // the label's QR address
    [code, null, 3], // on a trailer before in the yard before used up
    [code, 9, 3],
    [code.toLowerCase(), null, null], // F2897 codes are case-sensitive
    ['   ', null, null],
  ])('%s (crew %s) → coil %s', (text, crew, id) => {
    expect(resolveScannedCoil(text, coils, { preferCrewId: crew })?.id ?? null).toBe(id);
  });
  test("the fuser's crew's coil wins over status", () => {
    expect(resolveScannedCoil(code, [coil(5, { status: 'in-use' }), coil(6, { crewId: 2 })], { preferCrewId: 2 })?.id).toBe(6);
  });
});
