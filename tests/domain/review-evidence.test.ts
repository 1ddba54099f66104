// The review's evidence panel: which missing values are findings (the joint check's rule,
// one definition) and which read "not recorded (optional)"; typed values against the
// attached trace within what the instruments can tell apart.
import { describe, expect, test } from 'vitest';
import { checkJoint, isRequiredValue } from '@/domain/fusion/check';
import { withInstrument } from '@/domain/fusion/instrument';
import { planButtFusion } from '@/domain/fusion/plan';
import { allChecksPassed, RECORDED_VALUE_DEFINITIONS, type RecordedValues } from '@/domain/joints/values';
import { checkTraceReading } from '@/domain/pressure-trace/check';
import { pressureAgreementMpa, temperatureAgreementC, traceAgreement, traceDisagreements } from '@/domain/pressure-trace/agreement';
import type { PressureTraceReading } from '@/domain/pressure-trace/read';
import { planVersusRecorded } from '@/domain/review/queue';
import { fToC, inToMm, psiToMpa } from '@/domain/units';

// 2" IPS SDR 11 under ASTM F2620 on a machine of 1006.5 mm², drag 0.07 MPa; the machine's
// gauge reads in 0.05 MPa steps and its thermometer in 1 °C steps.
const plan = withInstrument(planButtFusion({ standard: 'astm-f2620', outsideDiameterMm: inToMm(2.375), sdr: 11, pistonAreaMm2: 1006.5, dragPressureMpa: 0.07 }), { gaugeResolutionMpa: 0.05, thermometerResolutionC: 1 });
const mid = (w: { min: number; max: number }) => (w.min + w.max) / 2;
const good: RecordedValues = {
  heaterTemperatureC: 218,
  heaterSurfaceTemperatureC: null,
  dragPressureMpa: 0.07,
  beadUpGaugePressureMpa: null,
  fusionGaugePressureMpa: mid(plan.fusionGaugePressureMpa),
  beadMm: 3,
  heatSoakS: plan.heatSoakTargetS ?? (plan.heatSoakS?.min ?? 60) + 5,
  heatSoakGaugePressureMpa: null,
  changeoverS: 5,
  coolingS: (plan.minCoolingS ?? 600) + 60,
  misalignmentMm: null,
  ...allChecksPassed(),
};

describe('missing values: optional ones are neutral, required ones are findings', () => {
  test('bead-up pressure left empty (bead-up at fusion pressure, PPI "Melt Procedure" page) reads "not recorded (optional)" and is not flagged', () => {
    const rows = planVersusRecorded(plan, good, checkJoint(plan, good).findings, 'us', { ambientC: 12, shelter: 'windbreak' });
    const beadUp = rows.find((r) => r.key === 'beadUpPressure')!;
    expect(beadUp.status).toBe('optional');
    expect(beadUp.recordedText).toMatch(/^not recorded \(optional\)/);
    expect(beadUp.recordedText).toContain('at fusion pressure');
    for (const key of ['heaterSurfaceTemperature', 'heatSoakPressure', 'misalignment']) expect(rows.find((r) => r.key === key)).toMatchObject({ status: 'optional', recordedText: 'not recorded (optional)' });
    // The joint is within limits: nothing in the table is red.
    expect(rows.filter((r) => r.status === 'finding' || r.status === 'not-recorded')).toEqual([]);
  });

  test('a required value left empty (cooling time: every procedure asks for cooling under pressure, ASTM F2620 / PPI "Hold") is a finding', () => {
    const values = { ...good, coolingS: null };
    const findings = checkJoint(plan, values).findings;
    const cooling = planVersusRecorded(plan, values, findings, 'si').find((r) => r.key === 'cooling')!;
    expect(cooling).toMatchObject({ status: 'not-recorded', recordedText: 'not recorded' });
    expect(findings.map((f) => `${f.parameter}:${f.kind}`)).toContain('cooling:not-recorded');
  });

  test.each(RECORDED_VALUE_DEFINITIONS.map((d) => [d.label, d] as const))('"%s" missing: the panel and the joint check agree on whether it is a finding', (_label, d) => {
    const values = { ...good, [d.key]: null } as RecordedValues;
    const findings = checkJoint(plan, values).findings;
    const row = planVersusRecorded(plan, values, findings, 'si').find((r) => r.key === d.name)!;
    const checkSaysMissing = d.parameter !== null && findings.some((f) => f.parameter === d.parameter && f.kind === 'not-recorded');
    expect(isRequiredValue(plan, d)).toBe(checkSaysMissing);
    expect(row.status).toBe(checkSaysMissing ? 'not-recorded' : 'optional');
  });

  test('heat soak, ambient temperature and shelter are shown, in the viewer\'s units', () => {
    const rows = planVersusRecorded(plan, good, [], 'us', { ambientC: 12, shelter: 'windbreak' });
    expect(rows.find((r) => r.key === 'heatSoak')).toBeTruthy();
    // 12 °C = 53.6 °F (NIST SP 811: °F = 1.8 °C + 32), shown to the whole degree.
    expect(rows.find((r) => r.key === 'ambient')).toMatchObject({ recordedText: '54 °F' });
    expect(rows.find((r) => r.key === 'shelter')).toMatchObject({ recordedText: 'Windbreak' });
    const none = planVersusRecorded(plan, good, [], 'si', { ambientC: null, shelter: null });
    expect(none.find((r) => r.key === 'ambient')?.status).toMatch(/optional|not-recorded/);
  });
});

