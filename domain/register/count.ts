// The register's count as it is shown: an exact number, or "about N" while the exact
// count is still being taken in the background. An estimate is never shown as a count:
// it is rounded to two significant figures and always carries "about".

/**
 * A count answer. `isExact` false means `value` is the optimizer's estimate; `counting`
 * says an exact count is running (ask again for it); `isEstimate` is `!isExact`, kept for
 * older readers of the JSON API.
 */
export type RegisterCount = { value: number; isExact: boolean; isEstimate: boolean; counting: boolean };

export const exactCount = (value: number): RegisterCount => ({ value, isExact: true, isEstimate: false, counting: false });
export const estimatedCount = (value: number, counting: boolean): RegisterCount => ({ value, isExact: false, isEstimate: true, counting });

/** An estimate rounded to two significant figures (857,184 → 860,000; 12,345 → 12,000). */
export function roundEstimate(value: number): number {
  if (!Number.isFinite(value) || value <= 0) return 0;
  const n = Math.round(value);
  if (n < 100) return n;
  const step = 10 ** (Math.floor(Math.log10(n)) - 1);
  return Math.round(n / step) * step;
}

const grouped = (n: number) => n.toLocaleString("en-US");

/** The count line's words: "1 joint", "12,345 joints", "About 860,000 joints — counting exactly …". */
export function describeRegisterCount(count: Pick<RegisterCount, "value" | "isExact" | "counting">): string {
  if (count.isExact) return `${grouped(count.value)} ${count.value === 1 ? "joint" : "joints"}`;
  const about = `About ${grouped(roundEstimate(count.value))} joints`;
  return count.counting ? `${about} (counting exactly …)` : `${about} (the exact count takes too long at this size)`;
}
