// The organisation's time zone: the admin's choice, or — until one is made — the server's
// own zone (Intl's resolved zone), or UTC when that is unknown. Screens, day filters,
// mail texts and exports all read it here.
// Read on nearly every screen and API answer but changed perhaps once, so the stored row is
// kept in this process (app/_server/cache.ts): an admin's change through
// setOrganisationTimeZone is seen at once on this instance; another instance of the app
// sees it within SETTINGS_TTL_MS.
import "server-only";
import { findOrganisationSettings, type OrganisationSettings } from "@/database/queries/organisation";
import { cachedValue } from "../cache";
import type { Db } from "@/database/client";
import { defaultTimeZone, isTimeZone } from "@/domain/dates/zone";

/** The server's own zone (read here, outside domain/, which never reads the machine's settings). */
export function serverTimeZone(): string {
  return defaultTimeZone(Intl.DateTimeFormat().resolvedOptions().timeZone);
}

/** How long another instance may go on using a zone an admin changed elsewhere. */
export const SETTINGS_TTL_MS = 5_000;

type ZoneInForce = { timeZone: string; isChosen: boolean };

function zoneInForce(settings: OrganisationSettings): ZoneInForce {
  // A stored zone the runtime no longer knows (a renamed IANA zone) falls back rather than breaking every screen.
  if (settings.timeZone && isTimeZone(settings.timeZone)) return Object.freeze({ timeZone: settings.timeZone, isChosen: true });
  return Object.freeze({ timeZone: serverTimeZone(), isChosen: false });
}

const zoneCache = cachedValue("organisation-time-zone", async () => zoneInForce(await findOrganisationSettings({})), { ttlMs: SETTINGS_TTL_MS });

/** Drops this process's copy of the settings (after a change is committed; tests that write the row directly). */
export function forgetOrganisationSettings(): void {
  zoneCache.clear();
}

/**
 * The zone in force and whether an admin chose it (false: the server's default). Inside a
 * transaction (`trx`) the kept copy is used as well; only when there is none is the row
 * read through the transaction (not through a second connection of the pool, and not kept).
 */
export async function getOrganisationTimeZone(trx?: Db): Promise<ZoneInForce> {
  if (!trx) return zoneCache.get();
  return (await zoneCache.peek()) ?? zoneInForce(await findOrganisationSettings({}, trx));
}

/** Just the zone name. */
export async function organisationTimeZone(trx?: Db): Promise<string> {
  return (await getOrganisationTimeZone(trx)).timeZone;
}
