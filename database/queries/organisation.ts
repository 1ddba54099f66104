// The organisation's settings row (id 1). Returns what is stored; the fallback for a zone
// not chosen yet (the server's zone, else UTC) is the server layer's.
import { conn, type Db } from "../client";
import type { OrganisationSettingsRow } from "../tables";

export type OrganisationSettings = { timeZone: string | null; updatedBy: number | null; updatedAt: Date | null };

export async function findOrganisationSettings(_: Record<string, never> = {}, trx?: Db): Promise<OrganisationSettings> {
  const row = (await conn(trx)("organisation_settings").where({ id: 1 }).first()) as OrganisationSettingsRow | undefined;
  return row ? { timeZone: row.time_zone, updatedBy: row.updated_by, updatedAt: row.updated_at } : { timeZone: null, updatedBy: null, updatedAt: null };
}

/** Locks the settings row (creating it first if absent) so a change reads the value it replaces. */
export async function lockOrganisationSettings(_: Record<string, never> = {}, trx?: Db): Promise<OrganisationSettings> {
  await conn(trx).raw("INSERT IGNORE INTO organisation_settings (id, time_zone) VALUES (1, NULL)");
  const row = (await conn(trx)("organisation_settings").where({ id: 1 }).forUpdate().first()) as OrganisationSettingsRow;
  return { timeZone: row.time_zone, updatedBy: row.updated_by, updatedAt: row.updated_at };
}

export async function updateOrganisationTimeZone({ timeZone, updatedBy }: { timeZone: string; updatedBy: number }, trx?: Db): Promise<void> {
  await conn(trx)("organisation_settings")
    .insert({ id: 1, time_zone: timeZone, updated_by: updatedBy })
    .onConflict("id")
    .merge({ time_zone: timeZone, updated_by: updatedBy, updated_at: conn(trx).raw("CURRENT_TIMESTAMP(3)") });
}
