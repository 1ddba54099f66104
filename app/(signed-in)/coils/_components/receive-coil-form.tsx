"use client";
// Receive a coil. Typing or scanning the ASTM F2897 code fills the empty fields it encodes;
// where a typed field disagrees with the code, the disagreement is shown beside the field
// (and kept on the coil). The receipt inspection shows its verdict before saving.
import { zodResolver } from "@hookform/resolvers/zod";
import { useRouter } from "next/navigation";
import { useCallback, useMemo, useRef, useState } from "react";
import { useForm, useWatch } from "react-hook-form";
import type { z } from "zod";
import { Field, FormMessage } from "@/components/form/field";
import { Button } from "@/components/ui/button";
import { DAMAGE_KINDS, DAMAGE_LABELS, DEFAULT_GOUGE_LIMIT_PCT, DEFAULT_OVALITY_LIMIT_PCT, codeFillFrom, fieldsFromTraceCode, judgeReceiptInspection, refillFromTraceCode, traceCodeDisagreements, type CodeFill, type CodeFilledField, type DamageKind } from "@/domain/coils/life";
import { RECEIVE_COIL_LABELS as LABELS, receiveCoilSchema } from "@/domain/coils/schemas";
import { PIPE_SERIES, findPipeSize, pipeSizes, type PipeSeries } from "@/domain/pipe/catalogue";
import { parseTraceCode } from "@/domain/trace-code/trace-code";
import { fromDisplay, type UnitSystem } from "@/domain/units/format";
import { receiveCoilAction } from "../actions";
import { CameraScanner } from "@/components/ui/camera-scanner";
import { FieldShell } from "@/components/form/field-shell";

type Input = z.input<typeof receiveCoilSchema>;
type Output = z.output<typeof receiveCoilSchema>;

const SERIES_NAMES: Record<PipeSeries, string> = { ips: "IPS (iron pipe size)", cts: "CTS (copper tube size)", metric: "Metric (ISO)" };

/** The fields a code fills, in the order they are set (series before the size it lists). */
const CODE_FIELDS: readonly CodeFilledField[] = ["manufacturerCode", "manufacturer", "lot", "productionDate", "material", "series", "nominalSize", "sdr"];
const SIZE_DEFAULTS: CodeFill = { series: "ips", nominalSize: "2" };

/** "Lot, Material designation and SDR (DR)". */
function listLabels(fields: readonly CodeFilledField[]): string {
  const names = fields.map((f) => LABELS[f]);
  return names.length > 1 ? `${names.slice(0, -1).join(", ")} and ${names[names.length - 1]}` : (names[0] ?? "");
}

