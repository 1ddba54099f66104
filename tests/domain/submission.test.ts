// A client id sent again: the submission's canonical text (its fingerprint is the SHA-256
// of it) and the fields in which two submissions under one id differ.
//
// Rule under test: the same idempotency key with another payload is refused, the same
// payload answers as before — IETF draft-ietf-httpapi-idempotency-key-header-07, sections
// "Idempotency Fingerprint" and "Error Handling".
import { describe, expect, it } from 'vitest';
import { recordJointSchema } from '@/domain/joints/schemas';
import { reusedClientIdMessage, submissionDifferences, submissionFingerprintText, type StoredSubmission } from '@/domain/joints/submission';

const raw = {
  clientId: '8c7f3f5e-54a4-4a4e-9d5c-1d2f3a4b5c6d',
  jobId: 1,
  kind: 'coil-to-coil',
  coilA: 'LV-C0001',
  coilB: 'LV-C0002',
  lengthAM: 12.5,
  machineId: 2,
  heaterId: 3,
  dragPressureMpa: 0.07,
  heaterTemperatureC: 218,
  fusionGaugePressureMpa: 0.5,
  beadMm: 3.2,
  changeoverS: 5,
  coolingS: 600,
  timedFields: ['changeover', 'cooling'],
  madeAt: '2026-12-02T09:30:00Z',
  station: '3+40',
  ambientC: 12,
  shelter: 'windbreak',
  facingOk: true,
  alignmentOk: true,
  beadRollbackOk: true,
  vGrooveOk: true,
  photoIds: [5, 6],
};
/** The raw submission with `change` applied; a key set to undefined is left out. */
const parse = (change: Record<string, unknown> = {}) => {
  const merged: Record<string, unknown> = { ...raw, ...change };
  for (const k of Object.keys(merged)) if (merged[k] === undefined) delete merged[k];
  return recordJointSchema.parse(merged);
};
const sides = { coilAId: 11, coilBId: 12 };

describe('submissionFingerprintText', () => {
  it('is JSON with the keys in code-unit order and absent values left out', () => {
    // Written out by hand: keys sorted as RFC 8785 §3.2.3 sorts them (UTF-16 code units, so
    // "heaterId" < "heaterTemperatureC" and "machineId" < "madeAt"); the coils by the coil
    // their text names; made-at as UTC with milliseconds; client id and photo ids left out.
    expect(submissionFingerprintText(parse(), sides)).toBe(
      'v1:{"alignmentOk":true,"ambientC":12,"beadMm":3.2,"beadRollbackOk":true,"changeoverS":5,"coilA":11,"coilB":12,"coolingS":600,"dragPressureMpa":0.07,' +
        '"facingOk":true,"fusionGaugePressureMpa":0.5,"heaterId":3,"heaterTemperatureC":218,"jobId":1,"kind":"coil-to-coil","lengthAM":12.5,"machineId":2,' +
        '"madeAt":"2026-12-02T09:30:00.000Z","shelter":"windbreak","station":"3+40","timedFields":["changeover","cooling"],"vGrooveOk":true}',
    );
  });

  const same: [string, Record<string, unknown>][] = [
    ['another client id (it is the key, not the content)', { clientId: '0f9e8d7c-6b5a-4c3d-8e1f-123456789abc' }],
    ['other photo ids (the same picture uploaded again gets a new id)', { photoIds: [9] }],
    ['the timed phases in another order, or twice', { timedFields: ['cooling', 'changeover', 'cooling'] }],
    // RFC 3339 §4.2: 10:30 at +01:00 is 09:30 UTC, the same instant.
    ['made-at written with another offset', { madeAt: '2026-12-02T10:30:00+01:00' }],
    ['the deprecated name of the fusion gauge pressure', { fusionGaugePressureMpa: undefined, fusionGaugeMpa: 0.5 }],
    ['an optional value sent as null', { heatSoakS: null, latitude: null }],
  ];
  it.each(same)('the same submission: %s', (_n, change) => {
    expect(submissionFingerprintText(parse(change), sides)).toBe(submissionFingerprintText(parse(), sides));
  });

  const other: [string, Record<string, unknown>][] = [
    ['another heater temperature', { heaterTemperatureC: 219 }],
    ['a failed visual check', { vGrooveOk: false }],
    ['another station', { station: '3+60' }],
    ['a heat soak that was left out before', { heatSoakS: 90 }],
  ];
  it.each(other)('another submission: %s', (_n, change) => {
    expect(submissionFingerprintText(parse(change), sides)).not.toBe(submissionFingerprintText(parse(), sides));
  });

  it('another coil behind the same text is another submission; another text for the same coil is not', () => {
    expect(submissionFingerprintText(parse(), { coilAId: 11, coilBId: 13 })).not.toBe(submissionFingerprintText(parse(), sides));
    expect(submissionFingerprintText(parse({ coilB: '/coils/LV-C0002' }), sides)).toBe(submissionFingerprintText(parse(), sides));
  });
});

