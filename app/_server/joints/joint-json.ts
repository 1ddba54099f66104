// The JSON shape of a joint in the API: every stored value (canonical SI, field names
// carry units), the plan it was checked against, and the verdict re-checked in the
// caller's units so messages read naturally.
import "server-only";
import { verdictOf } from "@/app/_server/joints/record-joint";
import type { JointRecord } from "@/database/queries/joints";
import { DEPRECATED_WIRE_NAMES, pickRecordedValues, type RecordedValues } from "@/domain/joints/values";
import type { UnitSystem } from "@/domain/units/format";

/**
 * The recorded values (domain/joints/values) under their current names, and again under
 * their deprecated names (`fusionGaugeMpa`, `beadUpGaugeMpa`) for callers written before
 * the rename (README "JSON API").
 */
function valuesJson(j: RecordedValues) {
  const values: Record<string, number | boolean | null> = pickRecordedValues(j);
  for (const [old, key] of Object.entries(DEPRECATED_WIRE_NAMES)) values[old] = values[key];
  return values;
}

export function jointJson(j: JointRecord, system: UnitSystem) {
  const verdict = verdictOf(j, system);
  return {
    id: j.id,
    clientId: j.clientId,
    url: `/joints/${j.id}`,
    job: { id: j.jobId, code: j.jobCode, name: j.jobName },
    jointNo: j.jointNo,
    kind: j.kind,
    coilA: j.coilA,
    coilB: j.coilB,
    componentBText: j.componentBText,
    lengthAM: j.lengthAM,
    lengthBM: j.lengthBM,
    outsideDiameterMm: j.outsideDiameterMm,
    sdr: j.sdr,
    procedure: { versionId: j.procedureVersionId, code: j.procedureCode, name: j.procedureName, versionNo: j.procedureVersionNo },
    machine: j.machine,
    heater: j.heater,
    fuser: j.fuser,
    madeAt: j.madeAt.toISOString(),
    recordedAt: j.recordedAt.toISOString(),
    place: { station: j.station, latitude: j.latitude, longitude: j.longitude },
    ambientC: j.ambientC,
    shelter: j.shelter,
    values: valuesJson(j),
    timedFields: j.timedFields,
    outcome: j.outcome,
    findings: verdict.findings,
    reviewState: j.reviewState,
    revisionNo: j.revisionNo,
    replacesJointId: j.replacesJointId,
    replacedByJointId: j.replacedByJointId,
    plan: j.plan,
  };
}
