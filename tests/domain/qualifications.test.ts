import { describe, expect, test } from 'vitest';
import { addMonths, daysBetween, isLeapYear, legacyQualificationStatus, qualificationStatus } from '@/domain';

describe('calendar months with month-end clamping', () => {
  test.each([
    // source: 49 CFR 192.285(c) "intervals not exceeding 15 months"; month-end clamping is common practice (no published source)
    ['2025-11-30', 15, '2027-02-28'],
    ['2022-11-30', 15, '2024-02-29'],
    ['2025-03-10', 15, '2026-06-10'],
    ['2024-01-31', 1, '2024-02-29'],
    ['2023-01-31', 1, '2023-02-28'],
    ['2024-02-29', 12, '2025-02-28'],
    ['2025-10-31', 15, '2027-01-31'],
    ['2025-03-31', -1, '2025-02-28'],
  ])('%s + %s months = %s', (date, months, result) => {
    expect(addMonths(date, months)).toBe(result);
  });
  test.each([
    // source: Gregorian calendar rules
    [2000, true],
    [1900, false],
    [2024, true],
    [2025, false],
  ])('leap year %s: %s', (year, leap) => {
    expect(isLeapYear(year)).toBe(leap);
  });
  test('days between', () => {
    expect(daysBetween('2026-12-01', '2026-12-31')).toBe(30);
    expect(daysBetween('2024-02-28', '2024-03-01')).toBe(2);
  });
});

describe('current rule, 49 CFR 192.285(c) since 2019-01-22', () => {
  test.each([
    // source: 49 CFR 192.285(c) current text (CONFIRMED): once each calendar year, at most 15 months apart
    // → qualified until the earlier of last + 15 months and 31 Dec of the next year
    ['15 months comes first', ['2025-03-10'], '2025-12-01', '2026-06-10', 'current', true],
    ['31 Dec of next year comes first', ['2025-11-30'], '2026-06-01', '2026-12-31', 'current', true],
    ['30 September: 15 months ends on 30 December', ['2025-09-30'], '2026-01-01', '2026-12-30', 'current', true],
    ['1 October: both limits fall on 31 December', ['2025-10-01'], '2026-01-01', '2026-12-31', 'current', true],
    ['January qualification', ['2025-01-15'], '2025-06-01', '2026-04-15', 'current', true],
    ['last day is still qualified', ['2025-03-10'], '2026-06-10', '2026-06-10', 'due-soon', true],
    ['the day after is lapsed', ['2025-03-10'], '2026-06-11', '2026-06-10', 'lapsed', false],
    ['30 days before is due soon', ['2025-11-30'], '2026-12-01', '2026-12-31', 'due-soon', true],
    ['31 days before is current', ['2025-11-30'], '2026-11-30', '2026-12-31', 'current', true],
    ['the latest qualification counts', ['2023-05-01', '2025-04-20', '2024-04-15'], '2026-01-05', '2026-07-20', 'current', true],
    ['a qualification after the date does not count', ['2025-04-20'], '2025-04-19', null, 'never-qualified', false],
    ['never qualified', [], '2025-04-19', null, 'never-qualified', false],
  ] as const)('%s', (_name, qualifiedOn, on, until, state, qualified) => {
    const status = qualificationStatus({ qualifiedOn: [...qualifiedOn], on });
    expect(status).toMatchObject({ until, state, qualified, rule: 'current' });
    expect(status.reason.length).toBeGreaterThan(10);
  });

  test('a failed production-joint test after the last qualification needs requalification', () => {
    // source: 49 CFR 192.285(c) current text: requalify "after any production joint is found unacceptable by testing under §192.513"
    const status = qualificationStatus({ qualifiedOn: ['2025-03-10'], failedTestsOn: ['2025-08-01'], on: '2025-09-01' });
    expect(status).toMatchObject({ qualified: false, until: null, state: 'requalification-needed', lastQualifiedOn: '2025-03-10' });
    expect(status.reason).toBe('A production joint failed a §192.513 test on 2025-08-01, after the qualification on 2025-03-10; requalify before making more joints (49 CFR 192.285(c))');
  });
  test.each([
    ['a failure before the last qualification is cleared by it', ['2025-03-10', '2025-08-15'], ['2025-08-01'], '2025-09-01', 'current'],
    ['a requalification on the day of the failure clears it', ['2025-03-10', '2025-08-01'], ['2025-08-01'], '2025-09-01', 'current'],
    ['a failure after the date does not count yet', ['2025-03-10'], ['2025-10-01'], '2025-09-01', 'current'],
  ] as const)('%s', (_name, qualifiedOn, failedTestsOn, on, state) => {
    // source: 49 CFR 192.285(c) current text (CONFIRMED); same-day order is our documented reading
    expect(qualificationStatus({ qualifiedOn: [...qualifiedOn], failedTestsOn: [...failedTestsOn], on }).state).toBe(state);
  });

  test('an operator interval shorter than 15 months tightens', () => {
    // common practice (no published source): an operator may requalify more often than the rule requires
    expect(qualificationStatus({ qualifiedOn: ['2025-03-10'], on: '2025-12-01', intervalMonths: 12 }).until).toBe('2026-03-10');
    expect(qualificationStatus({ qualifiedOn: ['2025-11-30'], on: '2025-12-01', intervalMonths: 3 }).until).toBe('2026-02-28');
  });
  test.each([16, 0, 1.5])('an interval of %s months is refused', (intervalMonths) => {
    // source: 49 CFR 192.285(c): intervals not exceeding 15 months
    expect(() => qualificationStatus({ qualifiedOn: ['2025-03-10'], on: '2025-12-01', intervalMonths })).toThrow(/from 1 to 15/);
  });
  test('malformed dates are refused', () => {
    expect(() => qualificationStatus({ qualifiedOn: ['2025-02-30'], on: '2025-12-01' })).toThrow(/2025-02-30 is not a real date/);
    expect(() => qualificationStatus({ qualifiedOn: ['2025-03-10'], on: '12/01/2025' })).toThrow(/YYYY-MM-DD/);
  });
  test('joint data does not switch the rule on or after 2019-01-22', () => {
    // source: 83 FR 58694, effective 22 Jan 2019 (CONFIRMED)
    expect(qualificationStatus({ qualifiedOn: ['2018-12-01'], jointsMadeOn: [], on: '2019-01-22' }).rule).toBe('current');
  });
});