describe('submissionDifferences', () => {
  const stored: StoredSubmission = {
    jointNo: 7,
    jobId: 1,
    jobCode: 'WO-T1',
    kind: 'coil-to-coil',
    coilA: { id: 11, code: 'LV-C0001' },
    coilB: { id: 12, code: 'LV-C0002' },
    componentBText: null,
    lengthAM: 12.5,
    lengthBM: null,
    machine: { id: 2, assetTag: 'FM-201' },
    heater: { id: 3, assetTag: 'HP-31' },
    madeAt: new Date('2026-12-02T09:30:00Z'),
    station: '3+40',
    latitude: null,
    longitude: null,
    ambientC: 12,
    shelter: 'windbreak',
    timedFields: ['changeover', 'cooling'],
    replacesJointId: null,
    dragPressureMpa: 0.07,
    heaterTemperatureC: 218,
    heaterSurfaceTemperatureC: null,
    beadUpGaugePressureMpa: null,
    fusionGaugePressureMpa: 0.5,
    beadMm: 3.2,
    heatSoakS: null,
    heatSoakGaugePressureMpa: null,
    misalignmentMm: null,
    changeoverS: 5,
    coolingS: 600,
    facingOk: true,
    alignmentOk: true,
    beadRollbackOk: true,
    vGrooveOk: true,
  };

  it('none for the joint sent again', () => {
    expect(submissionDifferences(stored, parse(), sides, 'si')).toEqual([]);
  });

  it('none for digits the joint does not keep', () => {
    // heater_temperature_c is DECIMAL(6,1): 218.04 is stored as 218.0 (MariaDB rounds a
    // DECIMAL to its scale: MariaDB Knowledge Base, "DECIMAL").
    expect(submissionDifferences(stored, parse({ heaterTemperatureC: 218.04 }), sides, 'si')).toEqual([]);
    expect(submissionDifferences(stored, parse({ heaterTemperatureC: 218.1 }), sides, 'si').map((d) => d.field)).toEqual(['heaterTemperatureC']);
  });

  it('names each field that differs, in words and in the reader\u2019s units', () => {
    const out = submissionDifferences(stored, parse({ heaterTemperatureC: 226, shelter: 'tent', coilB: 'LV-C0003' }), { coilAId: 11, coilBId: 13 }, 'us');
    expect(out.map((d) => d.field)).toEqual(['coilB', 'heaterTemperatureC', 'shelter']);
    expect(out.map((d) => d.label)).toEqual(['Coil on side B', 'Heater temperature', 'Weather shelter']);
    // °F = °C × 9/5 + 32 (NIST SP 811, B.8): 218 °C = 424.4 °F, 226 °C = 438.8 °F, shown to the whole degree.
    expect(out[1]!.message).toBe('Heater temperature: 424 °F recorded as joint 7 on WO-T1, 439 °F in this submission.');
    expect(out[0]!.message).toContain('LV-C0002 recorded');
    expect(out[0]!.message).toContain('LV-C0003 in this submission');
    expect(out[2]!.message).toBe('Weather shelter: Windbreak recorded as joint 7 on WO-T1, Tent in this submission.');
  });

  it('says when each was made, in UTC, to the millisecond when they share a second', () => {
    const later = submissionDifferences(stored, parse({ madeAt: '2026-12-02T09:31:05Z' }), sides, 'si');
    expect(later.map((d) => d.message)).toEqual(['When the joint was made: 2026-12-02 09:30:00 UTC recorded as joint 7 on WO-T1, 2026-12-02 09:31:05 UTC in this submission.']);
    const close = submissionDifferences(stored, parse({ madeAt: '2026-12-02T09:30:00.250Z' }), sides, 'si');
    expect(close[0]!.message).toBe('When the joint was made: 2026-12-02 09:30:00.000 UTC recorded as joint 7 on WO-T1, 2026-12-02 09:30:00.250 UTC in this submission.');
  });

  it('words the refusal with the joint, the fields and the way on', () => {
    const out = submissionDifferences(stored, parse({ heaterTemperatureC: 226, beadMm: 4 }), sides, 'si');
    const message = reusedClientIdMessage(stored, out);
    expect(message).toContain('already used for joint 7 on WO-T1');
    expect(message).toContain('(heater temperature, bead size)');
    expect(message).toContain('Nothing was recorded');
    expect(message).toContain('send it as a new joint');
  });
});
