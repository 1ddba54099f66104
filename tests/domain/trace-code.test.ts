import { describe, expect, test } from 'vitest';
import {
  BASE62_ALPHABET,
  buildTraceCode,
  COMPONENT_TYPE_CODES,
  COMPONENT_TYPES,
  decodeBase62,
  encodeBase62,
  MATERIAL_CODES,
  parseTraceCode,
  sizeCode,
  sizeFactorFor,
  sizeFactorsFromCode,
  TABLE_6_SIZE_FACTORS,
} from '@/domain';

describe('base-62 (ASTM F2897-23a Table 2)', () => {
  test.each([
    // source: ASTM F2897-23a Table 2: "r" = 27, "T" = 55, 0–9, a–z = 10–35, A–Z = 36–61
    ['r', 27],
    ['T', 55],
    ['9', 9],
    ['a', 10],
    ['z', 35],
    ['A', 36],
    ['Z', 61],
  ])('"%s" = %s', (char, value) => {
    expect(decodeBase62(char)).toBe(value);
    expect(BASE62_ALPHABET.indexOf(char)).toBe(value);
  });
  test('lot 1234567 → "5ban"', () => {
    // source: F2897 lot illustration in a public slide excerpt on the F2897 scheme (CONFIRMED-2nd)
    expect(encodeBase62(1234567, 4)).toBe('5ban');
    expect(decodeBase62('5ban')).toBe(1234567);
  });
  test('fixed widths pad with "0" and capacities hold', () => {
    // source: ASTM F2897-23a §4.9 / Table 1: 4 chars hold 9 999 999; 3 chars hold up to 238 327 (62³ − 1)
    expect(encodeBase62(0, 3)).toBe('000');
    expect(encodeBase62(9_999_999, 4)).toBe('FXsj');
    expect(encodeBase62(238_327, 3)).toBe('ZZZ');
    expect(() => encodeBase62(238_328, 3)).toThrow(/more than 3 base-62 characters/);
  });
});

describe('size code D = C1 × 378 + C2 + 1 (ASTM F2897-23a §5.7)', () => {
  test.each([
    // source: ASTM F2897-23a Note 12: 2" IPS SDR 9.33 pipe, C1 = C2 = 37 → D = 14 024
    [[37, 37], 14_024],
    // source: ASTM F2897-23a Note 13: 2" IPS SDR 9.33 × ½" CTS 0.090 saddle, C1 = 4, C2 = 37 → D = 1 550
    [[4, 37], 1_550],
  ] as const)('%o → %s', (factors, code) => {
    expect(sizeCode(factors)).toBe(code);
    expect(sizeFactorsFromCode(code)).toEqual(factors);
  });
  test('D = 0 means no factor', () => {
    // source: ASTM F2897-23a §5.7: "000" when a factor cannot be found
    expect(sizeFactorsFromCode(0)).toBeNull();
  });
  test.each([
    // source: ASTM F2897-23a Table 6 and §5.7 (CONFIRMED)
    [{ series: 'cts', nominal: '1/2', wallIn: 0.09 }, 4],
    [{ series: 'ips', nominal: '3/4', sdr: 11 }, 20],
    [{ series: 'ips', nominal: '2', sdr: 9.33 }, 37],
    [{ series: 'ips', nominal: '2', sdr: 11 }, 38],
    [{ series: 'ips', nominal: '4', sdr: 17 }, 48],
    [{ series: 'ips', nominal: '6', sdr: 11 }, 49],
    [{ series: 'ips', nominal: '12', sdr: 11 }, 64],
    [{ series: 'ips', nominal: '24', sdr: 21 }, 92],
    [{ series: 'ips', nominal: '5', sdr: 11 }, null],
  ] as const)('factor of %o is %s', (pipe, factor) => {
    expect(sizeFactorFor(pipe)).toBe(factor);
  });
  test('Table 6 selection has 20 entries', () => {
    expect(TABLE_6_SIZE_FACTORS).toHaveLength(20);
  });
});

