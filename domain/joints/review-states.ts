// Where a joint stands in review (the latest revision's state), and the words people see.

export const REVIEW_STATES = ['pending-review', 'accepted', 'cut-out'] as const;
export type ReviewState = (typeof REVIEW_STATES)[number];

export const REVIEW_STATE_LABELS: Record<ReviewState, string> = {
  'pending-review': 'Pending review',
  accepted: 'Accepted',
  'cut-out': 'Cut out',
};
