import { headers } from "next/headers";
import Link from "next/link";
import { notFound } from "next/navigation";
import { requireUser } from "@/app/_lib/page-guard";
import { CoilStatusBadge } from "@/components/ui/badges";
import { Cautions } from "@/components/ui/caution";
import { FactBlock, FactList } from "@/components/ui/fact-list";
import { formatInstant } from "@/components/ui/display-format";
import { organisationTimeZone } from "@/app/_server/organisation/get-time-zone";
import { TimeDisplay } from "@/components/ui/time-display";
import { findCoilByCode, listCoilEvents, listCoilMoveOptions } from "@/database/queries/coils";
import { listAuditEntries } from "@/database/queries/audit-log";
import { listJointsForCoil } from "@/database/queries/trace";
import { COIL_STATUS_LABELS } from "@/domain/coils/statuses";
import { DAMAGE_LABELS, statusMovesFrom } from "@/domain/coils/life";
import { describeSize } from "@/domain/labels/label";
import { bendRatio, minimumBendRadiusMm } from "@/domain/pipe/bending";
import { can } from "@/domain/roles";
import { formatQuantity, type UnitSystem } from "@/domain/units/format";
import { publicBaseUrl } from "@/app/_server/labels/base-url";
import { coilLabelSvg, stockOrDefault } from "@/app/_server/labels/render";
import { MoveCoilForm } from "../_components/move-coil-form";
import { NextRunCheck } from "../_components/next-run-check";
import { SectionCard } from "@/components/ui/section-card";
import { LabelDownloadButton } from "../_components/label-download";

export const dynamic = "force-dynamic";

function bendCaution(coil: { outsideDiameterMm: number; sdr: number }, system: UnitSystem): string {
  try {
    const radiusMm = minimumBendRadiusMm(coil);
    const shown = formatQuantity(radiusMm / 1000, "length-m", system, { decimals: system === "si" ? 2 : 1 });
    return `Do not bend this pipe tighter than a ${shown} radius (${bendRatio(coil.sdr)} × OD for DR ${coil.sdr}; 100 × OD with a fitting or flange in the bend). Source: PPI Handbook of PE Pipe, minimum bend ratios.`;
  } catch (error) {
    return `No minimum bend radius on file for DR ${coil.sdr}: ${(error as Error).message}. Ask the pipe maker before bending.`;
  }
}

// The coil page: what the label's QR opens. For a fuser, "Use as side A/B" opens Trench
// with this coil on that side. Facts, length left, bending caution, status moves, history.
/** The `[code]` segment as typed: a stray "%" that is not an escape is kept as it is (no URIError, no 500). */
function decodedSegment(code: string): string {
  try {
    return decodeURIComponent(code);
  } catch {
    return code;
  }
}

