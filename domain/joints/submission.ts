// When a joint arrives with a client id already used, is it the same submission sent again
// (answer with the joint it made) or another joint under a used id (refuse, 409)? The
// idempotency-key rule of the IETF draft "The Idempotency-Key HTTP Header Field"
// (draft-ietf-httpapi-idempotency-key-header-07, sections "Idempotency Fingerprint" and
// "Error Handling"): the same key with a different payload is an error, never the first
// answer again. Pure: the server hashes the canonical text (SHA-256) and stores it with the
// joint; joints stored before fingerprints existed are compared value by value.
import { JOINT_KIND_LABELS, PHASE_LABELS, type JointKind, type TimedPhase } from '@/domain/joints/record-words';
import { SHELTER_LABELS, type Shelter } from '@/domain/joints/shelters';
import type { RecordJointInput } from '@/domain/joints/schemas';
import { RECORDED_VALUE_DEFINITIONS, type RecordedValues } from '@/domain/joints/values';
import { formatQuantity, type QuantityKind, type UnitSystem } from '@/domain/units/format';

/** The coils the submission's side A and side B texts name (null: no such coil, or no coil side). */
export interface ResolvedSides {
  coilAId: number | null;
  coilBId: number | null;
}

type Scalar = string | number | boolean | null;

/**
 * What the record keeps of a submission, one entry per field, before canonical encoding.
 * Left out as volatile: the client id itself (it is the key) and the photo ids (handles the
 * server gave the uploads: the same picture uploaded twice gets two ids). The coil sides are
 * the coils their texts name, so a code, the label's address and the F2897 code of one coil
 * are one submission. Side B text is kept only where the record keeps it (a coil on a
 * coil-to-coil joint, a description otherwise).
 */
function submissionFields(input: RecordJointInput, sides: ResolvedSides): Record<string, Scalar | Scalar[]> {
  const coilToCoil = input.kind === 'coil-to-coil';
  const values = Object.fromEntries(RECORDED_VALUE_DEFINITIONS.map((d) => [d.key, ((input as unknown as Record<string, Scalar | undefined>)[d.key] ?? null) as Scalar]));
  return {
    jobId: input.jobId,
    kind: input.kind,
    coilA: sides.coilAId,
    coilB: coilToCoil ? sides.coilBId : null,
    componentBText: coilToCoil ? null : (input.componentBText ?? null),
    lengthAM: input.lengthAM ?? null,
    lengthBM: coilToCoil ? (input.lengthBM ?? null) : null,
    machineId: input.machineId,
    heaterId: input.heaterId,
    ...values,
    timedFields: [...new Set(input.timedFields)].sort(),
    madeAt: new Date(input.madeAt).toISOString(),
    station: input.station ?? null,
    latitude: input.latitude ?? null,
    longitude: input.longitude ?? null,
    ambientC: input.ambientC,
    shelter: input.shelter,
    replacesJointId: input.replacesJointId ?? null,
  };
}

/**
 * The canonical text a submission's fingerprint is taken of: JSON with the keys sorted, and
 * absent values (null, an empty list) left out, so a later optional field does not change
 * the fingerprint of a submission that does not use it. Numbers as JSON writes them
 * (-0 as 0); the made-at instant as UTC ISO 8601 with milliseconds. Prefixed "v1:" so a
 * later encoding can be told apart.
 */
export function submissionFingerprintText(input: RecordJointInput, sides: ResolvedSides): string {
  const fields = submissionFields(input, sides);
  const kept = Object.keys(fields)
    .sort()
    .filter((k) => {
      const v = fields[k];
      return v !== null && !(Array.isArray(v) && v.length === 0);
    })
    .map((k) => [k, fields[k]] as const);
  return `v1:${JSON.stringify(Object.fromEntries(kept))}`;
}

/** A joint as stored, as far as a submission can differ from it (JointRecord fits). */
export type StoredSubmission = RecordedValues & {
  jointNo: number;
  jobId: number;
  jobCode: string;
  kind: JointKind;
  coilA: { id: number; code: string } | null;
  coilB: { id: number; code: string } | null;
  componentBText: string | null;
  lengthAM: number | null;
  lengthBM: number | null;
  machine: { id: number; assetTag: string };
  heater: { id: number; assetTag: string };
  madeAt: Date;
  station: string | null;
  latitude: number | null;
  longitude: number | null;
  ambientC: number | null;
  shelter: Shelter | null;
  timedFields: TimedPhase[];
  replacesJointId: number | null;
};

