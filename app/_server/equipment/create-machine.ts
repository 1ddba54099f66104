// Add a fusion machine (with its total effective piston area) and the audit entry.
import "server-only";
import { registerFilterOptionsChanged } from "@/app/_server/reference/register-filter-options";
import { insertAuditEntry } from "@/database/queries/audit-log";
import { insertMachine } from "@/database/queries/equipment";
import type { CreateMachineInput } from "@/domain/equipment/schemas";
import { inAssetTransaction, machineFields } from "./equipment-checks";

type Ctx = { user: { id: number }; requestId: string };

export async function createMachine(input: CreateMachineInput, ctx: Ctx): Promise<{ id: number }> {
  const created = await inAssetTransaction(input.assetTag, async (trx) => {
    const fields = machineFields(input);
    const id = await insertMachine(fields, trx);
    await insertAuditEntry({ actorUserId: ctx.user.id, action: "machine-added", entityType: "fusion-machine", entityId: id, details: { ...fields, enteredIn: input.units }, requestId: ctx.requestId }, trx);
    return { id };
  });
  registerFilterOptionsChanged();
  return created;
}
