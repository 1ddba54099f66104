import { headers } from "next/headers";
import Link from "next/link";
import { notFound } from "next/navigation";
import { requireUser } from "@/app/_lib/page-guard";
import { findCoilById, type Coil } from "@/database/queries/coils";
import { findJointLabelFacts } from "@/database/queries/trace";
import { can } from "@/domain/roles";
import { LABEL_STOCKS, SHEETS, SHEET_IDS, labelPaperFor, layoutSheet, placeLabels, type SheetId } from "@/domain/labels/sheets";
import { QUARANTINED_LABEL_WARNING } from "@/domain/labels/label";
import { publicBaseUrl } from "@/app/_server/labels/base-url";
import { coilLabelSvg, jointLabelSvg, stockOrDefault } from "@/app/_server/labels/render";
import { organisationTimeZone } from "@/app/_server/organisation/get-time-zone";
import { PrintLabelsButton } from "./_components/print-button";
import { FieldShell } from "@/components/form/field-shell";
import { parseDecimal, parseId } from "@/domain/form-fields";

export const dynamic = "force-dynamic";

const MAX_LABELS = 500;

function idsFrom(value: string | string[] | undefined, kind: "coil" | "joint"): number[] {
  const parts = (Array.isArray(value) ? value : [value ?? ""]).flatMap((v) => v.split(","));
  return [...new Set(parts.map((p) => parseId(p, kind === "joint" ? "bigint" : "int")).filter((n): n is number => n !== null))].slice(0, MAX_LABELS);
}

