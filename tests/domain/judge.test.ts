import { describe, expect, test } from 'vitest';
import { checkJoint, judgeValue, planButtFusion, type JointMeasurements } from '@/domain';
import { withInstrument } from '@/domain/fusion/instrument';
import { fromDisplay, fToC, inToMm } from '@/domain/units';

// 6" IPS SDR 11 with the ASTM table wall (0.602 in) on a machine of 3000 mm², drag 0.2 MPa.
const plan = planButtFusion({
  standard: 'astm-f2620',
  outsideDiameterMm: inToMm(6.625),
  sdr: 11,
  wallMm: inToMm(0.602),
  pistonAreaMm2: 3000,
  dragPressureMpa: 0.2,
});
// The same plan read with a thermometer in whole °C and a gauge in 0.05 MPa steps.
const withSteps = withInstrument(plan, { thermometerResolutionC: 1, gaugeResolutionMpa: 0.05 });

describe('heater temperature typed at the trench (US units)', () => {
  test.each([
    // source: ASTM F2620 heater surface 400–450 °F, PPI "Melt Procedure" page
    [480, 'above', 'Above the window (400–450 °F)'],
    [451, 'above', 'Above the window (400–450 °F)'],
    [450, 'inside', 'Inside 400–450 °F'],
    [425, 'inside', 'Inside 400–450 °F'],
    [400, 'inside', 'Inside 400–450 °F'],
    [399, 'below', 'Below the window (400–450 °F)'],
    [350, 'below', 'Below the window (400–450 °F)'],
  ] as const)('%s °F', (typedF, verdict, text) => {
    const judged = judgeValue(plan, 'heaterTemperatureC', fromDisplay(typedF, 'temperature', 'us'), { system: 'us' });
    expect(judged).toMatchObject({ verdict, text, byReadingStep: false });
  });

  test('the pyrometer reading is held to the same window', () => {
    // source: ASTM F2620 heater surface 400–450 °F, PPI "Melt Procedure" page
    expect(judgeValue(plan, 'heaterSurfaceTemperatureC', fToC(455), { system: 'us' })?.text).toBe('Above the window (400–450 °F)');
  });
});

describe('the instrument reading step, as in the joint check', () => {
  // source: ASTM F2620 450 °F = 232.2 °C (°C = (°F − 32) × 5/9); half of a 1 °C step is 0.5 °C
  test('232.7 °C on a whole-degree thermometer passes by the reading step', () => {
    expect(judgeValue(withSteps, 'heaterTemperatureC', 232.7)).toEqual({
      verdict: 'inside',
      limit: { min: fToC(400), max: fToC(450) },
      byReadingStep: true,
      text: 'Inside 204–232 °C (within the thermometer’s reading step)',
    });
  });
  test('232.8 °C is past half a step', () => {
    expect(judgeValue(withSteps, 'heaterTemperatureC', 232.8)?.verdict).toBe('above');
  });
  test('a plan without an instrument gives no slack', () => {
    expect(judgeValue(plan, 'heaterTemperatureC', 232.3)?.verdict).toBe('above');
  });
});

describe('bead and times', () => {
  test.each([
    // source: PPI suggested melt-bead size, 3–8 in pipe 1/8–3/16 in, lower end 1/8 in (PPI generic butt-fusion procedure)
    ['beadMm', inToMm(0.124), 'us', 'below', 'Below the minimum (0.125 in)'],
    ['beadMm', inToMm(0.125), 'us', 'inside', 'Meets the 0.125 in minimum'],
    // from memory, unconfirmed: F2620 heater-removal time 15 s for walls 0.55–1.18 in
    ['changeoverS', 16, 'si', 'above', 'Longer than the maximum (15 s)'],
    ['changeoverS', 15, 'si', 'inside', 'Within the 15 s maximum'],
    // from memory, unconfirmed: F2620 cooling 11 min per inch of wall × 0.602 in = 397 s
    ['coolingS', 396, 'si', 'below', 'Shorter than the minimum (6 min 37 s)'],
    ['coolingS', 397, 'si', 'inside', 'Meets the 6 min 37 s minimum'],
  ] as const)('%s %s', (key, value, system, verdict, text) => {
    expect(judgeValue(plan, key, value, { system })).toMatchObject({ verdict, text });
  });

  test('drag pressure is only recorded: no judgement', () => {
    expect(judgeValue(plan, 'dragPressureMpa', 0.2)).toBeNull();
  });
  test('text that is not a number gets no judgement', () => {
    expect(judgeValue(plan, 'heaterTemperatureC', Number.NaN)).toBeNull();
  });
});

describe('the judgement never disagrees with the joint check', () => {
  // A joint inside every window (values as in tests/domain/check.test.ts), then one value swept across its limits.
  const good: JointMeasurements = {
    heaterTemperatureC: 218,
    fusionGaugePressureMpa: (plan.fusionGaugePressureMpa.min + plan.fusionGaugePressureMpa.max) / 2,
    beadMm: 6,
    changeoverS: 10,
    coolingS: 420,
  };
  const sweeps = {
    heaterTemperatureC: [200, 203.9, 204.4, 204.45, 218, 232.2, 232.7, 232.75, 240],
    fusionGaugePressureMpa: [plan.fusionGaugePressureMpa.min - 0.1, plan.fusionGaugePressureMpa.min - 0.02, plan.fusionGaugePressureMpa.max + 0.024, plan.fusionGaugePressureMpa.max + 0.03],
    beadMm: [3, 3.17, 3.18, 4],
    changeoverS: [0, 15, 16],
    coolingS: [100, 396, 397, 2000],
  } as const;
  for (const p of [plan, withSteps]) {
    for (const [key, values] of Object.entries(sweeps) as [keyof typeof sweeps, readonly number[]][]) {
      test.each(values)(`${key} %s (${p === plan ? 'no instrument' : 'with instrument'})`, (value) => {
        const misses = checkJoint(p, { ...good, [key]: value }).findings;
        expect(judgeValue(p, key, value)?.verdict === 'inside').toBe(misses.length === 0);
      });
    }
  }
});