/** A trace reading whose values are the given ones (the rest as a plain fusion cycle). */
function reading(over: Partial<PressureTraceReading> = {}): PressureTraceReading {
  const phase = (startS: number, durationS: number) => ({ startS, endS: startS + durationS, durationS });
  return {
    phases: { beadUp: phase(5, 20), heatSoak: phase(25, good.heatSoakS!), changeover: phase(25 + good.heatSoakS!, 5), fusion: phase(30 + good.heatSoakS!, 3 + good.coolingS!) },
    heatSoakS: good.heatSoakS!,
    changeoverS: good.changeoverS!,
    pressureBuildUpS: 3,
    coolingS: good.coolingS!,
    coolingHoldMinimumGaugePressureMpa: plan.fusionGaugePressureMpa.min,
    lowestCoolingGaugePressureMpa: good.fusionGaugePressureMpa,
    heatSoakGaugePressureMpa: 0.07,
    beadUpCount: 1,
    fusionGaugePressureMpa: good.fusionGaugePressureMpa!,
    beadUpGaugePressureMpa: good.fusionGaugePressureMpa!,
    dragPressureMpa: 0.07,
    heaterTemperatureC: 218,
    released: true,
    ...over,
  };
}

describe('typed values against the trace', () => {
  test('typed 457 °F against 426 °F in the trace is a finding worded in the viewer\'s units, and turns the trace check out of limits', () => {
    const typed = { ...good, heaterTemperatureC: fToC(457) };
    const trace = reading({ heaterTemperatureC: fToC(426) });
    const findings = traceDisagreements(plan, trace, typed, 'us');
    expect(findings).toHaveLength(1);
    expect(findings[0]).toMatchObject({ parameter: 'heaterTemperature', kind: 'disagrees-with-trace' });
    expect(findings[0]!.message).toContain('typed 457 °F; trace 426 °F');
    const check = checkTraceReading(plan, trace, typed, 'us');
    expect(check.outcome).toBe('out-of-limits');
    expect(check.findings.map((f) => f.message).join(' ')).toContain('typed 457 °F; trace 426 °F');
  });

  test('the same values typed as the trace gives are no finding', () => {
    expect(traceDisagreements(plan, reading(), good)).toEqual([]);
    expect(checkTraceReading(plan, reading(), good).outcome).toBe('within-limits');
  });

  // source: ASTM E230 type K thermocouple, standard limits of error: the greater of 2.2 °C
  // and 0.75 % of the reading in °C (from memory); plus half of the thermometer's 1 °C step
  // for the typed reading (half-a-division reading rule, domain/fusion/instrument).
  test.each([
    { traceC: 220, allowance: 2.2 + 0.5 },
    { traceC: 400, allowance: 0.0075 * 400 + 0.5 },
  ])('heater temperature allowance at $traceC °C', ({ traceC, allowance }) => {
    expect(temperatureAgreementC(plan, traceC)).toBeCloseTo(allowance, 9);
    const rows = (typedC: number) => traceAgreement(plan, reading({ heaterTemperatureC: traceC }), { ...good, heaterTemperatureC: typedC });
    expect(rows(traceC + allowance - 0.01).find((r) => r.key === 'heaterTemperature')!.disagrees).toBe(false);
    expect(rows(traceC + allowance + 0.01).find((r) => r.key === 'heaterTemperature')!.disagrees).toBe(true);
    expect(rows(traceC - allowance - 0.01).find((r) => r.key === 'heaterTemperature')!.disagrees).toBe(true);
  });

  // source: ASME B40.100 accuracy grade A: ±2 % of span in the first and last quarters of
  // the scale, ±1 % in the middle half (from memory), on a 0–3000 psi gauge (common
  // practice); plus half of the gauge's 0.05 MPa step. 1 psi = 6.894757 kPa (NIST SP 811).
  test.each([
    { gaugePsi: 300, percent: 2 },
    { gaugePsi: 1500, percent: 1 },
    { gaugePsi: 2900, percent: 2 },
  ])('gauge pressure allowance at $gaugePsi psi on the dial is $percent % of the 3000 psi span', ({ gaugePsi, percent }) => {
    const allowanceMpa = (percent / 100) * 3000 * 0.006894757 + 0.05 / 2;
    expect(pressureAgreementMpa(plan, psiToMpa(gaugePsi))).toBeCloseTo(allowanceMpa, 6);
  });

  test('a fusion gauge pressure typed 60 psi + half a step above the trace is within; 5 psi more is a finding', () => {
    const typedMpa = psiToMpa(300);
    const allowanceMpa = 0.02 * 3000 * 0.006894757 + 0.025; // ASME B40.100 grade A, first quarter (see above)
    const at = (traceMpa: number) => traceDisagreements(plan, reading({ fusionGaugePressureMpa: traceMpa }), { ...good, fusionGaugePressureMpa: typedMpa }, 'us');
    expect(at(typedMpa - allowanceMpa + 0.001)).toEqual([]);
    const over = at(typedMpa - allowanceMpa - psiToMpa(5));
    expect(over).toHaveLength(1);
    expect(over[0]!.message).toMatch(/^Fusion gauge pressure: typed 300 psi; trace 2\d\d psi/);
  });

  // common practice: a hand timer and the trace's phase edges agree within 5 s.
  test('times: a changeover typed 5 s against 12 s in the trace is a finding; 9 s is not', () => {
    const at = (traceS: number) => traceDisagreements(plan, reading({ changeoverS: traceS }), good, 'si').map((f) => f.message);
    expect(at(good.changeoverS! + 4)).toEqual([]);
    expect(at(good.changeoverS! + 7)).toEqual([expect.stringContaining('Changeover: typed 5 s; trace 12 s')]);
  });

  test('a trace that ends before the release gives only a lower bound for cooling', () => {
    const shorter = reading({ released: false, coolingS: good.coolingS! - 100 });
    expect(traceDisagreements(plan, shorter, good)).toEqual([]);
    const longer = reading({ released: false, coolingS: good.coolingS! + 100 });
    expect(traceDisagreements(plan, longer, good).map((f) => f.parameter)).toEqual(['cooling']);
  });

  test('values not typed (bead-up left empty) are not compared', () => {
    const rows = traceAgreement(plan, reading({ beadUpGaugePressureMpa: 3 }), good);
    expect(rows.find((r) => r.key === 'beadUpPressure')).toMatchObject({ typed: null, disagrees: false, allowance: null });
  });
});
