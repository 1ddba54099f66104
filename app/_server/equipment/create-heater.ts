// Add a heater plate and the audit entry.
import "server-only";
import { insertAuditEntry } from "@/database/queries/audit-log";
import { insertHeater } from "@/database/queries/equipment";
import type { CreateHeaterInput } from "@/domain/equipment/schemas";
import { inAssetTransaction } from "./equipment-checks";

type Ctx = { user: { id: number }; requestId: string };

export async function createHeater(input: CreateHeaterInput, ctx: Ctx): Promise<{ id: number }> {
  return inAssetTransaction(input.assetTag, async (trx) => {
    const id = await insertHeater(input, trx);
    await insertAuditEntry({ actorUserId: ctx.user.id, action: "heater-added", entityType: "heater-plate", entityId: id, details: { ...input }, requestId: ctx.requestId }, trx);
    return { id };
  });
}