export function ReceiveCoilForm({
  suggestedCode,
  manufacturers,
  materials,
  unitSystem,
}: {
  suggestedCode: string;
  manufacturers: { name: string; code: string | null }[];
  materials: readonly string[];
  unitSystem: UnitSystem;
}) {
  const router = useRouter();
  const [message, setMessage] = useState<string | null>(null);
  const [codeNote, setCodeNote] = useState<{ filled: CodeFilledField[]; cleared: CodeFilledField[] } | null>(null);
  // What the current code put in each field, so a corrected code refills them (and only them).
  const codeFill = useRef<CodeFill>({});
  const [scanning, setScanning] = useState(false);
  const smallUnit = unitSystem === "us" ? "in" : "mm";
  const { register, handleSubmit, formState, setValue, getValues, setError, control } = useForm<Input, unknown, Output>({
    resolver: zodResolver(receiveCoilSchema),
    defaultValues: {
      coilCode: suggestedCode,
      series: SIZE_DEFAULTS.series as PipeSeries,
      nominalSize: SIZE_DEFAULTS.nominalSize,
      lengthUnit: unitSystem === "us" ? "ft" : "m",
      smallUnit,
      damageKinds: [],
      endCapsInPlace: true,
      gougeLimitPct: String(DEFAULT_GOUGE_LIMIT_PCT),
      ovalityLimitPct: String(DEFAULT_OVALITY_LIMIT_PCT),
    },
  });
  const values = useWatch({ control });
  const series = (values.series as PipeSeries | undefined) ?? "ips";
  const errors = formState.errors as Record<string, { message?: string } | undefined>;

  const traceCodeText = String(values.traceCode ?? "").trim();
  const flags = useMemo(() => {
    if (!traceCodeText) return [];
    return traceCodeDisagreements(traceCodeText, {
      manufacturerCode: values.manufacturerCode as string | undefined,
      lot: values.lot as string | undefined,
      productionDate: values.productionDate as string | undefined,
      material: values.material as string | undefined,
      series: values.series as PipeSeries | undefined,
      nominalSize: values.nominalSize as string | undefined,
      sdr: Number(values.sdr) || undefined,
    });
  }, [traceCodeText, values.manufacturerCode, values.lot, values.productionDate, values.material, values.series, values.nominalSize, values.sdr]);
  const flagFor = (field: string) => flags.filter((f) => f.field === field).map((f) => f.message).join(" ") || undefined;

  const verdict = useMemo(() => {
    try {
      const size = findPipeSize(series, String(values.nominalSize ?? ""));
      const sdr = Number(String(values.sdr ?? "").replace(",", "."));
      if (!(sdr > 2)) return null;
      const depth = String(values.gougeDepth ?? "").trim();
      return judgeReceiptInspection({
        outsideDiameterMm: size.outsideDiameterMm,
        sdr,
        damageKinds: ((values.damageKinds as DamageKind[] | undefined) ?? []).filter(Boolean),
        gougeDepthMm: depth ? fromDisplay(Number(depth.replace(",", ".")), "length-mm", smallUnit === "in" ? "us" : "si") : null,
        gougeLimitPct: Number(values.gougeLimitPct) || DEFAULT_GOUGE_LIMIT_PCT,
        ovalityPct: String(values.ovalityPct ?? "").trim() ? Number(String(values.ovalityPct).replace(",", ".")) : null,
        ovalityLimitPct: Number(values.ovalityLimitPct) || DEFAULT_OVALITY_LIMIT_PCT,
        endCapsInPlace: Boolean(values.endCapsInPlace),
      });
    } catch {
      return null;
    }
  }, [series, values.nominalSize, values.sdr, values.damageKinds, values.gougeDepth, values.gougeLimitPct, values.ovalityPct, values.ovalityLimitPct, values.endCapsInPlace, smallUnit]);

  /**
   * Fill what the code encodes: empty fields and fields the previous code filled follow the
   * code (a corrected code refills them); fields typed by hand are kept and, where they
   * differ, shown as disagreements that need a reason to save.
   */
  function fillFromCode(text: string) {
    const parsed = parseTraceCode(text.trim());
    if (!parsed.ok) return;
    const fields = fieldsFromTraceCode(parsed.value);
    const known = manufacturers.find((m) => m.code === fields.manufacturerCode);
    const current: CodeFill = Object.fromEntries(CODE_FIELDS.map((f) => [f, String(getValues(f) ?? "")]));
    const refill = refillFromTraceCode({ current, previousFill: codeFill.current, next: codeFillFrom(fields, known?.name), defaults: SIZE_DEFAULTS });
    for (const f of CODE_FIELDS) {
      const value = refill.set[f];
      if (value !== undefined) setValue(f, value as never, { shouldValidate: false, shouldDirty: true });
    }
    codeFill.current = refill.fill;
    setCodeNote(refill.filled.length || refill.cleared.length ? { filled: refill.filled, cleared: refill.cleared } : null);
  }

  const onScanned = useCallback(
    (text: string) => {
      setScanning(false);
      setValue("traceCode", text.trim(), { shouldDirty: true });
      fillFromCode(text);
    },
    // fillFromCode reads the form through getValues/setValue, which are stable.
    // eslint-disable-next-line react-hooks/exhaustive-deps
    [setValue],
  );

  const onSubmit = handleSubmit(async (input) => {
    setMessage(null);
    const result = await receiveCoilAction(input);
    if (result.ok) {
      router.push(`/coils/${encodeURIComponent(result.data.coilCode)}?received=1`);
      return;
    }
    setMessage(result.message);
    for (const [name, messages] of Object.entries(result.fields ?? {})) setError(name as keyof Input, { message: messages[0] });
  });

  const codeField = register("traceCode");
  return (
    <form onSubmit={onSubmit} noValidate className="flex flex-col gap-6">
      <fieldset className="grid gap-4 rounded-md border-2 border-slate-300 bg-white p-4 sm:grid-cols-2">
        <legend className="px-1 text-lg font-bold">Traceability code</legend>
        <Field
          id="traceCode"
          label={LABELS.traceCode}
          hint="Type it or scan it with a barcode scanner; the fields it encodes are filled in."
          autoComplete="off"
          spellCheck={false}
          maxLength={40}
          className="sm:col-span-2"
          {...codeField}
          onChange={(event) => {
            void codeField.onChange(event);
            fillFromCode(event.target.value);
          }}
          error={errors.traceCode?.message ?? (traceCodeText && !parseTraceCode(traceCodeText).ok ? (parseTraceCode(traceCodeText) as { error: string }).error : undefined)}
        />
        <div className="sm:col-span-2">
          {scanning ? (
            <CameraScanner label="Scan the traceability code" instruction="Point the camera at the barcode of the traceability code." fallback="Type the code from the pipe or its tag instead." formats="any" aspect="video" onResult={onScanned} onClose={() => setScanning(false)} />
          ) : (
            <Button type="button" variant="secondary" onClick={() => setScanning(true)}>
              Scan the code with the camera
            </Button>
          )}
        </div>
        {codeNote ? (
          <p role="status" className="text-sm text-brand-dark sm:col-span-2">
            {codeNote.filled.length ? `Filled from the code: ${listLabels(codeNote.filled)}.` : ""}
            {codeNote.filled.length && codeNote.cleared.length ? " " : ""}
            {codeNote.cleared.length ? `Emptied, as the new code does not give ${codeNote.cleared.length === 1 ? "it" : "them"}: ${listLabels(codeNote.cleared)}.` : ""}
          </p>
        ) : null}
        {flags.length > 0 ? (
          <div role="alert" className="rounded-md border-2 border-caution bg-caution-light p-3 text-sm text-caution sm:col-span-2">
            <p className="font-bold">The code disagrees with the typed fields:</p>
            <ul className="list-disc pl-5">
              {flags.map((f) => (
                <li key={`${f.field}-${f.message}`}>{f.message}</li>
              ))}
            </ul>
            <p>Check the print line on the pipe and correct the fields or the code. To save the coil as it is, say why: the reason is kept in the audit log and the coil is flagged.</p>
            <Field id="disagreementReason" label={LABELS.disagreementReason} autoComplete="off" className="mt-2 text-ink" {...register("disagreementReason")} error={errors.disagreementReason?.message} />
          </div>
        ) : null}
      </fieldset>

      <fieldset className="grid gap-4 rounded-md border-2 border-slate-300 bg-white p-4 sm:grid-cols-2">
        <legend className="px-1 text-lg font-bold">Coil</legend>
        <Field id="coilCode" label={LABELS.coilCode} autoComplete="off" {...register("coilCode")} error={errors.coilCode?.message} />
        <Field id="manufacturer" label={LABELS.manufacturer} list="known-manufacturers" autoComplete="off" {...register("manufacturer")} error={errors.manufacturer?.message} />
        <datalist id="known-manufacturers">
          {manufacturers.map((m) => (
            <option key={`${m.name}-${m.code}`} value={m.name} />
          ))}
        </datalist>
        <Field id="manufacturerCode" label={LABELS.manufacturerCode} maxLength={2} autoComplete="off" {...register("manufacturerCode")} error={errors.manufacturerCode?.message ?? flagFor("manufacturerCode")} />
        <Field id="lot" label={LABELS.lot} autoComplete="off" {...register("lot")} error={errors.lot?.message ?? flagFor("lot")} />
        <Field id="productionDate" label={LABELS.productionDate} type="date" {...register("productionDate")} error={errors.productionDate?.message ?? flagFor("productionDate")} />
        <Field id="material" label={LABELS.material} list="pe-materials" autoComplete="off" {...register("material")} error={errors.material?.message ?? flagFor("material")} />
        <datalist id="pe-materials">
          {materials.map((m) => (
            <option key={m} value={m} />
          ))}
        </datalist>
        <FieldShell id="series" label={LABELS.series}>
          {(control) => (
            <select {...control} className="min-h-touch rounded-md border-2 border-slate-400 bg-white px-3" {...register("series")}>
              {PIPE_SERIES.map((s) => (
                <option key={s} value={s}>
                  {SERIES_NAMES[s]}
                </option>
              ))}
            </select>
          )}
        </FieldShell>
        <FieldShell id="nominalSize" label={LABELS.nominalSize} error={errors.nominalSize?.message ?? flagFor("nominalSize")}>
          {(control) => (
            <select {...control} className="min-h-touch rounded-md border-2 border-slate-400 bg-white px-3" {...register("nominalSize")}>
              {pipeSizes(series).map((size) => (
                <option key={size.nominal} value={size.nominal}>
                  {size.label}
                </option>
              ))}
            </select>
          )}
        </FieldShell>
        <Field id="sdr" label={LABELS.sdr} numeric autoComplete="off" {...register("sdr")} error={errors.sdr?.message} />
        <div className="flex items-end gap-2">
          <Field id="length" label={LABELS.length} numeric autoComplete="off" className="flex-1" {...register("length")} error={errors.length?.message} />
          <FieldShell id="lengthUnit" label="Unit">
            {(control) => (
              <select {...control} className="min-h-touch rounded-md border-2 border-slate-400 bg-white px-3" {...register("lengthUnit")}>
                <option value="m">m</option>
                <option value="ft">ft</option>
              </select>
            )}
          </FieldShell>
        </div>
        <Field id="printLine" label={LABELS.printLine} autoComplete="off" className="sm:col-span-2" {...register("printLine")} error={errors.printLine?.message} />
      </fieldset>

      <fieldset className="grid gap-4 rounded-md border-2 border-slate-300 bg-white p-4 sm:grid-cols-2">
        <legend className="px-1 text-lg font-bold">Receipt inspection</legend>
        <fieldset className="sm:col-span-2">
          <legend className="text-sm font-semibold">Damage found</legend>
          <div className="mt-1 flex flex-wrap gap-4">
            {DAMAGE_KINDS.map((kind) => (
              <label key={kind} className="flex min-h-touch items-center gap-2">
                <input type="checkbox" value={kind} className="h-6 w-6" {...register("damageKinds")} />
                {DAMAGE_LABELS[kind]}
              </label>
            ))}
          </div>
        </fieldset>
        <Field id="gougeDepth" label="Deepest gouge" unit={smallUnit} numeric autoComplete="off" {...register("gougeDepth")} error={errors.gougeDepth?.message} />
        <Field id="gougeLimitPct" label="Operator's gouge limit (% of wall)" unit="%" numeric autoComplete="off" {...register("gougeLimitPct")} error={errors.gougeLimitPct?.message} />
        <Field id="ovalityPct" label="Ovality measured at the end" unit="%" numeric autoComplete="off" hint="(largest − smallest diameter) ÷ nominal OD × 100" {...register("ovalityPct")} error={errors.ovalityPct?.message} />
        <Field id="ovalityLimitPct" label="Ovality limit" unit="%" numeric autoComplete="off" {...register("ovalityLimitPct")} error={errors.ovalityLimitPct?.message} />
        <label className="flex min-h-touch items-center gap-2 sm:col-span-2">
          <input type="checkbox" className="h-6 w-6" {...register("endCapsInPlace")} />
          End caps in place on both ends
        </label>
        <Field id="damageNotes" label="Inspection notes" autoComplete="off" className="sm:col-span-2" {...register("damageNotes")} error={errors.damageNotes?.message} />
        <input type="hidden" {...register("smallUnit")} />
        {verdict ? (
          <div role="status" className={`rounded-md border-2 p-3 text-sm sm:col-span-2 ${verdict.passed ? "border-pass bg-pass-light text-pass" : "border-fail bg-fail-light text-fail"}`}>
            {verdict.passed ? (
              <p className="font-semibold">Inspection passes: the coil goes to the yard.</p>
            ) : (
              <>
                <p className="font-semibold">Inspection fails: the coil will be quarantined.</p>
                <ul className="list-disc pl-5">
                  {verdict.reasons.map((r) => (
                    <li key={r}>{r}</li>
                  ))}
                </ul>
              </>
            )}
          </div>
        ) : null}
      </fieldset>

      <FormMessage message={message} />
      <Button type="submit" disabled={formState.isSubmitting}>
        {formState.isSubmitting ? "Receiving …" : "Receive coil"}
      </Button>
    </form>
  );
}
