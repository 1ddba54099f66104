// An admin sets the organisation's time zone: the row and its audit entry in one transaction.
import "server-only";
import { db } from "@/database/client";
import { insertAuditEntry } from "@/database/queries/audit-log";
import { lockOrganisationSettings, updateOrganisationTimeZone } from "@/database/queries/organisation";
import type { z } from "zod";
import type { organisationSettingsSchema } from "@/domain/dates/zone-schema";
import { forgetOrganisationSettings, serverTimeZone } from "./get-time-zone";

type Ctx = { user: { id: number }; requestId: string };

export async function setOrganisationTimeZone(input: z.output<typeof organisationSettingsSchema>, ctx: Ctx): Promise<{ timeZone: string }> {
  try {
    return await changeTimeZone(input, ctx);
  } finally {
    // After the commit (or a rollback): a read from now on loads the row again. Not inside
    // the transaction, where a request in between could reload the old row and keep it.
    forgetOrganisationSettings();
  }
}

function changeTimeZone(input: z.output<typeof organisationSettingsSchema>, ctx: Ctx): Promise<{ timeZone: string }> {
  return db().transaction(async (trx) => {
    const before = await lockOrganisationSettings({}, trx);
    await updateOrganisationTimeZone({ timeZone: input.timeZone, updatedBy: ctx.user.id }, trx);
    await insertAuditEntry(
      {
        actorUserId: ctx.user.id,
        action: "organisation-time-zone-changed",
        entityType: "organisation",
        entityId: 1,
        details: { before: before.timeZone ?? `${serverTimeZone()} (server default)`, after: input.timeZone },
        requestId: ctx.requestId,
      },
      trx,
    );
    return { timeZone: input.timeZone };
  });
}
