// Provenance tags carried by every published value in the domain, so screens and tests
// can say where a number comes from. Tags:
// confirmed = read in the public text; confirmed-2nd = read in a secondary reproduction;
// from-memory = not found in public material, kept as editable data until checked;
// operator = no published value: the operator's own value, editable.

export type ValueStatus = 'confirmed' | 'confirmed-2nd' | 'from-memory' | 'operator';

export const VALUE_STATUSES = ['confirmed', 'confirmed-2nd', 'from-memory', 'operator'] as const satisfies readonly ValueStatus[];

/** Where a value comes from and how sure we are of it. */
export interface Sourced {
  /** Standard and clause/table, in plain words. */
  source: string;
  status: ValueStatus;
}

/** Words for a status, for screens. */
export function describeStatus(status: ValueStatus): string {
  switch (status) {
    case 'confirmed':
      return 'confirmed';
    case 'confirmed-2nd':
      return 'confirmed in a reproduction';
    case 'from-memory':
      return 'from memory, unconfirmed';
    case 'operator':
      return "operator's value (no published value)";
  }
}
