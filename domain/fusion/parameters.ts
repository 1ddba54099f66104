// The parameters a joint check judges (domain/fusion/check), and their names as people see
// them: in the review's comparison and filters, and in the Register's "Finding on" filter
// and findings column (the same words for both).

export type JointParameter =
  | 'heaterTemperature'
  | 'beadUpPressure'
  | 'fusionPressure'
  | 'bead'
  | 'heatSoak'
  | 'heatSoakPressure'
  | 'changeover'
  | 'pressureBuildUp'
  | 'cooling'
  | 'coolingPressure'
  | 'facing'
  | 'alignment'
  | 'visualBead'
  | 'ambient'
  | 'shelter';

export const JOINT_PARAMETERS: readonly JointParameter[] = [
  'heaterTemperature',
  'beadUpPressure',
  'fusionPressure',
  'bead',
  'heatSoak',
  'heatSoakPressure',
  'changeover',
  'pressureBuildUp',
  'cooling',
  'coolingPressure',
  'facing',
  'alignment',
  'visualBead',
  'ambient',
  'shelter',
];

export const PARAMETER_LABELS: Record<JointParameter, string> = {
  heaterTemperature: 'Heater temperature',
  beadUpPressure: 'Bead-up pressure',
  fusionPressure: 'Fusion pressure',
  bead: 'Bead size',
  heatSoak: 'Heat soak',
  heatSoakPressure: 'Heat-soak pressure',
  changeover: 'Changeover',
  pressureBuildUp: 'Pressure build-up',
  cooling: 'Cooling',
  coolingPressure: 'Cooling pressure',
  facing: 'Facing',
  alignment: 'Alignment',
  visualBead: 'Visual bead check',
  ambient: 'Ambient temperature',
  shelter: 'Shelter',
};

/** The Register's name for the same words ("Finding on …"). */
export const FINDING_PARAMETER_LABELS = PARAMETER_LABELS;