describe('legacy rule, 49 CFR 192.285(c) before 2019-01-22', () => {
  test.each([
    // source: 49 CFR 192.285(c) text before 83 FR 58694 (from memory, not found in a public copy): requalify if in any 12 months no joints are made
    // source: 83 FR 58694, effective 2019-01-22 (49 CFR 192.285(c) current text): the older text ends on 2019-01-21, and
    // the current text counts 15 months / next calendar year from the 2016-01-10 qualification, long past — so 2019-01-21, not 2019-03-15
    ['joints keep the qualification alive (to the end of the older text)', ['2016-01-10'], ['2016-05-01', '2017-04-01', '2018-03-15'], '2018-06-01', '2019-01-21', 'current', true],
    // source: 49 CFR 192.285(c) current text: qualified 2018-03-01 → earlier of 2019-06-01 and 2019-12-31, past 2019-01-22
    ['the current text carries a recent qualification past 2019-01-22', ['2018-03-01'], ['2018-05-01', '2018-11-15'], '2018-12-01', '2019-06-01', 'current', true],
    ['12 months without joints lapses it', ['2016-01-10'], ['2016-05-01', '2017-04-01'], '2018-06-01', '2018-04-01', 'lapsed', false],
    ['a joint on the 12-month day still counts', ['2016-01-10'], ['2017-01-10'], '2017-06-01', '2018-01-10', 'current', true],
    ['a joint after a gap does not revive it', ['2016-01-10'], ['2017-01-11', '2017-05-01'], '2017-06-01', '2017-01-10', 'lapsed', false],
    ['requalification restarts the clock', ['2016-01-10', '2017-03-01'], [], '2017-06-01', '2018-03-01', 'current', true],
    ['due soon within 30 days', ['2017-01-10'], [], '2017-12-20', '2018-01-10', 'due-soon', true],
  ] as const)('%s', (_name, qualifiedOn, jointsMadeOn, on, until, state, qualified) => {
    const status = legacyQualificationStatus({ qualifiedOn: [...qualifiedOn], jointsMadeOn: [...jointsMadeOn], failedJointsOn: [], on });
    expect(status).toMatchObject({ until, state, qualified, rule: 'legacy' });
  });

  const jointsIn2017 = (count: number) => Array.from({ length: count }, (_, i) => `2017-${String(1 + Math.floor(i / 28)).padStart(2, '0')}-${String(1 + (i % 28)).padStart(2, '0')}`);
  test.each([
    // source: 49 CFR 192.285(c) text before 83 FR 58694 (from memory, not found in a public copy): 3 joints or 3 % of joints made, whichever is greater, found unacceptable
    ['2 failures of 50 joints is fine', 50, ['2017-01-05', '2017-01-20'], 'current'],
    ['3 failures of 50 joints needs requalification', 50, ['2017-01-05', '2017-01-20', '2017-02-10'], 'requalification-needed'],
    // about 100 joints between failures: any 3 of them span ≥ 200 joints, 3 % of which is ≥ 6 > 3
    ['4 failures about 100 joints apart stay under 3 %', 300, ['2017-01-02', '2017-04-20', '2017-08-05', '2017-11-20'], 'current'],
    ['5 failures within 4 months of 300 joints need requalification', 300, ['2017-01-02', '2017-02-02', '2017-03-02', '2017-04-02', '2017-05-02'], 'requalification-needed'],
    ['3 failures spread over more than 12 months is fine', 300, ['2017-01-02', '2017-06-02', '2018-01-03'], 'current'],
  ] as const)('%s', (_name, jointCount, failedJointsOn, state) => {
    const status = legacyQualificationStatus({ qualifiedOn: ['2016-12-01'], jointsMadeOn: jointsIn2017(jointCount).concat(['2018-01-02']), failedJointsOn: [...failedJointsOn], on: '2018-01-10' });
    expect(status.state).toBe(state);
  });
  test('failures before the last qualification do not count', () => {
    // source: 49 CFR 192.285(c) legacy text: requalification resets the person's record
    const status = legacyQualificationStatus({ qualifiedOn: ['2016-12-01', '2017-03-01'], jointsMadeOn: jointsIn2017(50), failedJointsOn: ['2017-01-05', '2017-01-20', '2017-02-10'], on: '2017-06-01' });
    expect(status.state).toBe('current');
  });
  test('qualificationStatus uses the legacy rule for dates before 2019-01-22 with joint data', () => {
    // source: 49 CFR 192.285(c) and 83 FR 58694: the superseded text applies only to records made before 22 Jan 2019
    const status = qualificationStatus({ qualifiedOn: ['2016-01-10'], jointsMadeOn: ['2016-05-01'], failedTestsOn: [], on: '2017-06-01' });
    expect(status).toMatchObject({ rule: 'legacy', until: '2017-05-01', state: 'lapsed' });
  });
  test.each([
    // source: 83 FR 58694 (effective 2019-01-22): before that date 49 CFR 192.285(c) in its older text decides, and it
    // needs the joints made and the joints found unacceptable; today's rule is not applied in their place
    [{ qualifiedOn: ['2016-01-10'], on: '2017-06-01' }, ['the dates of the joints made under the procedure', 'the dates of joints found unacceptable by testing']],
    [{ qualifiedOn: ['2016-01-10'], jointsMadeOn: ['2016-05-01'], on: '2017-06-01' }, ['the dates of joints found unacceptable by testing']],
    [{ qualifiedOn: ['2016-01-10'], failedTestsOn: [], on: '2019-01-21' }, ['the dates of the joints made under the procedure']],
  ])('missing older-rule data is named, not replaced by today\'s rule (%o)', (input, missing) => {
    const status = qualificationStatus(input);
    expect(status).toMatchObject({ state: 'needs-legacy-data', rule: 'legacy', qualified: false, until: null, lastQualifiedOn: '2016-01-10', missing });
    expect(status.reason).toMatch(/^Needs the older rule's data: /);
  });
  test('on 2019-01-22 the current rule needs no joint data', () => {
    // source: 49 CFR 192.285(c) current text, effective 2019-01-22 (83 FR 58694)
    expect(qualificationStatus({ qualifiedOn: ['2018-06-01'], on: '2019-01-22' })).toMatchObject({ rule: 'current', state: 'current', until: '2019-09-01' });
  });
});