/** One field where a submission differs from the joint already recorded under its client id. */
export interface SubmissionDifference {
  /** The submission's field (the form's and the JSON API's name). */
  field: string;
  /** The field's name as the Trench form shows it. */
  label: string;
  /** "Heater temperature: 218 °C recorded, 226 °C in this submission." */
  message: string;
}

/**
 * The resolution each number is kept at in the joints table (its DECIMAL scale): a value sent
 * with more digits is stored rounded, so a stored and a sent value that round alike are the
 * same. Lengths 0.01 m, positions 1e-6°, ambient and heater dial 0.1 °C, pressures 1e-4 MPa,
 * bead 0.01 mm, durations 0.1 s.
 */
const STORED_STEP: Record<string, number> = {
  lengthAM: 0.01,
  lengthBM: 0.01,
  latitude: 1e-6,
  longitude: 1e-6,
  ambientC: 0.1,
  heaterTemperatureC: 0.1,
  heaterSurfaceTemperatureC: 0.01,
  dragPressureMpa: 1e-4,
  beadUpGaugePressureMpa: 1e-4,
  fusionGaugePressureMpa: 1e-4,
  heatSoakGaugePressureMpa: 1e-4,
  beadMm: 0.01,
  heatSoakS: 0.1,
  changeoverS: 0.1,
  coolingS: 0.1,
  misalignmentMm: 0.001,
};

function sameNumber(field: string, stored: number | null, sent: number | null): boolean {
  if (stored === null || sent === null) return stored === sent;
  const step = STORED_STEP[field] ?? 1e-6;
  // Half a step either way, plus a hair for binary fractions (0.1 is not exact in a double).
  return Math.abs(stored - sent) <= step / 2 + 1e-9;
}

const NOT_GIVEN = 'not given';

/** The Trench form's words for the submission's fields that are not recorded values. */
export const SUBMISSION_FIELD_LABELS = {
  jobId: 'Job',
  kind: 'What is joined',
  coilA: 'Coil on side A',
  coilB: 'Coil on side B',
  componentBText: 'Side B (fitting or pipe in the ground)',
  lengthAM: 'Pipe laid from coil A',
  lengthBM: 'Pipe laid from coil B',
  machineId: 'Fusion machine',
  heaterId: 'Heater plate',
  timedFields: 'Timed phases',
  madeAt: 'When the joint was made',
  station: 'Station',
  latitude: 'Location',
  longitude: 'Location',
  ambientC: 'Ambient temperature',
  shelter: 'Weather shelter',
  replacesJointId: 'Remake of a cut-out joint',
} as const;

/**
 * Every field in which `sent` differs from the joint `stored` under the same client id,
 * in the form's order, each with a sentence in `system` units. Numbers are compared at the
 * resolution the joint keeps them (STORED_STEP); the coil sides by the coil their text
 * names (`sides`); the made-at instant to the millisecond; photos are not compared
 * (see submissionFields). Empty when the submission is the joint sent again.
 */
