import { unit } from 'mathjs';
import { describe, expect, test } from 'vitest';
import {
  fromDisplay,
  formatDuration,
  formatQuantity,
  formatRange,
  QUANTITY_KINDS,
  toDisplay,
  unitLabel,
  type QuantityKind,
} from '@/domain/units';
import { cToF, fToC, inToMm, mmToIn, mpaToPsi, psiToMpa, ftToM, mToFt, in2ToMm2, mm2ToIn2 } from '@/domain/units';

/** Relative agreement to 1 part in 10⁹ (mathjs stores psi as 6894.75729 Pa, rounded). */
function expectClose(actual: number, expected: number): void {
  expect(Math.abs(actual - expected)).toBeLessThanOrEqual(1e-9 * Math.max(1, Math.abs(expected)));
}

// Every conversion is checked against mathjs's unit library (a general-purpose reference).
describe('conversions agree with mathjs', () => {
  const cases: [string, (value: number) => number, number, string, string][] = [
    ['in → mm', inToMm, 2.375, 'inch', 'mm'],
    ['mm → in', mmToIn, 60.325, 'mm', 'inch'],
    ['ft → m', ftToM, 1000, 'ft', 'm'],
    ['m → ft', mToFt, 152.4, 'm', 'ft'],
    ['psi → MPa', psiToMpa, 75, 'psi', 'MPa'],
    ['MPa → psi', mpaToPsi, 0.62, 'MPa', 'psi'],
    ['°F → °C', fToC, 450, 'degF', 'degC'],
    ['°C → °F', cToF, 204, 'degC', 'degF'],
    ['in² → mm²', in2ToMm2, 12.5, 'inch^2', 'mm^2'],
    ['mm² → in²', mm2ToIn2, 7352, 'mm^2', 'inch^2'],
  ];
  test.each(cases)('%s', (_name, convert, value, from, to) => {
    // source: mathjs unit conversion (general-purpose reference library)
    expectClose(convert(value), unit(value, from).toNumber(to));
  });
});

describe('published unit checks', () => {
  test.each([
    // source: ASTM F2620 heater window, unit checks (computed, NIST SP 811): 400 °F = 204.4 °C, 450 °F = 232.2 °C
    [400, 204.4],
    [450, 232.2],
  ])('%s °F is %s °C to 0.1', (f, c) => {
    expect(Math.round(fToC(f) * 10) / 10).toBe(c);
  });
  test.each([
    // source: ASTM F2620 interfacial pressure, unit checks (NIST SP 811): 60/75/90 psi = 0.414/0.517/0.621 MPa
    [60, 0.414],
    [75, 0.517],
    [90, 0.621],
  ])('%s psi is %s MPa to 0.001', (psi, mpa) => {
    expect(Math.round(psiToMpa(psi) * 1000) / 1000).toBe(mpa);
  });
});

describe('toDisplay and fromDisplay', () => {
  const values: Record<QuantityKind, number> = {
    'length-mm': 15.3,
    'length-m': 304.8,
    pressure: 0.517,
    temperature: 218,
    area: 7352,
    duration: 397,
  };
  test.each(QUANTITY_KINDS.flatMap((kind) => (['si', 'us'] as const).map((system) => [kind, system] as const)))(
    '%s in %s round-trips',
    (kind, system) => {
      // common practice (no published source): a form value converted to SI and back is unchanged
      expect(fromDisplay(toDisplay(values[kind], kind, system), kind, system)).toBeCloseTo(values[kind], 10);
    },
  );
  test.each([
    ['length-mm', 25.4, 1, 'inch', 'mm'],
    ['length-m', 0.3048 * 1000, 1000, 'ft', 'm'],
    ['pressure', unit(90, 'psi').toNumber('MPa'), 90, 'psi', 'MPa'],
    ['temperature', unit(450, 'degF').toNumber('degC'), 450, 'degF', 'degC'],
    ['area', unit(1, 'inch^2').toNumber('mm^2'), 1, 'inch^2', 'mm^2'],
  ] as const)('US %s: display value matches mathjs', (kind, si, us, _from, _to) => {
    // source: mathjs unit conversion
    expectClose(toDisplay(si, kind, 'us'), us);
    expectClose(fromDisplay(us, kind, 'us'), si);
  });
  test('durations are seconds in both systems', () => {
    expect(toDisplay(397, 'duration', 'us')).toBe(397);
  });
});

