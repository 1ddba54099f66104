// A value that does not depend on the request (organisation settings, reference lists),
// loaded once and kept in this process for a short time. `clear()` drops it at once: the
// use case that changes the value calls it after its transaction commits, so this instance
// sees the change on its next read. Another instance of the app (more than one may serve
// the same database) keeps its copy until the TTL runs out: that TTL is the bound on how
// stale a value read there can be.
import "server-only";

export type CachedValue<T> = {
  /** The cached value, or a fresh load when there is none or it is older than the TTL. */
  get(): Promise<T>;
  /** The cached value when there is a fresh one, else null (loads nothing). */
  peek(): Promise<T> | null;
  /** Forgets the value; the next `get()` loads it again. */
  clear(): void;
};

export function cachedValue<T>(load: () => Promise<T>, { ttlMs }: { ttlMs: number }): CachedValue<T> {
  // The promise is kept, so requests arriving while it loads share one query. clear() drops
  // a load still under way too: it may have read the value before the change.
  let entry: { value: Promise<T>; until: number } | null = null;
  return {
    get() {
      const now = Date.now();
      if (entry && entry.until > now) return entry.value;
      const value = load();
      const mine = { value, until: now + ttlMs };
      entry = mine;
      // A failed load (database unavailable) is not kept: the next read tries again.
      value.catch(() => {
        if (entry === mine) entry = null;
      });
      return value;
    },
    peek() {
      return entry && entry.until > Date.now() ? entry.value : null;
    },
    clear() {
      entry = null;
    },
  };
}
