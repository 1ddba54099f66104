"use client";
import { useId, type ReactNode } from "react";
import { Area, Bar, BarChart, CartesianGrid, ComposedChart, Line, ReferenceLine, ResponsiveContainer, Scatter, ScatterChart, Tooltip, XAxis, YAxis } from "recharts";
import { formatDuration, toDisplay, unitLabel, type UnitSystem } from "@/domain/units/format";
import { formatTick, niceTicks } from "@/domain/charts/ticks";
import { windowState, type WindowState } from "@/domain/charts/windows";
import { CHART_COLOURS, ChartLegend, HatchPattern, PointMarker, type LegendSwatch } from "@/components/charts/chart-parts";
import { DataTable } from "@/components/ui/data-table";
import { formatInstant } from "@/components/ui/display-format";
import { useTimeZone } from "@/components/ui/time-zone";
import { SectionCard } from "@/components/ui/section-card";

type Yield = { joints: number; firstPass: number; yieldPct: number };
type Props = {
  unitSystem: UnitSystem;
  byWeek: (Yield & { weekStart: string })[];
  byFuser: (Yield & { id: number; label: string })[];
  byMachine: (Yield & { id: number; label: string })[];
  findings: { label: string; joints: number }[];
  heater: { t: number; c: number; min: number | null; max: number | null; jointId: number; heaterTag: string }[];
  cooling: { label: string; recorded: number; required: number }[];
};

const BRAND = "#0b4f6c";
const PASS = "#166534";
const FAIL = "#b91c1c";

type LegendItem = { key: string; swatch: LegendSwatch; text: ReactNode };

/** A chart card: the plot (one image with a summary for screen readers), its key below it, the numbers behind it. */
function Panel({ id, title, summary, children, table, legend }: { id: string; title: string; summary: string; children: ReactNode; table: ReactNode; legend?: LegendItem[] }) {
  return (
    <SectionCard id={`${id}-heading`} title={title} tone="card" isCompact className="flex min-w-0 flex-col gap-2">
      <div className="h-72 w-full min-w-0" role="img" aria-label={`${title}: ${summary}`} data-chart={id}>
        {children}
      </div>
      {legend?.length ? <ChartLegend label={`Key to ${title.charAt(0).toLowerCase()}${title.slice(1)}`} items={legend} /> : null}
      <details>
        <summary className="min-h-touch cursor-pointer py-2 font-semibold text-brand">Numbers behind the chart</summary>
        <div className="max-h-64 overflow-auto">{table}</div>
      </details>
    </SectionCard>
  );
}

function YieldTable({ rows, first }: { rows: (Yield & { key: string; label: string })[]; first: string }) {
  return (
    <DataTable
      isDense
      rows={rows}
      rowKey={(r) => r.key}
      columns={[
        { header: first, isRowHeader: true, cell: (r) => r.label },
        { header: "Joints", cell: (r) => r.joints },
        { header: "First pass", cell: (r) => r.firstPass },
        { header: "Yield", cell: (r) => `${r.yieldPct} %` },
      ]}
    />
  );
}

const empty = (what: string) => <p className="p-6 text-slate-700">No {what} in this period.</p>;

/** Props for a recharts axis with round ticks (domain, ticks, their text). */
function axisTicks(lo: number, hi: number, target = 5, minStep = 0) {
  const t = niceTicks(lo, hi, target, { minStep });
  return { type: "number" as const, domain: [t.min, t.max], ticks: t.ticks, interval: 0 as const, tickFormatter: (v: number) => formatTick(v, t.decimals) };
}

/** A recharts dot/shape renderer drawing the point's window state by shape. */
function markerFor(state: (payload: unknown) => WindowState) {
  function Marker(props: { cx?: unknown; cy?: unknown; payload?: unknown; index?: number }) {
    return <PointMarker key={props.index} cx={Number(props.cx)} cy={Number(props.cy)} state={state(props.payload)} />;
  }
  return Marker;
}