describe('tables', () => {
  test.each([
    // source: ASTM F2897-23a Table 4 (CONFIRMED)
    ['A', 'PE2406'],
    ['B', 'PE2708'],
    ['d', 'PE2708 PLUS'],
    ['H', 'PE4710'],
    ['e', 'PE4710 PLUS'],
    ['W', 'PE80'],
    ['Z', 'PE100'],
    ['K', 'PA11'],
    ['9', 'steel X70'],
  ])('material %s is %s', (code, designation) => {
    expect(MATERIAL_CODES[code]).toBe(designation);
  });
  test.each([
    // source: ASTM F2897-23a Table 5 (CONFIRMED)
    ['11', 'pipe, straight'],
    ['12', 'pipe, coiled'],
    ['23', 'coupling, electrofusion'],
    ['5A', 'elbow, butt fusion 45°'],
    ['EF', 'excess-flow valve'],
  ])('component type %s is %s', (code, description) => {
    expect(COMPONENT_TYPE_CODES[code]).toBe(description);
  });
  test.each([
    // source: ASTM F2897-23a Table 5, read in the text of the standard (CONFIRMED)
    ['10', 'pipe, other', 'confirmed'],
    ['13', 'pipe, casing', 'confirmed'],
    ['41', 'end cap, butt fusion', 'confirmed'],
    ['51', 'elbow, butt fusion 90°', 'confirmed'],
    ['61', 'tee, butt fusion', 'confirmed'],
    ['71', 'reducer, butt fusion', 'confirmed'],
    ['V1', 'valve, ball', 'confirmed'],
    ['EF', 'excess-flow valve', 'confirmed'],
    // source: ASTM F2897-23a Table 5: codes 1A–1M, T0–T3, TX, R0–R6 read in the text (CONFIRMED); their individual
    // meanings, and every other code, read only in a public reproduction of the table (CONFIRMED-2nd).
    // TX is the butt-fusion socket-weld transition, not "other".
    ['1A', 'pipe, steel line pipe, seamless, API 5L PSL1, single coat', 'confirmed-2nd'],
    ['1M', 'pipe, steel line pipe, high-frequency welded, API 5L PSL2, dual coat', 'confirmed-2nd'],
    ['T0', 'transition fitting, other', 'confirmed-2nd'],
    ['T3', 'transition fitting, flanged end', 'confirmed-2nd'],
    ['TX', 'transition fitting, socket weld by butt fusion', 'confirmed-2nd'],
    ['R1', 'riser, factory assembled, anodeless', 'confirmed-2nd'],
    ['R6', 'riser, field assembled, not anodeless', 'confirmed-2nd'],
    ['22', 'coupling, socket fusion with excess-flow valve', 'confirmed-2nd'],
    ['2D', 'coupling, flanged', 'confirmed-2nd'],
    ['43', 'end cap, electrofusion', 'confirmed-2nd'],
    ['5J', 'elbow, fabricated 45°', 'confirmed-2nd'],
    ['63', 'tee, electrofusion', 'confirmed-2nd'],
    ['73', 'reducer, electrofusion', 'confirmed-2nd'],
    ['89', 'tapping tee, electrofusion with butt-fusion outlet', 'confirmed-2nd'],
    ['8S', 'tapping tee, mechanical with mechanical interference fit outlet and excess-flow valve', 'confirmed-2nd'],
    ['91', 'high-volume tapping tee, electrofusion with butt-fusion outlet', 'confirmed-2nd'],
    ['B1', 'branch saddle, electrofusion', 'confirmed-2nd'],
    ['V7', 'valve, plug', 'confirmed-2nd'],
    ['UX', 'union, insulated', 'confirmed-2nd'],
  ])('Table 5 code %s is "%s" (%s)', (code, label, status) => {
    expect(COMPONENT_TYPES[code]).toMatchObject({ code, label, status });
  });
  test.each(['1I', '1N', '5I', '8I', '8O', '98', '99', 'T4', 'R7', 'EE', 'V8', 'ZZ'])('%s is not an ASTM F2897-23a Table 5 code', (code) => {
    // source: ASTM F2897-23a Table 5 lists 1A–1H and 1J–1M (no 1I), 5A–5H and 5J, 8A–8H and 8J–8S (no I or O)
    expect(COMPONENT_TYPES[code]).toBeUndefined();
    expect(() => buildTraceCode({ manufacturer: 'AB', lot: '1', productionDate: '2012-09-01', material: 'H', componentType: code, sizeFactors: null })).toThrow(/is not a known ASTM F2897 Table 5 code/);
  });
  test('the table has every group and 211 codes', () => {
    // source: ASTM F2897-23a Table 5 (groups as in the table; count of codes in the public reproduction)
    const groups = new Set(Object.values(COMPONENT_TYPES).map((type) => type.group));
    expect([...groups]).toEqual([
      'pipe', 'coupling', 'adapter coupling', 'end cap', 'elbow', 'tee', 'reducer', 'tapping tee', 'high-volume tapping tee',
      'branch saddle', 'mechanical saddle', 'service tee', 'service saddle', 'flange', 'transition fitting', 'riser', 'valve',
      'meter set', 'regulator', 'filter', 'anode', 'pressure control fitting', 'union', 'repair clamp', 'excess-flow valve',
    ]);
    expect(Object.keys(COMPONENT_TYPES)).toHaveLength(211);
  });
});

