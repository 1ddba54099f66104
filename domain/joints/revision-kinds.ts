// What each revision of a joint's append-only history records, and the words people see.

export const REVISION_KINDS = ['recorded', 'corrected', 'accepted', 'cut-out', 'trace-attached'] as const;
export type RevisionKind = (typeof REVISION_KINDS)[number];

export const REVISION_KIND_LABELS: Record<RevisionKind, string> = {
  recorded: 'Recorded',
  corrected: 'Corrected',
  accepted: 'Accepted',
  'cut-out': 'Cut out',
  'trace-attached': 'Pressure trace attached',
};
