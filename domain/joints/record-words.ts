// The words and limits of a joint record that the Trench device shows before any input is
// checked: what is joined, the timed phases, how many photos. Kept apart from the zod
// schemas (schemas.ts re-exports them) so the screen's first load carries no schema code.

export const JOINT_KINDS = ['coil-to-coil', 'tie-in', 'fitting'] as const;
export type JointKind = (typeof JOINT_KINDS)[number];

export const JOINT_KIND_LABELS: Record<JointKind, string> = {
  'coil-to-coil': 'Coil to coil',
  'tie-in': 'Tie-in to pipe in the ground',
  fitting: 'Coil to fitting',
};

/** The phases the Trench timer can time; the rest of a record's durations are typed. */
export const TIMED_PHASES = ['heatSoak', 'changeover', 'cooling'] as const;
export type TimedPhase = (typeof TIMED_PHASES)[number];

export const PHASE_LABELS: Record<TimedPhase, string> = {
  heatSoak: 'Heat soak',
  changeover: 'Changeover',
  cooling: 'Cooling',
};

/** Up to 6 bead photos per joint (issue 5). */
export const MAX_PHOTOS_PER_JOINT = 6;