describe('parseTraceCode', () => {
  test('a coiled PE4710 2" SDR 9.33 pipe made 1 Sept 2012', () => {
    // source: F2897 lot illustration in a public slide excerpt (lot "5ban", 1 Sept 2012 = day 245 of 2012, CONFIRMED-2nd) and Note 12 (D = 14 024 → "3Ec")
    expect(parseTraceCode('AB5ban6nmH123Ec0')).toEqual({
      ok: true,
      value: {
        manufacturer: 'AB',
        lot: '1234567',
        productionDate: '2012-09-01',
        material: 'PE4710',
        materialCode: 'H',
        componentType: '12',
        sizeFactors: [37, 37],
        index: '0',
      },
    });
  });
  test('the standard\'s date example 23410 is the 234th day of 2010', () => {
    // source: ASTM F2897-23a Table 1: 23410 = 234th day of 2010; "65A" = base-62 of 23410
    const result = parseTraceCode('AB5ban65AH123Ec0');
    expect(result.ok && result.value.productionDate).toBe('2010-08-22');
  });
  test.each([
    // source: Gregorian calendar — 2012 and 2024 are leap years, 2013 and 2100-style centuries are not
    ['day 366 of 2012', 36612, true, '2012-12-31'],
    ['day 366 of 2024', 36624, true, '2024-12-31'],
    ['day 365 of 2013', 36513, true, '2013-12-31'],
    ['day 1 of 2000', 100, true, '2000-01-01'],
    ['day 60 of 2012', 6012, true, '2012-02-29'],
  ] as const)('%s', (_name, dddyy, ok, date) => {
    const result = parseTraceCode(`AB5ban${encodeBase62(dddyy, 3)}H123Ec0`);
    expect(result.ok).toBe(ok);
    if (result.ok) expect(result.value.productionDate).toBe(date);
  });
  test.each([
    ['', 'A traceability code has 16 characters; this one has 0'],
    ['AB5ban6nmH123Ec', 'A traceability code has 16 characters; this one has 15'],
    ['AB5ban6nmH123Ec00', 'A traceability code has 16 characters; this one has 17'],
    ['AB5b-n6nmH123Ec0', 'Character "-" at position 5 is not allowed; use only 0–9, a–z and A–Z'],
    ['AB5ban6nmH123Ec ', 'A traceability code has 16 characters; this one has 15'],
    ['AB5ban6nmH12 3Ec', 'Character " " at position 13 is not allowed; use only 0–9, a–z and A–Z'],
    // source: ASTM F2897-23a Table 4 has no "I"
    ['AB5ban6nmI123Ec0', 'Material code "I" at position 10 is not in ASTM F2897 Table 4'],
    ['AB5ban6nmHZZ3Ec0', 'Component type "ZZ" at positions 11–12 is not a known ASTM F2897 Table 5 code'],
    [`AB5ban${encodeBase62(36613, 3)}H123Ec0`, `Production date "${encodeBase62(36613, 3)}" (positions 7–9) gives day 366 of 2013, which is not a leap year`],
    [`AB5ban${encodeBase62(13, 3)}H123Ec0`, `Production date "${encodeBase62(13, 3)}" (positions 7–9) gives day 0 of 2013; the day of the year must be 1–366`],
    [`AB5ban${encodeBase62(36713, 3)}H123Ec0`, `Production date "${encodeBase62(36713, 3)}" (positions 7–9) gives day 367 of 2013; the day of the year must be 1–366`],
    // source: ASTM F2897-23a Table 1: the lot is a 7-digit integer; "ZZZZ" = 62⁴ − 1 = 14 776 335
    ['ABZZZZ6nmH123Ec0', 'Lot code "ZZZZ" (positions 3–6) is 14776335, more than the 7 digits a lot may have'],
    ['AB5ban6nmH123Ec2', 'Index "2" at position 16 must be 0 (default) or 1 (Annex A1 size coefficients)'],
  ])('"%s" → %s', (code, error) => {
    expect(parseTraceCode(code)).toEqual({ ok: false, error });
  });
  test('"zzzz" is a valid 7-digit lot', () => {
    // source: ASTM F2897-23a Table 2: z = 35, so "zzzz" = 35 × (62³ + 62² + 62 + 1) = 8 478 225
    const result = parseTraceCode('ABzzzz6nmH123Ec0');
    expect(result.ok && result.value.lot).toBe('8478225');
  });
  test('surrounding spaces are trimmed', () => {
    expect(parseTraceCode('  AB5ban6nmH123Ec0 ').ok).toBe(true);
  });
  test('a "000" size has no factors', () => {
    const result = parseTraceCode('AB5ban6nmH120000');
    expect(result.ok && result.value.sizeFactors).toBeNull();
  });
});

