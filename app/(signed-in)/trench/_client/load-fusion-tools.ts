// Loads the device's plan and check (fusion-tools.ts) apart from the page's first load:
// the screen asks for them once it has painted (useFusionTools), and until they arrive the
// plan reads "Working out the plan …" and no value is judged yet.
import { useEffect, useSyncExternalStore } from "react";
import type { FusionTools } from "./fusion-tools";

export type { FusionTools };

let loading: Promise<FusionTools> | null = null;
let loaded: FusionTools | null = null;
const listeners = new Set<() => void>();

/** Loads the tools once; a failed load (no signal, nothing cached) is tried again on the next call. */
export function loadFusionTools(): Promise<FusionTools> {
  loading ??= import("./fusion-tools").then(
    (m) => {
      loaded = m.fusionTools;
      for (const listener of listeners) listener();
      return m.fusionTools;
    },
    (error: unknown) => {
      loading = null;
      throw error;
    },
  );
  return loading;
}

/** The tools if they have arrived (a plan exists only once they have). */
export function loadedFusionTools(): FusionTools | null {
  return loaded;
}

function subscribe(listener: () => void): () => void {
  listeners.add(listener);
  return () => listeners.delete(listener);
}

/** The tools, or null until they have arrived; starts the load after the first paint and again when the signal comes back. */
export function useFusionTools(): FusionTools | null {
  const tools = useSyncExternalStore(subscribe, loadedFusionTools, () => null);
  useEffect(() => {
    if (loaded) return;
    const load = () => void loadFusionTools().catch(() => undefined);
    load();
    window.addEventListener("online", load);
    return () => window.removeEventListener("online", load);
  }, []);
  return tools;
}