export function submissionDifferences(stored: StoredSubmission, sent: RecordJointInput, sides: ResolvedSides, system: UnitSystem): SubmissionDifference[] {
  const out: SubmissionDifference[] = [];
  const coilToCoil = sent.kind === 'coil-to-coil';
  const differ = (field: string, label: string, recorded: string, given: string) =>
    out.push({ field, label, message: `${label}: ${recorded} recorded as joint ${stored.jointNo} on ${stored.jobCode}, ${given} in this submission.` });
  const quantity = (field: string, label: string, kind: QuantityKind, a: number | null, b: number | null) => {
    if (!sameNumber(field, a, b)) differ(field, label, a === null ? NOT_GIVEN : formatQuantity(a, kind, system), b === null ? NOT_GIVEN : formatQuantity(b, kind, system));
  };
  const L = SUBMISSION_FIELD_LABELS;

  if (stored.jobId !== sent.jobId) differ('jobId', L.jobId, stored.jobCode, 'another job');
  if (stored.kind !== sent.kind) differ('kind', L.kind, JOINT_KIND_LABELS[stored.kind], JOINT_KIND_LABELS[sent.kind]);
  if ((stored.coilA?.id ?? null) !== sides.coilAId) differ('coilA', L.coilA, stored.coilA?.code ?? NOT_GIVEN, sent.coilA);
  if (coilToCoil && (stored.coilB?.id ?? null) !== sides.coilBId) differ('coilB', L.coilB, stored.coilB?.code ?? NOT_GIVEN, sent.coilB ?? NOT_GIVEN);
  if (!coilToCoil && (stored.componentBText ?? null) !== (sent.componentBText ?? null)) differ('componentBText', L.componentBText, `“${stored.componentBText ?? ''}”`, `“${sent.componentBText ?? ''}”`);
  quantity('lengthAM', L.lengthAM, 'length-m', stored.lengthAM, sent.lengthAM ?? null);
  if (coilToCoil) quantity('lengthBM', L.lengthBM, 'length-m', stored.lengthBM, sent.lengthBM ?? null);
  if (stored.machine.id !== sent.machineId) differ('machineId', L.machineId, stored.machine.assetTag, 'another machine');
  if (stored.heater.id !== sent.heaterId) differ('heaterId', L.heaterId, stored.heater.assetTag, 'another heater plate');

  const sentValues = sent as unknown as Record<string, number | boolean | null | undefined>;
  const storedValues = stored as unknown as Record<string, number | boolean | null>;
  for (const d of RECORDED_VALUE_DEFINITIONS) {
    const a = storedValues[d.key] ?? null;
    const b = sentValues[d.key] ?? null;
    if (d.type === 'quantity') quantity(d.key, d.label, d.quantity, a as number | null, b as number | null);
    else if (a !== b) differ(d.key, d.label, a === null ? NOT_GIVEN : a ? 'yes' : 'no', b === null ? NOT_GIVEN : b ? 'yes' : 'no');
  }

  const timed = (list: readonly TimedPhase[]) => [...new Set(list)].sort().map((p) => PHASE_LABELS[p].toLowerCase()).join(', ') || 'none';
  if (timed(stored.timedFields) !== timed(sent.timedFields)) differ('timedFields', L.timedFields, timed(stored.timedFields), timed(sent.timedFields));
  const sentAt = new Date(sent.madeAt);
  if (stored.madeAt.getTime() !== sentAt.getTime()) {
    // UTC (the sentence is read on any device, whatever its zone), to the second, or to the
    // millisecond when the two fall in the same second.
    const sameSecond = Math.floor(stored.madeAt.getTime() / 1000) === Math.floor(sentAt.getTime() / 1000);
    const utc = (d: Date) => `${d.toISOString().slice(0, sameSecond ? 23 : 19).replace('T', ' ')} UTC`;
    differ('madeAt', L.madeAt, utc(stored.madeAt), utc(sentAt));
  }
  if ((stored.station ?? null) !== (sent.station ?? null)) differ('station', L.station, stored.station ?? NOT_GIVEN, sent.station ?? NOT_GIVEN);
  if (!sameNumber('latitude', stored.latitude, sent.latitude ?? null) || !sameNumber('longitude', stored.longitude, sent.longitude ?? null)) {
    const at = (lat: number | null | undefined, lon: number | null | undefined) => (lat == null || lon == null ? NOT_GIVEN : `${lat}, ${lon}`);
    differ('latitude', L.latitude, at(stored.latitude, stored.longitude), at(sent.latitude, sent.longitude));
  }
  quantity('ambientC', L.ambientC, 'temperature', stored.ambientC, sent.ambientC);
  if ((stored.shelter ?? null) !== sent.shelter) differ('shelter', L.shelter, stored.shelter ? SHELTER_LABELS[stored.shelter] : NOT_GIVEN, SHELTER_LABELS[sent.shelter]);
  if ((stored.replacesJointId ?? null) !== (sent.replacesJointId ?? null)) differ('replacesJointId', L.replacesJointId, stored.replacesJointId ? 'a remake' : 'not a remake', sent.replacesJointId ? 'a remake' : 'not a remake');
  return out;
}

/**
 * The refusal of a used client id with other values, in words for the fuser and the API
 * caller: which joint holds the id, which fields differ, that nothing was written, and what
 * to do (a new joint gets a new submission id).
 */
export function reusedClientIdMessage(stored: Pick<StoredSubmission, 'jointNo' | 'jobCode'>, differences: SubmissionDifference[]): string {
  const labels = [...new Set(differences.map((d) => d.label.toLowerCase()))];
  const which = labels.length ? ` with other values (${labels.join(', ')})` : ' with other values';
  return `This submission id was already used for joint ${stored.jointNo} on ${stored.jobCode}${which}. Nothing was recorded from this submission. If it is another joint, send it as a new joint (a new submission id).`;
}
