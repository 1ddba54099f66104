// A joint's outcome against its plan (domain/fusion/check), and the words people see for it.

export const JOINT_OUTCOMES = ['within-limits', 'out-of-limits'] as const;
export type JointOutcome = (typeof JOINT_OUTCOMES)[number];

export const OUTCOME_LABELS: Record<JointOutcome, string> = {
  'within-limits': 'Within limits',
  'out-of-limits': 'Out of limits',
};