// Label print page: coil labels or joint tags laid out on A4 or US Letter label sheets.
export default async function LabelsPage({ searchParams }: { searchParams: Promise<Record<string, string | string[] | undefined>> }) {
  const user = await requireUser("printJointLabels");
  const params = await searchParams;
  const kind = params.kind === "joint" ? "joint" : "coil";
  if (kind === "coil" && !can(user, "printLabels")) notFound();
  const ids = idsFrom(params.ids, kind);
  const system = user.unitSystem;
  const stock = stockOrDefault(typeof params.stock === "string" ? params.stock : null, system);
  // Paper: as chosen, else the organisation's (Letter in the US, A4 elsewhere); a chosen label size brings its own sheet.
  const sheetId: SheetId = SHEET_IDS.includes(params.sheet as SheetId) ? (params.sheet as SheetId) : typeof params.stock === "string" ? stock.usualSheet : labelPaperFor({ unitSystem: system });
  const sheet = SHEETS[sheetId];

  const baseUrl = publicBaseUrl(await headers());

  let labels: { key: string; svg: string; name: string }[] = [];
  let coilIds: number[] = [];
  let quarantined: string[] = [];
  if (kind === "coil") {
    const coils = (await Promise.all(ids.map((id) => findCoilById({ id })))).filter((c): c is Coil => c !== null);
    coilIds = coils.map((c) => c.id);
    quarantined = coils.filter((c) => c.status === "quarantined").map((c) => c.coilCode);
    labels = coils.map((c) => ({ key: `c${c.id}`, ...coilLabelSvg(c, { baseUrl, stock, system, standalone: false }) }));
  } else {
    const [joints, timeZone] = await Promise.all([findJointLabelFacts({ jointIds: ids }), organisationTimeZone()]);
    labels = joints.map((j) => ({ key: `j${j.id}`, ...jointLabelSvg(j, { baseUrl, stock, timeZone, standalone: false }) }));
  }
  const layout = layoutSheet(sheet, stock);
  // Labels already used on the first sheet: a whole number below the sheet's count; anything else is refused with a message and taken as 0.
  const skipText = typeof params.skip === "string" ? params.skip.trim() : "";
  const skipNumber = skipText === "" ? 0 : parseDecimal(skipText);
  const skipOk = Number.isInteger(skipNumber) && skipNumber >= 0 && skipNumber < Math.max(1, layout.perSheet);
  const skip = skipOk ? skipNumber : 0;
  const placed = placeLabels(layout, labels.length, skip);
  const pages = Array.from({ length: placed.pages }, (_, page) => placed.slots.filter((s) => s.page === page));
  const mm = (n: number) => `${n.toFixed(2)}mm`;

  return (
    <div className="flex flex-col gap-4">
      <style>{`
        @page { size: ${sheet.cssSize}; margin: 0; }
        @media print {
          main { padding: 0 !important; max-width: none !important; }
          .label-sheet { border: none !important; margin: 0 !important; box-shadow: none !important; break-after: page; }
          .label-sheet:last-child { break-after: auto; }
          .label-slot { outline: none !important; }
        }
      `}</style>
      <div className="no-print flex flex-col gap-4">
        <p>
          <Link href={kind === "coil" ? "/coils" : "/trace"} className="font-semibold text-brand underline">
            ← {kind === "coil" ? "All coils" : "Trace"}
          </Link>
        </p>
        <h1 className="text-2xl font-bold">{kind === "coil" ? "Coil labels" : "Joint tags"}</h1>
        <form method="get" action="/labels" className="flex flex-wrap items-end gap-3">
          <input type="hidden" name="kind" value={kind} />
          <input type="hidden" name="ids" value={ids.join(",")} />
          <FieldShell id="sheet" label="Paper">
            {(control) => (
              <select {...control} name="sheet" defaultValue={sheetId} className="min-h-touch rounded-md border-2 border-slate-400 bg-white px-3">
                {SHEET_IDS.map((id) => (
                  <option key={id} value={id}>
                    {SHEETS[id].label}
                  </option>
                ))}
              </select>
            )}
          </FieldShell>
          <FieldShell id="stock" label="Label size">
            {(control) => (
              <select {...control} name="stock" defaultValue={stock.id} className="min-h-touch rounded-md border-2 border-slate-400 bg-white px-3">
                {LABEL_STOCKS.map((s) => (
                  <option key={s.id} value={s.id}>
                    {s.label}
                  </option>
                ))}
              </select>
            )}
          </FieldShell>
          <FieldShell id="skip" label="Labels already used on the first sheet">
            {(control) => <input {...control} name="skip" inputMode="numeric" defaultValue={skip} className="min-h-touch w-24 rounded-md border-2 border-slate-400 bg-white px-3" />}
          </FieldShell>
          <button type="submit" className="min-h-touch rounded-md border-2 border-brand bg-white px-4 font-semibold text-brand">
            Lay out labels
          </button>
        </form>
        <p>
          {labels.length} label{labels.length === 1 ? "" : "s"} on {placed.pages} sheet{placed.pages === 1 ? "" : "s"} of {sheet.label}: {layout.columns} × {layout.rows} = {layout.perSheet} a sheet. Print at 100 % (no “fit to page”).
        </p>
        {quarantined.length ? (
          <p role="alert" className="rounded-md border-4 border-fail bg-fail-light p-3 font-bold text-fail">
            Quarantined: {quarantined.join(", ")}. {quarantined.length === 1 ? "Its label says" : "Their labels say"} “{QUARANTINED_LABEL_WARNING}”; pipe from {quarantined.length === 1 ? "it" : "them"} must not be laid.
          </p>
        ) : null}
        {skipOk ? null : (
          <p role="alert">
            Labels already used on the first sheet must be a whole number from 0 to {Math.max(0, layout.perSheet - 1)}; laid out from the first label.
          </p>
        )}
        {layout.perSheet === 0 ? <p role="alert">This label size does not fit on {sheet.label}.</p> : null}
        {labels.length === 0 ? (
          <p role="alert">No labels to print: choose {kind === "coil" ? "coils on the Coils screen" : "joints on the Trace screen"}.</p>
        ) : (
          <div className="max-w-xs">
            <PrintLabelsButton coilIds={coilIds} count={labels.length} />
          </div>
        )}
      </div>
      <div aria-label="Label sheets" className="flex flex-col gap-6 overflow-x-auto">
        {pages.map((slots, page) => (
          <div key={page} className="label-sheet relative mx-auto border-2 border-slate-300 bg-white shadow" style={{ width: mm(sheet.widthMm), height: mm(sheet.heightMm) }} aria-label={`Sheet ${page + 1}`}>
            {slots.map((slot) => {
              const label = labels[slot.item]!;
              return (
                <div
                  key={label.key}
                  className="label-slot absolute overflow-hidden outline outline-1 outline-dashed outline-slate-300"
                  style={{ left: mm(slot.xMm), top: mm(slot.yMm), width: mm(stock.widthMm), height: mm(stock.heightMm) }}
                  aria-label={`Label ${label.name}`}
                  dangerouslySetInnerHTML={{ __html: label.svg }}
                />
              );
            })}
          </div>
        ))}
      </div>
    </div>
  );
}
