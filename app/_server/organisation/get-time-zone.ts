// The organisation's time zone: the admin's choice, or — until one is made — the server's
// own zone (Intl's resolved zone), or UTC when that is unknown. Screens, day filters,
// mail texts and exports all read it here.
import "server-only";
import { findOrganisationSettings } from "@/database/queries/organisation";
import type { Db } from "@/database/client";
import { defaultTimeZone, isTimeZone } from "@/domain/dates/zone";

/** The server's own zone (read here, outside domain/, which never reads the machine's settings). */
export function serverTimeZone(): string {
  return defaultTimeZone(Intl.DateTimeFormat().resolvedOptions().timeZone);
}

/** The zone in force and whether an admin chose it (false: the server's default). */
export async function getOrganisationTimeZone(trx?: Db): Promise<{ timeZone: string; isChosen: boolean }> {
  const settings = await findOrganisationSettings({}, trx);
  // A stored zone the runtime no longer knows (a renamed IANA zone) falls back rather than breaking every screen.
  if (settings.timeZone && isTimeZone(settings.timeZone)) return { timeZone: settings.timeZone, isChosen: true };
  return { timeZone: serverTimeZone(), isChosen: false };
}

/** Just the zone name. */
export async function organisationTimeZone(trx?: Db): Promise<string> {
  return (await getOrganisationTimeZone(trx)).timeZone;
}
