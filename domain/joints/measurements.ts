// From a recorded joint's values to the joint check's measurements (domain/fusion/check).
// The two visual bead checks — a uniform double roll-back bead, and a V-groove between the
// beads that does not reach below the pipe surface — are one "visual bead" parameter of the
// check (PPI TR-33 generic butt-fusion procedure, visual acceptance; PPI bead cross-sections page).

import type { JointMeasurements } from '@/domain/fusion/check';

export interface RecordedValues {
  heaterTemperatureC: number | null;
  beadUpGaugeMpa?: number | null;
  fusionGaugeMpa: number | null;
  beadMm: number | null;
  heatSoakS?: number | null;
  changeoverS: number | null;
  coolingS: number | null;
  facingOk: boolean | null;
  alignmentOk: boolean | null;
  beadRollbackOk: boolean | null;
  vGrooveOk: boolean | null;
}

/** Canonical SI values → the check's input. A bead-up pressure left out is not checked. */
export function jointMeasurements(v: RecordedValues): JointMeasurements {
  const visual = v.beadRollbackOk === null || v.vGrooveOk === null ? null : v.beadRollbackOk && v.vGrooveOk;
  return {
    heaterTemperatureC: v.heaterTemperatureC,
    fusionGaugePressureMpa: v.fusionGaugeMpa,
    beadMm: v.beadMm,
    changeoverS: v.changeoverS,
    coolingS: v.coolingS,
    heatSoakS: v.heatSoakS ?? null,
    ...(v.beadUpGaugeMpa === null || v.beadUpGaugeMpa === undefined ? {} : { beadUpGaugePressureMpa: v.beadUpGaugeMpa }),
    facingOk: v.facingOk,
    alignmentOk: v.alignmentOk,
    visualBeadOk: visual,
  };
}
