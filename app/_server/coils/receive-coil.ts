// Coil use cases: receive (with the receipt inspection and the F2897 cross-check), move to
// another status, mark labels printed. Each is one transaction with its audit entry.
import { db } from "@/database/client";
import { insertAuditEntry } from "@/database/queries/audit-log";
import { insertCoil, lockCoil, markCoilLabelsPrinted, updateCoilStatus, type Coil } from "@/database/queries/coils";
import { judgeReceiptInspection, statusMoveProblem, traceCodeDisagreements } from "@/domain/coil-life/rules";
import type { MoveCoil, ReceiveCoil } from "@/domain/coil-life/schemas";
import { AppError } from "@/domain/result";

type Actor = { user: { id: number }; requestId: string };

export type ReceivedCoil = { id: number; coilCode: string; status: Coil["status"]; inspectionPassed: boolean; reasons: string[]; traceCodeFlags: { field: string; message: string }[] };

/**
 * Receives a coil: judges the receipt inspection (a failed one quarantines the coil with the
 * reasons), cross-checks the F2897 code against the typed fields (disagreements are kept as
 * flags and shown), inserts the coil, its first event and the audit entry in one transaction.
 */
export async function receiveCoil(input: ReceiveCoil, { user, requestId }: Actor): Promise<ReceivedCoil> {
  const verdict = judgeReceiptInspection({
    outsideDiameterMm: input.outsideDiameterMm,
    sdr: input.sdr,
    damageKinds: input.damageKinds,
    gougeDepthMm: input.gougeDepthMm,
    gougeLimitPct: input.gougeLimitPct,
    ovalityPct: input.ovalityPct ?? null,
    ovalityLimitPct: input.ovalityLimitPct,
    endCapsInPlace: input.endCapsInPlace,
  });
  const flags = input.traceCode ? traceCodeDisagreements(input.traceCode, input) : [];
  const quarantineReason = verdict.passed ? null : `Failed receipt inspection: ${verdict.reasons.join("; ")}`.slice(0, 300);
  return db().transaction(async (trx) => {
    const id = await insertCoil(
      {
        coilCode: input.coilCode,
        manufacturer: input.manufacturer,
        manufacturerCode: input.manufacturerCode ?? null,
        lot: input.lot,
        productionDate: input.productionDate ?? null,
        material: input.material,
        series: input.series,
        nominalSize: input.nominalSize,
        outsideDiameterMm: input.outsideDiameterMm,
        sdr: input.sdr,
        lengthM: input.lengthM,
        printLine: input.printLine ?? null,
        traceCode: input.traceCode ?? null,
        traceCodeFlags: flags,
        damageKinds: input.damageKinds,
        damageNotes: input.damageNotes ?? null,
        gougeDepthMm: input.gougeDepthMm,
        gougeLimitPct: input.gougeLimitPct,
        ovalityPct: input.ovalityPct ?? null,
        ovalityLimitPct: input.ovalityLimitPct,
        endCapsInPlace: input.endCapsInPlace,
        inspectionPassed: verdict.passed,
        quarantineReason,
        receivedBy: user.id,
      },
      trx,
    );
    await insertAuditEntry(
      {
        actorUserId: user.id,
        action: "coil-received",
        entityType: "coil",
        entityId: id,
        details: { coilCode: input.coilCode, manufacturer: input.manufacturer, lot: input.lot, lengthM: input.lengthM, inspectionPassed: verdict.passed, reasons: verdict.reasons, traceCodeFlags: flags },
        requestId,
      },
      trx,
    );
    return { id, coilCode: input.coilCode, status: verdict.passed ? "in-yard" : "quarantined", inspectionPassed: verdict.passed, reasons: verdict.reasons, traceCodeFlags: flags };
  });
}

/** Moves a coil to another status under the domain rules, with optimistic locking on its version. */
export async function moveCoil(input: MoveCoil, { user, requestId }: Actor): Promise<{ id: number; coilCode: string; status: Coil["status"] }> {
  return db().transaction(async (trx) => {
    const coil = await lockCoil({ id: input.coilId }, trx);
    if (!coil) throw new AppError("not-found", `Coil ${input.coilId} is not on file.`);
    if (coil.version !== input.version) throw new AppError("conflict", `${coil.coilCode} was changed by someone else since you opened it; reload the page and try again.`);
    const problem = statusMoveProblem({ from: coil.status, to: input.to, reason: input.reason, crewId: input.crewId ?? coil.crewId, jobId: input.jobId ?? coil.jobId });
    if (problem) throw new AppError("invalid", problem.message, { [problem.field]: [problem.message] });
    await updateCoilStatus({ coil, to: input.to, reason: input.reason ?? null, crewId: input.crewId, jobId: input.jobId, userId: user.id }, trx);
    await insertAuditEntry(
      { actorUserId: user.id, action: "coil-status-changed", entityType: "coil", entityId: coil.id, details: { coilCode: coil.coilCode, from: coil.status, to: input.to, reason: input.reason ?? null, crewId: input.crewId ?? null, jobId: input.jobId ?? null }, requestId },
      trx,
    );
    return { id: coil.id, coilCode: coil.coilCode, status: input.to };
  });
}

/** Stamps label_printed_at on the coils whose labels were printed or downloaded. */
export async function markLabelsPrinted(coilIds: number[], how: "print" | "png" | "svg", { user, requestId }: Actor): Promise<number> {
  return db().transaction((trx) => markCoilLabelsPrinted({ coilIds, userId: user.id, requestId, how }, trx));
}