export default async function CoilPage({ params, searchParams }: { params: Promise<{ code: string }>; searchParams: Promise<Record<string, string | undefined>> }) {
  const user = await requireUser(); // any signed-in person may open a coil (as GET /api/v1/coils/:id)
  const timeZone = await organisationTimeZone();
  const { code } = await params;
  const query = await searchParams;
  const coil = await findCoilByCode({ coilCode: decodedSegment(code) });
  if (!coil) notFound();
  const canMove = can(user, "moveCoils");
  const canTrace = can(user, "traceLots");
  const [events, joints, options, receipt] = await Promise.all([
    listCoilEvents({ coilId: coil.id }),
    listJointsForCoil({ coilId: coil.id, limit: 100 }),
    canMove ? listCoilMoveOptions() : Promise.resolve(null),
    coil.traceCodeFlags.length ? listAuditEntries({ entityType: "coil", entityId: coil.id, action: "coil-received", limit: 1 }) : Promise.resolve([]),
  ]);
  // Why the coil was saved although it disagrees with its code: kept in the receipt's audit entry.
  const disagreementReason = typeof receipt[0]?.details?.disagreementReason === "string" ? receipt[0].details.disagreementReason : null;
  const system = user.unitSystem;
  const m = (value: number) => formatQuantity(value, "length-m", system);
  const stock = stockOrDefault(null, system);
  const label = coilLabelSvg(coil, { baseUrl: publicBaseUrl(await headers()), stock, system, standalone: false });
  const usedPct = coil.lengthM > 0 ? Math.min(100, Math.max(0, (coil.remainingM / coil.lengthM) * 100)) : 0;

  return (
    <div className="flex flex-col gap-6">
      <p>
        <Link href={can(user, "listCoils") ? "/coils" : "/"} className="font-semibold text-brand underline">
          ← {can(user, "listCoils") ? "All coils" : "Today"}
        </Link>
      </p>
      <div className="flex flex-wrap items-center gap-3">
        <h1 className="text-2xl font-bold">Coil {coil.coilCode}</h1>
        <CoilStatusBadge status={coil.status} />
      </div>
      {can(user, "recordJoint") ? (
        <nav aria-label="Record a joint with this coil" className="flex flex-wrap gap-2">
          {(["A", "B"] as const).map((side) => (
            <Link key={side} href={`/trench?side${side}=${encodeURIComponent(coil.coilCode)}`} className="inline-flex min-h-12 flex-1 items-center justify-center rounded-md bg-brand px-4 text-lg font-semibold text-white hover:bg-brand-dark">
              Use as side {side}
            </Link>
          ))}
        </nav>
      ) : null}
      {query.received ? (
        <p role="status" className="rounded-md border-2 border-pass bg-pass-light p-3 font-semibold text-pass">
          Coil {coil.coilCode} received{coil.status === "quarantined" ? " and quarantined (failed receipt inspection)" : " into the yard"}.
        </p>
      ) : null}
      {coil.status === "quarantined" ? (
        <div role="alert" className="rounded-md border-4 border-fail bg-fail-light p-4 text-fail">
          <p className="text-2xl font-extrabold uppercase tracking-wide">Quarantined: do not use</p>
          <p className="font-semibold">Pipe from this coil must not be laid. Reason: {coil.statusReason ?? "no reason recorded"}.</p>
        </div>
      ) : null}
      {coil.traceCodeFlags.length ? (
        <div role="alert" className="rounded-md border-2 border-caution bg-caution-light p-3 text-caution">
          <p className="font-bold">The traceability code disagrees with the fields typed at receipt:</p>
          <ul className="list-disc pl-5">
            {coil.traceCodeFlags.map((f) => (
              <li key={`${f.field}-${f.message}`}>{f.message}</li>
            ))}
          </ul>
          {disagreementReason ? <p className="mt-1">Saved as it is because: “{disagreementReason}”</p> : null}
        </div>
      ) : null}

      <SectionCard id="facts" title="Pipe" tone="card" isCompact>
        <FactList layout="stacked" columns={3} className="gap-3">
          <FactBlock term="Size">{describeSize(coil)}</FactBlock>
          <FactBlock term="Outside diameter">{formatQuantity(coil.outsideDiameterMm, "length-mm", system)}</FactBlock>
          <FactBlock term="Material">{coil.material}</FactBlock>
          <FactBlock term="Pipe maker">
            {coil.manufacturer}
            {coil.manufacturerCode ? ` (${coil.manufacturerCode})` : ""}
          </FactBlock>
          <FactBlock term="Lot">{coil.lot}</FactBlock>
          <FactBlock term="Production date">{coil.productionDate ?? "not recorded"}</FactBlock>
          <FactBlock term="Traceability code">{coil.traceCode ? <code>{coil.traceCode}</code> : "none"}</FactBlock>
          <FactBlock term="Crew and trailer">{coil.crewName ? `${coil.crewName}${coil.trailer ? ` — ${coil.trailer}` : ""}` : "—"}</FactBlock>
          <FactBlock term="Job">{coil.jobCode ? `${coil.jobCode} — ${coil.jobName}` : "—"}</FactBlock>
        </FactList>
        {coil.printLine ? (
          <p className="mt-3 text-sm">
            Print line: <span className="font-mono">{coil.printLine}</span>
          </p>
        ) : null}
      </SectionCard>

      <SectionCard id="left" title="Length left" tone="card" isCompact>
        <p className="text-xl font-bold">
          {m(coil.remainingM)} left of {m(coil.lengthM)}
        </p>
        <div className="my-2 h-4 w-full max-w-md rounded bg-slate-200" role="img" aria-label={`${Math.round(usedPct)} % of the coil is left`}>
          <div className="h-4 rounded bg-brand" style={{ width: `${usedPct}%` }} />
        </div>
        <NextRunCheck coilCode={coil.coilCode} remainingM={coil.remainingM} unitSystem={system} />
      </SectionCard>

      <SectionCard id="handling" title="Handling" isCompact className="flex flex-col gap-2">
        <p className="rounded-md border-2 border-caution bg-caution-light p-3 font-semibold text-caution">Bending: {bendCaution(coil, system)}</p>
        <Cautions kinds={["coil", "static"]} title="Before you cut the bands" />
      </SectionCard>

      <SectionCard id="inspection" title="Receipt inspection" tone="card" isCompact>
        <FactList layout="stacked" columns={3} className="gap-3">
          <FactBlock term="Result">{coil.inspection.passed ? "Passed" : "Failed"}</FactBlock>
          <FactBlock term="Damage">{coil.inspection.damageKinds.length ? coil.inspection.damageKinds.map((k) => DAMAGE_LABELS[k]).join(", ") : "none found"}</FactBlock>
          <FactBlock term="Deepest gouge">
            {coil.inspection.gougeDepthMm != null ? `${formatQuantity(coil.inspection.gougeDepthMm, "length-mm", system)}${coil.inspection.gougeLimitPct != null ? ` (limit ${coil.inspection.gougeLimitPct} % of wall)` : ""}` : "not measured"}
          </FactBlock>
          <FactBlock term="Ovality at the end">
            {coil.inspection.ovalityPct != null ? `${coil.inspection.ovalityPct} %${coil.inspection.ovalityLimitPct != null ? ` (limit ${coil.inspection.ovalityLimitPct} %)` : ""}` : "not measured"}
          </FactBlock>
          <FactBlock term="End caps">{coil.inspection.endCapsInPlace ? "in place" : "missing"}</FactBlock>
          <FactBlock term="Received">
            <TimeDisplay at={coil.inspection.receivedAt} />
            {coil.inspection.receivedByName ? ` by ${coil.inspection.receivedByName}` : ""}
          </FactBlock>
        </FactList>
        {coil.inspection.damageNotes ? <p className="mt-2">Notes: {coil.inspection.damageNotes}</p> : null}
      </SectionCard>

      {canMove && options ? (
        <SectionCard id="move" title="Move coil" isCompact className="max-w-xl rounded-md border-2 border-slate-300 bg-white p-4">
          <MoveCoilForm coil={coil} moves={statusMovesFrom(coil.status)} crews={options.crews} jobs={options.jobs} />
        </SectionCard>
      ) : null}

      {can(user, "printLabels") ? (
        <SectionCard id="label" title="Label" tone="card" isCompact>
          <div className="max-w-md border border-slate-300" dangerouslySetInnerHTML={{ __html: label.svg }} />
          <p className="mt-2 text-sm">
            The QR opens <span className="font-mono">{label.url}</span>. {coil.labelPrintedAt ? `Label last printed ${formatInstant(coil.labelPrintedAt, "date", timeZone)}.` : "The label has not been printed yet."}
          </p>
          <div className="mt-3 flex flex-wrap gap-2">
            <Link href={`/labels?kind=coil&ids=${coil.id}`} className="inline-flex min-h-touch items-center rounded-md bg-brand px-4 font-semibold text-white hover:bg-brand-dark">
              Print label
            </Link>
            <LabelDownloadButton coilId={coil.id} format="png" />
            <LabelDownloadButton coilId={coil.id} format="svg" />
            {canTrace ? (
              <Link href={`/trace?code=${encodeURIComponent(coil.coilCode)}`} className="inline-flex min-h-touch items-center rounded-md border-2 border-brand bg-white px-4 font-semibold text-brand">
                Trace this lot
              </Link>
            ) : null}
          </div>
        </SectionCard>
      ) : null}

      <SectionCard id="joints" title={<>Joints made with this coil ({joints.length}
          {joints.length === 100 ? "+" : ""})</>} tone="card" isCompact>
        {joints.length ? (
          <ul className="flex flex-col gap-1">
            {joints.map((j) => (
              <li key={j.id}>
                {canTrace ? (
                  <Link href={`/trace/joints/${j.id}`} className="text-brand underline">
                    {j.jobCode} joint {j.jointNo}
                  </Link>
                ) : (
                  `${j.jobCode} joint ${j.jointNo}`
                )}{" "}
                · <TimeDisplay at={j.madeAt} precision="date" /> · {j.station ?? "no station"} · {j.fuserName} · {j.outcome === "within-limits" ? "within limits" : "out of limits"}
                {j.side === "a" && j.lengthAM != null ? ` · ${m(j.lengthAM)} laid` : j.side === "b" && j.lengthBM != null ? ` · ${m(j.lengthBM)} laid` : ""}
              </li>
            ))}
          </ul>
        ) : (
          <p>No joints yet.</p>
        )}
      </SectionCard>

      <SectionCard id="history" title="History" tone="card" isCompact>
        <ol className="flex flex-col gap-1">
          {events.map((e) => (
            <li key={e.id}>
              <span className="font-semibold">
                <TimeDisplay at={e.at} />
              </span> · {e.fromStatus ? `${COIL_STATUS_LABELS[e.fromStatus]} → ` : ""}
              {COIL_STATUS_LABELS[e.toStatus]}
              {e.pullM != null ? ` · pulled ${m(e.pullM)}${e.jointNo != null ? ` for ${e.jobCode ?? "job"} joint ${e.jointNo}` : ""}` : ""}
              {e.remainingM != null ? ` · ${m(e.remainingM)} left` : ""}
              {e.reason && e.pullM == null ? ` · ${e.reason}` : ""}
              {e.crewName ? ` · ${e.crewName}` : ""}
              {e.byUserName ? ` · by ${e.byUserName}` : ""}
            </li>
          ))}
        </ol>
      </SectionCard>
    </div>
  );
}