export function InsightsCharts({ unitSystem, byWeek, byFuser, byMachine, findings, heater, cooling }: Props) {
  const tUnit = unitLabel("temperature", unitSystem);
  const temp = (c: number | null) => (c === null ? null : Math.round(toDisplay(c, "temperature", unitSystem) * 10) / 10);
  const patternId = `heater-window-${useId().replace(/[^a-zA-Z0-9_-]/g, "")}`;
  // Window state judged in °C (the stored values); drawn in the viewer's unit.
  const heaterData = heater.map((h) => ({
    t: h.t,
    c: temp(h.c),
    band: h.min !== null && h.max !== null ? [temp(h.min), temp(h.max)] : null,
    jointId: h.jointId,
    state: windowState(h.c, h.min, h.max),
  }));
  const heaterOutside = heater.filter((h) => windowState(h.c, h.min, h.max) === "outside");
  const heaterNoWindow = heater.filter((h) => windowState(h.c, h.min, h.max) === "none").length;
  const heaterValues = heaterData.flatMap((h) => [h.c, ...(h.band ?? [])]).filter((v): v is number => v !== null);
  const heaterY = heaterValues.length ? axisTicks(Math.min(...heaterValues), Math.max(...heaterValues), 6) : null;
  const timeZone = useTimeZone();
  const day = (t: number) => formatInstant(t, "date", timeZone);
  const coolingOk = cooling.filter((c) => c.recorded >= c.required);
  const coolingShort = cooling.filter((c) => c.recorded < c.required);
  // Both cooling axes share one round scale in seconds, so the diagonal is recorded = required.
  const coolingAxis = axisTicks(0, Math.max(60, ...cooling.map((c) => Math.max(c.recorded, c.required))), 6);
  const coolingMax = coolingAxis.domain[1]!;
  const percentAxis = axisTicks(0, 100, 5);
  const weekCounts = axisTicks(0, Math.max(1, ...byWeek.map((w) => w.joints)), 5, 1);
  const findingCounts = axisTicks(0, Math.max(1, ...findings.map((f) => f.joints)), 5, 1);
  const shortText = (h: (typeof heater)[number]) => `${day(h.t)} ${h.heaterTag} ${temp(h.c)} ${tUnit}`;
  const groupChart = (rows: (Yield & { label: string })[]) => (
    <ResponsiveContainer width="100%" height="100%">
      <BarChart data={rows} layout="vertical" margin={{ left: 8, right: 16, bottom: 16 }}>
        <CartesianGrid strokeDasharray="3 3" />
        <XAxis {...percentAxis} label={{ value: "first-pass yield (%)", position: "insideBottom", offset: -10 }} />
        <YAxis type="category" dataKey="label" width={120} />
        <Tooltip formatter={(v, _n, item) => [`${v} % of ${(item.payload as Yield).joints} joints`, "First-pass yield"]} />
        <Bar dataKey="yieldPct" name="First-pass yield" fill={BRAND} isAnimationActive={false} />
      </BarChart>
    </ResponsiveContainer>
  );

  return (
    <div className="grid gap-4 xl:grid-cols-2">
      <Panel
        id="yield-week"
        title="First-pass yield by week"
        summary={byWeek.map((w) => `week of ${w.weekStart}: ${w.yieldPct} % of ${w.joints}`).join("; ") || "no joints"}
        table={<YieldTable first="Week of" rows={byWeek.map((w) => ({ ...w, key: w.weekStart, label: w.weekStart }))} />}
        legend={
          byWeek.length
            ? [
                { key: "joints", swatch: { kind: "bar", colour: "#94a3b8" }, text: "Joints made (left axis)" },
                { key: "yield", swatch: { kind: "line", colour: PASS }, text: "First-pass yield, % (right axis)" },
              ]
            : undefined
        }
      >
        {byWeek.length ? (
          <ResponsiveContainer width="100%" height="100%">
            <ComposedChart data={byWeek} margin={{ top: 16, right: 16, bottom: 4, left: 4 }}>
              <CartesianGrid strokeDasharray="3 3" />
              <XAxis dataKey="weekStart" />
              <YAxis yAxisId="n" {...weekCounts} label={{ value: "joints", angle: -90, position: "insideLeft" }} />
              <YAxis yAxisId="pct" orientation="right" {...percentAxis} unit=" %" />
              <Tooltip />
              <Bar yAxisId="n" dataKey="joints" name="Joints made" fill="#94a3b8" isAnimationActive={false} />
              <Line yAxisId="pct" dataKey="yieldPct" name="First-pass yield (%)" stroke={PASS} strokeWidth={3} isAnimationActive={false} />
            </ComposedChart>
          </ResponsiveContainer>
        ) : (
          empty("joints")
        )}
      </Panel>
      <Panel
        id="findings"
        title="Findings by parameter"
        summary={findings.map((f) => `${f.label}: ${f.joints}`).join("; ") || "no findings"}
        table={
          <DataTable
            isDense
            rows={findings}
            rowKey={(f) => f.label}
            columns={[
              { header: "Parameter", isRowHeader: true, cell: (f) => f.label },
              { header: "Joints with a finding", cell: (f) => f.joints },
            ]}
          />
        }
      >
        {findings.length ? (
          <ResponsiveContainer width="100%" height="100%">
            <BarChart data={findings} margin={{ top: 16, right: 16, bottom: 4, left: 40 }}>
              <CartesianGrid strokeDasharray="3 3" />
              <XAxis dataKey="label" interval={0} angle={-25} textAnchor="end" height={90} tick={{ fontSize: 12 }} />
              <YAxis {...findingCounts} />
              <Tooltip />
              <Bar dataKey="joints" name="Joints with a finding" fill={FAIL} isAnimationActive={false} />
            </BarChart>
          </ResponsiveContainer>
        ) : (
          empty("findings")
        )}
      </Panel>
      <Panel
        id="yield-fuser"
        title="First-pass yield by fuser"
        summary={byFuser.map((f) => `${f.label}: ${f.yieldPct} % of ${f.joints}`).join("; ") || "no joints"}
        table={<YieldTable first="Fuser" rows={byFuser.map((f) => ({ ...f, key: String(f.id) }))} />}
      >
        {byFuser.length ? groupChart(byFuser) : empty("joints")}
      </Panel>
      <Panel
        id="yield-machine"
        title="First-pass yield by machine"
        summary={byMachine.map((m) => `${m.label}: ${m.yieldPct} % of ${m.joints}`).join("; ") || "no joints"}
        table={<YieldTable first="Machine" rows={byMachine.map((m) => ({ ...m, key: String(m.id) }))} />}
      >
        {byMachine.length ? groupChart(byMachine) : empty("joints")}
      </Panel>
      <Panel
        id="heater"
        title="Heater temperature of recorded joints"
        summary={`${heater.length} joints; the hatched band is each joint's procedure window; ${heaterOutside.length} outside it${
          heaterOutside.length ? ` (${heaterOutside.slice(0, 5).map(shortText).join("; ")}${heaterOutside.length > 5 ? `; and ${heaterOutside.length - 5} more` : ""})` : ""
        }${heaterNoWindow ? `; ${heaterNoWindow} without a window` : ""}`}
        legend={
          heater.length
            ? [
                { key: "window", swatch: { kind: "band", colour: CHART_COLOURS.window, patternId }, text: "Procedure window (hatched)" },
                { key: "inside", swatch: { kind: "point", state: "inside" }, text: `Within the window (${heater.length - heaterOutside.length - heaterNoWindow})` },
                { key: "outside", swatch: { kind: "point", state: "outside" }, text: `Outside the window (${heaterOutside.length})` },
                ...(heaterNoWindow ? [{ key: "none", swatch: { kind: "point" as const, state: "none" as const }, text: `No window recorded (${heaterNoWindow})` }] : []),
              ]
            : undefined
        }
        table={
          <DataTable
            isDense
            rows={heater}
            rowKey={(h) => h.jointId}
            columns={[
              { header: "Day", isRowHeader: true, cell: (h) => day(h.t) },
              { header: "Heater", cell: (h) => h.heaterTag },
              { header: `Recorded (${tUnit})`, cell: (h) => (windowState(h.c, h.min, h.max) === "outside" ? <strong>{temp(h.c)} (outside)</strong> : temp(h.c)) },
              { header: `Window (${tUnit})`, cell: (h) => (h.min !== null && h.max !== null ? `${temp(h.min)?.toFixed(0)}–${temp(h.max)?.toFixed(0)}` : "—") },
            ]}
          />
        }
      >
        {heater.length ? (
          <ResponsiveContainer width="100%" height="100%">
            <ComposedChart data={heaterData} margin={{ top: 16, right: 16, bottom: 4, left: 4 }}>
              <HatchPattern id={patternId} />
              <CartesianGrid strokeDasharray="3 3" />
              <XAxis dataKey="t" type="number" scale="time" domain={["dataMin", "dataMax"]} tickFormatter={day} minTickGap={48} />
              <YAxis {...heaterY} width={48} label={{ value: tUnit, angle: -90, position: "insideLeft" }} />
              <Tooltip labelFormatter={(t) => day(Number(t))} />
              <Area dataKey="band" name="Procedure window" type="stepAfter" fill={`url(#${patternId})`} fillOpacity={1} stroke={CHART_COLOURS.window} strokeWidth={1.5} isAnimationActive={false} connectNulls />
              <Line
                dataKey="c"
                name={`Recorded heater temperature (${tUnit})`}
                stroke={BRAND}
                strokeWidth={0}
                dot={markerFor((payload) => (payload as { state: WindowState }).state)}
                activeDot={{ r: 6 }}
                isAnimationActive={false}
              />
            </ComposedChart>
          </ResponsiveContainer>
        ) : (
          empty("heater temperatures")
        )}
      </Panel>
      <Panel
        id="cooling"
        title="Cooling time: recorded against required"
        summary={`${cooling.length} joints; ${coolingShort.length} cooled for less than their plan's minimum (below the diagonal)${
          coolingShort.length ? `: ${coolingShort.slice(0, 5).map((c) => `${c.label} ${formatDuration(c.recorded)} of ${formatDuration(c.required)}`).join("; ")}${coolingShort.length > 5 ? `; and ${coolingShort.length - 5} more` : ""}` : ""
        }`}
        legend={
          cooling.length
            ? [
                { key: "ok", swatch: { kind: "point", state: "inside" }, text: `Long enough (${coolingOk.length})` },
                { key: "short", swatch: { kind: "point", state: "outside" }, text: `Too short (${coolingShort.length})` },
                { key: "diagonal", swatch: { kind: "line", colour: "#92400e", dashed: true }, text: "Recorded = required" },
              ]
            : undefined
        }
        table={
          <DataTable
            isDense
            rows={cooling}
            rowKey={(c) => c.label}
            rowClassName={(c) => (c.recorded < c.required ? "text-fail" : "")}
            columns={[
              { header: "Joint", isRowHeader: true, cell: (c) => c.label },
              { header: "Recorded", cell: (c) => formatDuration(c.recorded) },
              { header: "Required", cell: (c) => `at least ${formatDuration(c.required)}` },
            ]}
          />
        }
      >
        {cooling.length ? (
          <ResponsiveContainer width="100%" height="100%">
            <ScatterChart margin={{ top: 16, right: 16, bottom: 16, left: 8 }}>
              <CartesianGrid strokeDasharray="3 3" />
              <XAxis {...coolingAxis} dataKey="required" name="Required" label={{ value: "required (s)", position: "insideBottom", offset: -8 }} />
              <YAxis {...coolingAxis} dataKey="recorded" name="Recorded" width={60} label={{ value: "recorded (s)", angle: -90, position: "insideLeft" }} />
              <Tooltip cursor={{ strokeDasharray: "3 3" }} />
              <ReferenceLine segment={[{ x: 0, y: 0 }, { x: coolingMax, y: coolingMax }]} stroke="#92400e" strokeDasharray="6 3" />
              <Scatter name="Long enough" data={coolingOk} fill={PASS} shape={markerFor(() => "inside")} isAnimationActive={false} />
              <Scatter name="Too short" data={coolingShort} fill={FAIL} shape={markerFor(() => "outside")} isAnimationActive={false} />
            </ScatterChart>
          </ResponsiveContainer>
        ) : (
          empty("cooling times")
        )}
      </Panel>
    </div>
  );
}
