// The audit log: who did what, when, to which record. Append-only: there is no update or
// delete function, and the application's database user has no DELETE right on the table.
import { conn, type Db } from "../client";
import type { AuditLogRow } from "../tables";

export type AuditEntry = {
  id: number;
  at: Date;
  actorUserId: number | null;
  action: string;
  entityType: string;
  entityId: string | null;
  details: Record<string, unknown> | null;
  requestId: string | null;
};

export async function insertAuditEntry(
  entry: { actorUserId: number | null; action: string; entityType: string; entityId?: string | number | null; details?: Record<string, unknown>; requestId?: string | null },
  trx?: Db,
): Promise<void> {
  await conn(trx)("audit_log").insert({
    actor_user_id: entry.actorUserId,
    action: entry.action,
    entity_type: entry.entityType,
    entity_id: entry.entityId == null ? null : String(entry.entityId),
    details: entry.details ? JSON.stringify(entry.details) : null,
    request_id: entry.requestId ?? null,
  });
}

export async function listAuditEntries(
  { entityType, entityId, action, limit = 100 }: { entityType?: string; entityId?: string | number; action?: string; limit?: number },
  trx?: Db,
): Promise<AuditEntry[]> {
  const q = conn(trx)("audit_log").orderBy("id", "desc").limit(limit);
  if (entityType) q.where("entity_type", entityType);
  if (entityId != null) q.where("entity_id", String(entityId));
  if (action) q.where("action", action);
  const rows = (await q) as AuditLogRow[];
  return rows.map((r) => ({
    id: Number(r.id),
    at: r.at,
    actorUserId: r.actor_user_id ?? null,
    action: r.action,
    entityType: r.entity_type,
    entityId: r.entity_id ?? null,
    details: r.details ? (JSON.parse(r.details) as AuditEntry["details"]) : null,
    requestId: r.request_id ?? null,
  }));
}
