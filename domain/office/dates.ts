// Civil-date helpers for office records ('YYYY-MM-DD', UTC calendar, no clock).

/** ISO date of an instant in UTC (the calendar the demo and the records use). */
export function isoDateOf(instant: Date): string {
  return instant.toISOString().slice(0, 10);
}

/** Add whole days to an ISO date. */
export function addDays(date: string, days: number): string {
  const [y, m, d] = date.split('-').map(Number) as [number, number, number];
  return new Date(Date.UTC(y, m - 1, d) + days * 86_400_000).toISOString().slice(0, 10);
}

/** True for a real calendar date written YYYY-MM-DD. */
export function isIsoDate(text: string): boolean {
  const match = /^(\d{4})-(\d{2})-(\d{2})$/.exec(text);
  if (!match) return false;
  const [y, m, d] = [Number(match[1]), Number(match[2]), Number(match[3])];
  const date = new Date(Date.UTC(y, m - 1, d));
  return date.getUTCFullYear() === y && date.getUTCMonth() === m - 1 && date.getUTCDate() === d;
}
