"use client";
// The Register screen: the filter form, the grid over the server's keyset pages and the
// export buttons. The URL holds the view (filter + sort): applying a filter or clicking a
// sortable header changes the URL, which a clerk can bookmark or send on.
import { useCallback, useEffect, useMemo, useState } from "react";
import Link from "next/link";
import { useRouter } from "next/navigation";
import { useForm } from "react-hook-form";
import { zodResolver } from "@hookform/resolvers/zod";
import type { ColDef, ICellRendererParams } from "ag-grid-community";
import { KeysetGrid, type GridCount } from "@/components/data-grid/keyset-grid";
import { Button } from "@/components/ui/button";
import { FormMessage } from "@/components/form/field";
import { JOINT_PARAMETERS } from "@/domain/fusion/check";
import {
  FINDING_PARAMETER_LABELS,
  OUTCOME_LABELS,
  REGISTER_COLUMNS,
  REGISTER_OUTCOMES,
  REVIEW_STATES,
  REVIEW_STATE_LABELS,
  columnHeader,
  dayFilterLabels,
  describeRegisterCount,
  describeSort,
  formatCell,
  registerFilterSchema,
  registerRowFromJson,
  viewToSearchParams,
  type RegisterFilter,
  type RegisterRow,
  type RegisterRowJson,
  type RegisterSort,
  type RegisterView,
} from "@/domain/register";
import type { FieldErrors } from "@/domain/result";
import type { UnitSystem } from "@/domain/units";
import { ExportPanel } from "./export-panel";
import { useTimeZone } from "@/components/ui/time-zone";
import { controlBorder, FieldShell } from "@/components/form/field-shell";

type Option = { id: number; label: string };
type Options = { jobs: Option[]; fusers: Option[]; machines: Option[] };

type FormValues = { job: string; from: string; to: string; fuser: string; machine: string; lot: string; outcome: string; review: string; finding: string; q: string };

const EMPTY: FormValues = { job: "", from: "", to: "", fuser: "", machine: "", lot: "", outcome: "", review: "", finding: "", q: "" };

function toForm(view: RegisterView): FormValues {
  const out = { ...EMPTY };
  for (const key of Object.keys(EMPTY) as (keyof FormValues)[]) {
    const v = view[key];
    if (v !== undefined && v !== null) out[key] = String(v);
  }
  return out;
}

const inputClass = "min-h-touch w-full rounded-md border-2 bg-white px-3 py-2 text-base focus:border-brand";

function JointLink(p: ICellRendererParams<RegisterRow>) {
  if (!p.data) return null;
  return (
    <Link href={`/joints/${p.data.id}`} className="font-semibold text-brand underline" aria-label={`Open joint ${p.data.jointNo} of ${p.data.jobCode}`}>
      {p.data.jointNo}
    </Link>
  );
}

