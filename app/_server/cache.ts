// A value that does not depend on the request (organisation settings, reference lists for
// the screens' filters, procedure definitions), loaded once and kept in this process for a
// short time. `clear()` drops it at once: the use case that changes the value calls it after its transaction
// commits, so this instance sees the change on its next read. Another instance of the app
// (more than one may serve the same database), or a write from outside the app, is seen when
// the TTL runs out: the TTL bounds how stale a value read there can be.
// Kept on globalThis by name: the routes of a production build may each load their own copy
// of this module, and the action that clears must reach the copy the pages read.
import "server-only";

export type CachedValue<T> = {
  /** The kept value, or a fresh load when there is none or it is older than the TTL. */
  get(): Promise<T>;
  /** The kept value when there is a fresh one, else null (loads nothing). */
  peek(): Promise<T> | null;
  /** Forgets the value; the next `get()` loads it again. */
  clear(): void;
};

type Entry = { value: Promise<unknown>; until: number } | null;
const globalEntries = globalThis as unknown as { beadlineCachedValues?: Map<string, Entry> };

function entries(): Map<string, Entry> {
  globalEntries.beadlineCachedValues ??= new Map();
  return globalEntries.beadlineCachedValues;
}

export function cachedValue<T>(name: string, load: () => Promise<T>, { ttlMs }: { ttlMs: number }): CachedValue<T> {
  return {
    get() {
      const now = Date.now();
      const kept = entries().get(name);
      if (kept && kept.until > now) return kept.value as Promise<T>;
      // The promise is kept, so requests arriving while it loads share one query.
      const value = load();
      const mine = { value, until: now + ttlMs };
      entries().set(name, mine);
      // A failed load (database unavailable) is not kept: the next read tries again.
      value.catch(() => {
        if (entries().get(name) === mine) entries().delete(name);
      });
      return value;
    },
    peek() {
      const kept = entries().get(name);
      return kept && kept.until > Date.now() ? (kept.value as Promise<T>) : null;
    },
    clear() {
      // Also drops a load still under way: it may have read the value before the change.
      entries().delete(name);
    },
  };
}