describe('formatQuantity', () => {
  test.each([
    [0.62, 'pressure', 'si', '0.62 MPa'],
    [psiToMpa(90), 'pressure', 'us', '90 psi'],
    [fToC(450), 'temperature', 'si', '232 °C'],
    [fToC(450), 'temperature', 'us', '450 °F'],
    [232.2, 'temperature', 'us', '450 °F'],
    [15.2977, 'length-mm', 'si', '15.3 mm'],
    [inToMm(0.602), 'length-mm', 'us', '0.602 in'],
    [ftToM(1000), 'length-m', 'us', '1000 ft'],
    [304.8, 'length-m', 'si', '304.8 m'],
    [7351.97, 'area', 'si', '7352 mm²'],
    [in2ToMm2(11.4), 'area', 'us', '11.40 in²'],
    [397, 'duration', 'si', '6 min 37 s'],
    [397.4, 'duration', 'us', '6 min 37 s'],
    [-0.0001, 'pressure', 'si', '0.000 MPa'],
    [1.2138, 'pressure', 'si', '1.21 MPa'],
    [0.025, 'pressure', 'si', '0.025 MPa'],
  ] as const)('%s %s in %s → %s', (value, kind, system, text) => {
    // source: conversions per mathjs (above); display precision is our own choice
    expect(formatQuantity(value, kind, system)).toBe(text);
  });
  test('decimals override', () => {
    expect(formatQuantity(0.4137, 'pressure', 'si', { decimals: 3 })).toBe('0.414 MPa');
  });
});

describe('formatDuration', () => {
  test.each([
    [0, '0 s'],
    [8, '8 s'],
    [59.6, '1 min'],
    [60, '1 min'],
    [250, '4 min 10 s'],
    [397, '6 min 37 s'],
    [3600, '1 h'],
    [4800, '1 h 20 min'],
    [-5, '−5 s'],
  ])('%s s → %s', (seconds, text) => {
    // common practice (no published source): minutes and seconds as a stopwatch reads
    expect(formatDuration(seconds)).toBe(text);
  });
  test('refuses a non-finite duration', () => {
    expect(() => formatDuration(Number.NaN)).toThrow(/finite/);
  });
});

describe('unitLabel and formatRange', () => {
  test.each([
    ['length-mm', 'si', 'mm'],
    ['length-mm', 'us', 'in'],
    ['length-m', 'us', 'ft'],
    ['pressure', 'us', 'psi'],
    ['temperature', 'us', '°F'],
    ['area', 'us', 'in²'],
    ['duration', 'us', 's'],
  ] as const)('%s in %s is %s', (kind, system, label) => {
    expect(unitLabel(kind, system)).toBe(label);
  });
  test.each([
    [fToC(400), fToC(450), 'temperature', 'us', '400–450 °F'],
    [fToC(400), fToC(450), 'temperature', 'si', '204–232 °C'],
    [psiToMpa(60), psiToMpa(90), 'pressure', 'us', '60–90 psi'],
    [null, 10, 'duration', 'si', 'at most 10 s'],
    [100, 120, 'duration', 'si', '1 min 40 s – 2 min'],
    [10, 10, 'duration', 'us', '10 s'],
    [5, null, 'length-mm', 'si', 'at least 5.0 mm'],
    [0.025, 0.025, 'pressure', 'si', '0.025 MPa'],
    [0.025, 0.025, 'pressure', 'us', '3.6 psi'],
  ] as const)('%s–%s %s %s → %s', (min, max, kind, system, text) => {
    // source: ASTM F2620 heater window 400–450 °F (PPI "Melt Procedure" page, CONFIRMED); 60–90 psi from memory, unconfirmed
    expect(formatRange(min, max, kind, system)).toBe(text);
  });
});