export function RegisterScreen({ view, urlErrors, options, unitSystem }: { view: RegisterView; urlErrors: FieldErrors; options: Options; unitSystem: UnitSystem }) {
  const router = useRouter();
  const timeZone = useTimeZone();
  const dayLabels = dayFilterLabels(timeZone);
  const [count, setCount] = useState<GridCount | null>(null);
  const [loadError, setLoadError] = useState<string | null>(null);
  const query = useMemo(() => viewToSearchParams(view).toString(), [view]);

  const form = useForm<FormValues, unknown, RegisterFilter>({
    resolver: zodResolver(registerFilterSchema) as never,
    defaultValues: toForm(view),
  });
  const { register, handleSubmit, reset, formState } = form;
  useEffect(() => {
    reset(toForm(view));
    setCount(null);
  }, [view, reset]);

  // While the count is "about N", ask for the count alone until the server's background
  // count is exact (1 s, then slower, for at most about five minutes).
  const waitingForExact = count !== null && !count.isExact && count.counting;
  useEffect(() => {
    if (!waitingForExact) return;
    let stopped = false;
    let timer: ReturnType<typeof setTimeout> | undefined;
    const ask = async (attempt: number) => {
      if (stopped || attempt > 60) return;
      try {
        const response = await fetch(`/api/v1/register?${query ? `${query}&` : ""}count=only`, { cache: "no-store" });
        if (response.ok) {
          const body = (await response.json()) as { count?: GridCount };
          if (stopped) return;
          if (body.count && (body.count.isExact || !body.count.counting)) return setCount(body.count);
        }
      } catch {
        // Network hiccup: try again on the next tick.
      }
      if (!stopped) timer = setTimeout(() => void ask(attempt + 1), Math.min(1000 + attempt * 500, 10_000));
    };
    timer = setTimeout(() => void ask(0), 1000);
    return () => {
      stopped = true;
      if (timer) clearTimeout(timer);
    };
  }, [waitingForExact, query]);

  const go = useCallback((next: Partial<RegisterView>) => router.push(`/register${viewToSearchParams(next).toString() ? `?${viewToSearchParams(next).toString()}` : ""}`), [router]);

  const onApply = handleSubmit((filter) => go({ ...filter, sort: view.sort, dir: view.dir }));
  const onClear = () => go({ sort: view.sort, dir: view.dir });

  const columnDefs = useMemo<ColDef<RegisterRow>[]>(
    () =>
      REGISTER_COLUMNS.filter((c) => c.inGrid).map((c) => ({
        colId: c.key,
        headerName: columnHeader(c, unitSystem, timeZone),
        headerTooltip: c.sort ? `${columnHeader(c, unitSystem, timeZone)}: click to sort on the server` : undefined,
        sortable: Boolean(c.sort),
        width: Math.round(c.width * 8.5 + 36),
        valueGetter: (p) => (p.data ? formatCell(c, p.data, unitSystem, timeZone) : ""),
        ...(c.key === "jointNo" ? { cellRenderer: JointLink, pinned: "left" as const } : {}),
        ...(c.type === "quantity" || c.type === "integer" ? { type: "rightAligned" } : {}),
      })),
    [unitSystem, timeZone],
  );

  const sortColumn = REGISTER_COLUMNS.find((c) => c.sort === view.sort);
  const gridSort = sortColumn ? { colId: sortColumn.key, dir: view.dir } : null;
  const onSortChange = useCallback(
    (s: { colId: string; dir: "asc" | "desc" } | null) => {
      const column = REGISTER_COLUMNS.find((c) => c.key === s?.colId);
      const sort: RegisterSort = column?.sort ?? "madeAt";
      router.replace(`/register?${viewToSearchParams({ ...view, sort, dir: s?.dir ?? "desc" }).toString()}`);
    },
    [router, view],
  );

  const fieldError = (name: keyof FormValues) => formState.errors[name]?.message ?? urlErrors[name]?.[0];
  const hasUrlErrors = Object.keys(urlErrors).length > 0;
  const select = (name: keyof FormValues, label: string, items: { value: string; label: string }[], anyLabel: string) => (
    <FieldShell id={`f-${name}`} label={label} error={fieldError(name)}>
      {(control) => (
        <select {...control} {...register(name)} className={`${inputClass} ${controlBorder(fieldError(name))}`}>
          <option value="">{anyLabel}</option>
          {items.map((i) => (
            <option key={i.value} value={i.value}>
              {i.label}
            </option>
          ))}
        </select>
      )}
    </FieldShell>
  );
  const text = (name: keyof FormValues, label: string, type: "text" | "date" | "search" = "text", placeholder?: string) => (
    <FieldShell id={`f-${name}`} label={label} error={fieldError(name)}>
      {(control) => <input {...control} type={type} placeholder={placeholder} {...register(name)} className={`${inputClass} ${controlBorder(fieldError(name))}`} />}
    </FieldShell>
  );

  const countText = count === null ? "Counting joints …" : describeRegisterCount(count);

  return (
    <div className="flex flex-col gap-4">
      <form role="search" aria-label="Filter the register" onSubmit={onApply} className="rounded-md border-2 border-slate-300 bg-white p-4" noValidate>
        {hasUrlErrors ? <FormMessage message="The link's filter has a problem (see the marked fields), so the whole register is shown." /> : null}
        <div className="grid gap-3 sm:grid-cols-2 lg:grid-cols-5">
          {text("q", "Search joint, coil id or lot", "search", "e.g. WO-24152 joint 10, 12, LV-C0004, 4410021")}
          {select("job", "Job", options.jobs.map((o) => ({ value: String(o.id), label: o.label })), "Any job")}
          {text("from", dayLabels.from, "date")}
          {text("to", dayLabels.to, "date")}
          {select("fuser", "Fuser", options.fusers.map((o) => ({ value: String(o.id), label: o.label })), "Anyone")}
          {select("machine", "Fusion machine", options.machines.map((o) => ({ value: String(o.id), label: o.label })), "Any machine")}
          {text("lot", "Lot (either side)")}
          {select("outcome", "Outcome", REGISTER_OUTCOMES.map((o) => ({ value: o, label: OUTCOME_LABELS[o] })), "Any outcome")}
          {select("review", "Review state", REVIEW_STATES.map((o) => ({ value: o, label: REVIEW_STATE_LABELS[o] })), "Any review state")}
          {select("finding", "Finding on", JOINT_PARAMETERS.map((p) => ({ value: p, label: FINDING_PARAMETER_LABELS[p] })), "Any or none")}
        </div>
        <div className="mt-3 flex flex-wrap gap-2">
          <Button type="submit">Apply filter</Button>
          <Button type="button" variant="secondary" onClick={onClear}>
            Clear filter
          </Button>
        </div>
      </form>

      <div className="flex flex-wrap items-center justify-between gap-3">
        <p aria-live="polite" className="font-semibold" data-testid="register-count">
          {countText} · {describeSort(view.sort, view.dir)}
        </p>
        <ExportPanel query={query} />
      </div>
      {loadError ? <FormMessage message={`The register could not be loaded: ${loadError}`} /> : null}

      <KeysetGrid<RegisterRow, RegisterRowJson>
        label="Joint register"
        columnDefs={columnDefs}
        dataUrl="/api/v1/register"
        query={query}
        pageSize={100}
        rowId={(r) => String(r.id)}
        parseRow={registerRowFromJson}
        sort={gridSort}
        onSortChange={onSortChange}
        onRowOpen={(row) => router.push(`/joints/${row.id}`)}
        onCount={setCount}
        onError={setLoadError}
      />
      <p className="text-sm text-slate-700">Times are local times in {timeZone} with their offset from UTC; the day filters take local days there. Values are in {unitSystem === "us" ? "US customary units" : "SI units"} (change this with the unit switch at the top). Sort by the headers marked sortable; open a joint by its number or by clicking its row.</p>
    </div>
  );
}
