// The Register's filter choices (every job, fuser and machine by name): the same for every
// request, read once and kept for REGISTER_OPTIONS_TTL_MS. Creating or editing a job, a person
// or a machine clears them on this instance (the use cases in app/_server/jobs, crew and
// equipment call registerFilterOptionsChanged after their transaction).
import "server-only";
import { listRegisterFilterOptions, type RegisterFilterOptions } from "@/database/queries/register";
import { cachedValue } from "@/app/_server/cache";

/** How long another instance's change (or one made outside the app) may take to show in the choices. */
export const REGISTER_OPTIONS_TTL_MS = 30_000;

const options = cachedValue("register-filter-options", () => listRegisterFilterOptions(), { ttlMs: REGISTER_OPTIONS_TTL_MS });

export function registerFilterOptions(): Promise<RegisterFilterOptions> {
  return options.get();
}

/** A job, person or machine was added or changed: the next Register page reads the choices again. */
export function registerFilterOptionsChanged(): void {
  options.clear();
}
