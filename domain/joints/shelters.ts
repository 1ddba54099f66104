// The weather shelter over a joint while it is made, from none to a heated tent, in the
// order of the protection it gives (a procedure's weather rule asks for "at least" one).

export const SHELTERS = ['none', 'windbreak', 'tent', 'heated-tent'] as const;
export type Shelter = (typeof SHELTERS)[number];

export const SHELTER_LABELS: Record<Shelter, string> = {
  none: 'None (open air)',
  windbreak: 'Windbreak',
  tent: 'Tent',
  'heated-tent': 'Heated tent',
};

/** The same in a sentence ("at least a tent"). */
export const SHELTER_PHRASES: Record<Shelter, string> = {
  none: 'no shelter',
  windbreak: 'a windbreak',
  tent: 'a tent',
  'heated-tent': 'a heated tent',
};

/** True when `given` protects at least as well as `needed` (SHELTERS is in that order). */
export function shelterAtLeast(given: Shelter, needed: Shelter): boolean {
  return SHELTERS.indexOf(given) >= SHELTERS.indexOf(needed);
}

export function isShelter(value: unknown): value is Shelter {
  return typeof value === 'string' && (SHELTERS as readonly string[]).includes(value);
}
