"use client";
// The screen's own state on the device: which sections the fuser folded away (kept, so the
// page opens as they left it) and whether the safety box was read today (local day: it
// opens again the next morning).
import { useCallback, useEffect, useState } from "react";
import { loadScreenPrefs, prefsKey, saveScreenPrefs, type ScreenPrefs } from "../../_client/device-store";

export type SectionId = "setup" | "plan" | "timer" | "values";

/** The device's local calendar day, YYYY-MM-DD (the fuser's day at the trench). */
function localDay(at: Date): string {
  return `${at.getFullYear()}-${String(at.getMonth() + 1).padStart(2, "0")}-${String(at.getDate()).padStart(2, "0")}`;
}

/** Sections folded when the device has no preference yet. */
const CLOSED_AT_FIRST: SectionId[] = [];

export function useScreenPrefs(userId: number) {
  const [prefs, setPrefs] = useState<ScreenPrefs>({ closed: CLOSED_AT_FIRST, safetyReadOn: null });
  const [loaded, setLoaded] = useState(false);

  useEffect(() => {
    // Device storage is an external system: read it once the page is on the device.
    const stored = loadScreenPrefs(userId);
    // eslint-disable-next-line react-hooks/set-state-in-effect
    setPrefs(window.localStorage.getItem(prefsKey(userId)) ? stored : { ...stored, closed: CLOSED_AT_FIRST });
    setLoaded(true);
  }, [userId]);

  const update = useCallback(
    (change: (p: ScreenPrefs) => ScreenPrefs) =>
      setPrefs((p) => {
        const next = change(p);
        saveScreenPrefs(userId, next);
        return next;
      }),
    [userId],
  );

  const isOpen = (id: SectionId) => !prefs.closed.includes(id);
  const setOpen = useCallback((id: SectionId, open: boolean) => update((p) => ({ ...p, closed: open ? p.closed.filter((c) => c !== id) : [...new Set([...p.closed, id])] })), [update]);
  const openAll = useCallback(() => update((p) => ({ ...p, closed: [] })), [update]);
  const safetyReadToday = loaded && prefs.safetyReadOn === localDay(new Date());
  const acknowledgeSafety = useCallback(() => update((p) => ({ ...p, safetyReadOn: localDay(new Date()) })), [update]);

  return { isOpen, setOpen, openAll, safetyReadToday, acknowledgeSafety };
}