describe('buildTraceCode', () => {
  test.each([
    // source: F2897 lot illustration (public slide excerpt) + F2897-23a Note 12
    [{ manufacturer: 'AB', lot: '1234567', productionDate: '2012-09-01', material: 'PE4710', componentType: '12', sizeFactors: [37, 37] as const }, 'AB5ban6nmH123Ec0'],
    // source: F2897-23a Note 13 (D = 1 550 → "0p0"); material by Table 4 code
    [{ manufacturer: 'x9', lot: 42, productionDate: '2024-12-31', material: 'Z', componentType: '81', sizeFactors: [4, 37] as const, index: '1' }, `x9000G${encodeBase62(36624, 3)}Z810p01`],
    [{ manufacturer: 'Qq', lot: '0000001', productionDate: '2000-01-01', material: 'PE2708', componentType: '11', sizeFactors: null }, 'Qq000101CB110000'],
  ])('%o → %s', (value, code) => {
    expect(buildTraceCode(value)).toBe(code);
    const parsed = parseTraceCode(code);
    expect(parsed.ok).toBe(true);
    if (parsed.ok) {
      expect(parsed.value.productionDate).toBe(value.productionDate);
      expect(parsed.value.sizeFactors).toEqual(value.sizeFactors === null ? null : [...value.sizeFactors]);
      expect(buildTraceCode(parsed.value)).toBe(code);
    }
  });
  test.each([
    [{ manufacturer: 'A' }, /Manufacturer id must be 2 characters/],
    [{ lot: '12345678' }, /Lot must be 1 to 7 digits/],
    [{ lot: '12a' }, /Lot must be 1 to 7 digits/],
    [{ productionDate: '2013-02-29' }, /2013-02-29 is not a real date/],
    [{ productionDate: '1999-12-31' }, /Production year must be 2000–2099/],
    [{ productionDate: '1/9/2012' }, /must be YYYY-MM-DD/],
    [{ material: 'PE9999' }, /Material "PE9999" is not in ASTM F2897 Table 4/],
    [{ componentType: '99' }, /Component type "99" is not a known/],
    [{ sizeFactors: [378, 1] as const }, /Size factors must be whole numbers 0–377/],
    [{ index: '5' }, /Index must be "0" or "1"/],
  ])('refuses %o', (change, message) => {
    const value = { manufacturer: 'AB', lot: '1234567', productionDate: '2012-09-01', material: 'PE4710', componentType: '12', sizeFactors: [37, 37] as const, ...change };
    expect(() => buildTraceCode(value)).toThrow(message);
  });
});
