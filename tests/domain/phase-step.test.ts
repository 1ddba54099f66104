import { describe, expect, test } from 'vitest';
import { phaseAlertAtS, phaseStep, type PhaseTiming } from '@/domain/joints/timer';

const idle: PhaseTiming = { startedAt: null, endedAt: null };
const running = (at: number): PhaseTiming => ({ startedAt: at, endedAt: null });
const ended = (at: number, end: number): PhaseTiming => ({ startedAt: at, endedAt: end });

// The order of a butt-fusion cycle: heat soak, heater removal (changeover), cooling under
// pressure // source: ASTM F2620 procedure as on the PPI "Melt Procedure" page
describe('the one phase control walks the cycle in order', () => {
  test.each([
    ['nothing timed yet', { heatSoak: idle, changeover: idle, cooling: idle }, { running: null, next: 'heatSoak', isDone: false }],
    ['heat soak running', { heatSoak: running(0), changeover: idle, cooling: idle }, { running: 'heatSoak', next: 'changeover', isDone: false }],
    ['changeover running', { heatSoak: ended(0, 40_000), changeover: running(40_000), cooling: idle }, { running: 'changeover', next: 'cooling', isDone: false }],
    ['cooling running', { heatSoak: ended(0, 40_000), changeover: ended(40_000, 46_000), cooling: running(46_000) }, { running: 'cooling', next: null, isDone: false }],
    ['all three ended', { heatSoak: ended(0, 40_000), changeover: ended(40_000, 46_000), cooling: ended(46_000, 400_000) }, { running: null, next: null, isDone: true }],
    ['heat soak ended and nothing after it', { heatSoak: ended(0, 40_000), changeover: idle, cooling: idle }, { running: null, next: 'changeover', isDone: false }],
  ] as const)('%s', (_name, timings, expected) => {
    expect(phaseStep(timings)).toEqual(expected);
  });
});

describe('the moment each phase signals', () => {
  test('changeover at its maximum, cooling at its minimum, heat soak at its target', () => {
    // from memory, unconfirmed: F2620 heater-removal maximum 8 s for the thinnest walls
    expect(phaseAlertAtS('changeover', { targetS: null, minS: null, maxS: 8 })).toBe(8);
    expect(phaseAlertAtS('cooling', { targetS: null, minS: 143, maxS: null })).toBe(143);
    expect(phaseAlertAtS('heatSoak', { targetS: 45, minS: 30, maxS: 60 })).toBe(45);
    expect(phaseAlertAtS('heatSoak', { targetS: null, minS: null, maxS: null })).toBeNull();
  });
});
