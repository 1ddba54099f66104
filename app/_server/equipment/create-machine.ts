// Add a fusion machine (with its total effective piston area) and the audit entry.
import "server-only";
import { db, isDuplicateKey } from "@/database/client";
import { insertAuditEntry } from "@/database/queries/audit-log";
import { insertMachine } from "@/database/queries/equipment";
import type { CreateMachineInput } from "@/domain/equipment/schemas";
import { takenTag, machineFields } from "./equipment-checks";

type Ctx = { user: { id: number }; requestId: string };

export async function createMachine(input: CreateMachineInput, ctx: Ctx): Promise<{ id: number }> {
  try {
    return await db().transaction(async (trx) => {
      const fields = machineFields(input);
      const id = await insertMachine(fields, trx);
      await insertAuditEntry({ actorUserId: ctx.user.id, action: "machine-added", entityType: "fusion-machine", entityId: id, details: { ...fields, enteredIn: input.units }, requestId: ctx.requestId }, trx);
      return { id };
    });
  } catch (error) {
    if (isDuplicateKey(error)) throw takenTag(input.assetTag);
    throw error;
  }
}
