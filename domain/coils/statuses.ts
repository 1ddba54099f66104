// Where a coil is in its life, as a label (lists, badges) and as words inside a sentence
// ("A coil that is in the yard cannot …").

export type CoilStatus = 'in-yard' | 'on-trailer' | 'in-use' | 'used-up' | 'quarantined';

export const COIL_STATUSES: readonly CoilStatus[] = ['in-yard', 'on-trailer', 'in-use', 'used-up', 'quarantined'];

export const COIL_STATUS_LABELS: Readonly<Record<CoilStatus, string>> = {
  'in-yard': 'In yard',
  'on-trailer': 'On trailer',
  'in-use': 'In use',
  'used-up': 'Used up',
  quarantined: 'Quarantined',
};

/** The status inside a sentence: "in the yard", "on the trailer", … */
export const COIL_STATUS_PHRASES: Readonly<Record<CoilStatus, string>> = {
  'in-yard': 'in the yard',
  'on-trailer': 'on the trailer',
  'in-use': 'in use',
  'used-up': 'used up',
  quarantined: 'quarantined',
};
