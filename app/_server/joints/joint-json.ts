// The JSON shape of a joint in the API: every stored value (canonical SI, field names
// carry units), the plan it was checked against, and the verdict re-checked in the
// caller's units so messages read naturally.
import "server-only";
import { verdictOf } from "@/app/_server/joints/record-joint";
import type { JointRecord } from "@/database/queries/joints";
import type { UnitSystem } from "@/domain/units/format";

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
    values: {
      heaterTemperatureC: j.heaterTemperatureC,
      dragPressureMpa: j.dragPressureMpa,
      beadUpGaugeMpa: j.beadUpGaugeMpa,
      fusionGaugeMpa: j.fusionGaugeMpa,
      beadMm: j.beadMm,
      heatSoakS: j.heatSoakS,
      changeoverS: j.changeoverS,
      coolingS: j.coolingS,
      facingOk: j.facingOk,
      alignmentOk: j.alignmentOk,
      beadRollbackOk: j.beadRollbackOk,
      vGrooveOk: j.vGrooveOk,
    },
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
