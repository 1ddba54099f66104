// Loads the device's plan and check (fusion-tools.ts) apart from the page's first load.
import type { FusionTools } from "./fusion-tools";

export type { FusionTools };

let loading: Promise<FusionTools> | null = null;

/** Loads the tools once; a failed load (no signal, nothing cached) is tried again on the next call. */
export function loadFusionTools(): Promise<FusionTools> {
  loading ??= import("./fusion-tools").then(
    (m) => m.fusionTools,
    (error: unknown) => {
      loading = null;
      throw error;
    },
  );
  return loading;
}
