import { describe, expect, test } from 'vitest';
import {
  canMoveCoil,
  COIL_STATUSES,
  coilLengthAfterPull,
  coilMoveProblem,
  coilSavings,
  DomainError,
  nextCoil,
  planCoilRun,
  type CoilForPlanning,
  type CoilStatus,
} from '@/domain';
import { ftToM } from '@/domain/units';

describe('planCoilRun', () => {
  test.each([
    // common practice (no published source): 1,000 ft run from 40 ft sticks needs 26 joints, from one coil 2
    ['1,000 ft from 40 ft sticks', 1000, 40, 2, 20, 25, 26, 520],
    ['1,000 ft from one 1,000 ft coil', 1000, 1000, 2, 20, 1, 2, 40],
    ['1,000 ft from 500 ft coils', 1000, 500, 2, 20, 2, 3, 60],
    ['300 ft from one 500 ft coil', 300, 500, 2, 20, 1, 2, 40],
    ['1,001 ft from 40 ft sticks', 1001, 40, 2, 20, 26, 27, 540],
    ['no end joints', 1000, 40, 0, 15, 25, 24, 360],
  ])('%s', (_name, runFt, pieceFt, endJoints, minutesPerJoint, pieces, joints, minutes) => {
    expect(planCoilRun({ runLengthM: ftToM(runFt), pieceLengthM: ftToM(pieceFt), endJoints, minutesPerJoint })).toEqual({ pieces, joints, fusionMinutes: minutes });
  });
  test('coils save about 8 hours of fusion per 1,000 ft at 20 minutes a joint', () => {
    // common practice (no published source): (26 − 2) joints × 20 min = 480 min = 8 h
    const savings = coilSavings({ runLengthM: ftToM(1000), stickLengthM: ftToM(40), coilLengthM: ftToM(1000), endJoints: 2, minutesPerJoint: 20 });
    expect(savings.jointsSaved).toBe(24);
    expect(savings.minutesSaved / 60).toBe(8);
  });
  test.each([
    [{ runLengthM: 0, pieceLengthM: 12, endJoints: 2, minutesPerJoint: 20 }, /Run length must be more than 0 m/],
    [{ runLengthM: 100, pieceLengthM: 0, endJoints: 2, minutesPerJoint: 20 }, /Piece length must be more than 0 m/],
    [{ runLengthM: 100, pieceLengthM: 12, endJoints: -1, minutesPerJoint: 20 }, /End joints must be a number of 0 or more/],
    [{ runLengthM: 100, pieceLengthM: 12, endJoints: 1.5, minutesPerJoint: 20 }, /End joints must be a whole number/],
    [{ runLengthM: 100, pieceLengthM: 12, endJoints: 2, minutesPerJoint: -3 }, /Minutes per joint must be a number of 0 or more/],
  ])('refuses %o', (input, message) => {
    expect(() => planCoilRun(input)).toThrow(message);
  });
});

describe('coilLengthAfterPull', () => {
  test.each([
    [150, 40, 110],
    [150, 150, 0],
    [152.4, 0.4, 152],
  ])('%s m − %s m = %s m', (remainingM, pullM, left) => {
    // common practice (no published source): length left = length before − length pulled
    expect(coilLengthAfterPull({ remainingM, pullM })).toBeCloseTo(left, 9);
  });
  test.each([
    [{ remainingM: 100, pullM: 120 }, 'si', 'Cannot pull 120.0 m: only 100.0 m is left on the coil'],
    [{ remainingM: ftToM(328), pullM: ftToM(500) }, 'us', 'Cannot pull 500 ft: only 328 ft is left on the coil'],
    [{ remainingM: 100, pullM: 0 }, 'si', 'The length pulled must be more than 0 (got 0.0 m)'],
    [{ remainingM: 100, pullM: -5 }, 'si', 'The length pulled must be more than 0 (got -5.0 m)'],
    [{ remainingM: 100, pullM: Number.NaN }, 'si', 'The length pulled must be a number'],
    [{ remainingM: -1, pullM: 5 }, 'si', 'Length left on the coil must be a number of 0 or more (got -1)'],
  ] as const)('refuses %o', (input, system, message) => {
    expect(() => coilLengthAfterPull(input, system)).toThrow(DomainError);
    expect(() => coilLengthAfterPull(input, system)).toThrow(message);
  });
});

describe('nextCoil', () => {
  const coils: CoilForPlanning[] = [
    { id: 'C-4', status: 'on-trailer', remainingM: 150, receivedOn: '2025-03-01' },
    { id: 'C-2', status: 'on-trailer', remainingM: 150, receivedOn: '2025-01-15' },
    { id: 'C-7', status: 'in-use', remainingM: 40, receivedOn: '2024-12-01' },
    { id: 'C-9', status: 'quarantined', remainingM: 150, receivedOn: '2024-01-01' },
    { id: 'C-1', status: 'in-yard', remainingM: 150, receivedOn: '2024-01-01' },
    { id: 'C-3', status: 'on-trailer', remainingM: 150, receivedOn: '2025-01-15' },
  ];
  test.each([
    // common practice (no published source): finish the open coil first, then first in, first out
    ['a short run uses the open coil', 30, 'C-7'],
    ['exactly what is left on the open coil', 40, 'C-7'],
    ['a longer run takes the oldest trailer coil', 100, 'C-2'],
    ['nothing long enough', 200, null],
  ])('%s', (_name, runLengthM, id) => {
    expect(nextCoil(coils, runLengthM)?.id ?? null).toBe(id);
  });
});

describe('coil status moves', () => {
  test.each([
    // common practice (no published source): our coil life cycle
    ['in-yard', 'on-trailer', undefined, null],
    ['on-trailer', 'in-use', undefined, null],
    ['in-use', 'used-up', undefined, null],
    ['in-use', 'on-trailer', undefined, null],
    ['in-yard', 'quarantined', 'kinked end', null],
    ['used-up', 'quarantined', 'manufacturer recall', null],
    ['quarantined', 'in-yard', 'inspected, released', null],
    ['in-yard', 'quarantined', undefined, 'Say why the coil is quarantined'],
    ['in-yard', 'quarantined', '  ', 'Say why the coil is quarantined'],
    ['quarantined', 'in-yard', undefined, 'Say why the coil leaves quarantine'],
    ['used-up', 'in-use', undefined, 'A coil that is used up cannot be moved to in use'],
    ['used-up', 'in-yard', undefined, 'A coil that is used up cannot be moved to in the yard'],
    ['in-yard', 'in-use', undefined, 'A coil that is in the yard cannot be moved to in use'],
    ['on-trailer', 'on-trailer', undefined, 'The coil is already on the trailer'],
  ] as const)('%s → %s (%s)', (from, to, reason, problem) => {
    expect(coilMoveProblem(from, to, reason)).toBe(problem);
    expect(canMoveCoil(from, to, reason)).toBe(problem === null);
  });
  test('quarantine is reachable from every other state with a reason', () => {
    for (const from of COIL_STATUSES.filter((status): status is Exclude<CoilStatus, 'quarantined'> => status !== 'quarantined')) {
      expect(canMoveCoil(from, 'quarantined', 'damage found')).toBe(true);
    }
  });
  test('used-up leads nowhere but quarantine', () => {
    expect(COIL_STATUSES.filter((to) => canMoveCoil('used-up', to, 'reason'))).toEqual(['quarantined']);
  });
});
