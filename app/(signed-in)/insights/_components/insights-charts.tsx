"use client";
import type { ReactNode } from "react";
import { Area, Bar, BarChart, CartesianGrid, ComposedChart, Legend, Line, ReferenceLine, ResponsiveContainer, Scatter, ScatterChart, Tooltip, XAxis, YAxis } from "recharts";
import { formatDuration, toDisplay, unitLabel, type UnitSystem } from "@/domain/units/format";
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

function Panel({ id, title, summary, children, table }: { id: string; title: string; summary: string; children: ReactNode; table: ReactNode }) {
  return (
    <SectionCard id={`${id}-heading`} title={title} tone="card" isCompact className="flex flex-col gap-2">
      <div className="h-72 w-full" role="img" aria-label={`${title}: ${summary}`}>
        {children}
      </div>
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

export function InsightsCharts({ unitSystem, byWeek, byFuser, byMachine, findings, heater, cooling }: Props) {
  const tUnit = unitLabel("temperature", unitSystem);
  const temp = (c: number | null) => (c === null ? null : Math.round(toDisplay(c, "temperature", unitSystem) * 10) / 10);
  const heaterData = heater.map((h) => ({ t: h.t, c: temp(h.c), band: h.min !== null && h.max !== null ? [temp(h.min), temp(h.max)] : null, jointId: h.jointId }));
  const timeZone = useTimeZone();
  const day = (t: number) => formatInstant(t, "date", timeZone);
  const coolingOk = cooling.filter((c) => c.recorded >= c.required);
  const coolingShort = cooling.filter((c) => c.recorded < c.required);
  // Axis end rounded up to a whole minute, so the ticks read as plain seconds.
  const coolingMax = Math.ceil((Math.max(60, ...cooling.map((c) => Math.max(c.recorded, c.required))) * 1.05) / 60) * 60;
  const groupChart = (rows: (Yield & { label: string })[]) => (
    <ResponsiveContainer width="100%" height="100%">
      <BarChart data={rows} layout="vertical" margin={{ left: 24, right: 16 }}>
        <CartesianGrid strokeDasharray="3 3" />
        <XAxis type="number" domain={[0, 100]} unit=" %" />
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
      >
        {byWeek.length ? (
          <ResponsiveContainer width="100%" height="100%">
            <ComposedChart data={byWeek} margin={{ top: 16, right: 16, bottom: 4, left: 4 }}>
              <CartesianGrid strokeDasharray="3 3" />
              <XAxis dataKey="weekStart" />
              <YAxis yAxisId="n" allowDecimals={false} label={{ value: "joints", angle: -90, position: "insideLeft" }} />
              <YAxis yAxisId="pct" orientation="right" domain={[0, 100]} unit=" %" />
              <Tooltip />
              <Legend />
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
            <BarChart data={findings} margin={{ top: 16, right: 16, bottom: 4, left: 4 }}>
              <CartesianGrid strokeDasharray="3 3" />
              <XAxis dataKey="label" interval={0} angle={-25} textAnchor="end" height={90} tick={{ fontSize: 12 }} />
              <YAxis allowDecimals={false} />
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
        summary={`${heater.length} joints; the shaded band is each joint's procedure window; ${heater.filter((h) => (h.min !== null && h.c < h.min) || (h.max !== null && h.c > h.max)).length} outside it`}
        table={
          <DataTable
            isDense
            rows={heater}
            rowKey={(h) => h.jointId}
            columns={[
              { header: "Day", isRowHeader: true, cell: (h) => day(h.t) },
              { header: "Heater", cell: (h) => h.heaterTag },
              { header: `Recorded (${tUnit})`, cell: (h) => temp(h.c) },
              { header: `Window (${tUnit})`, cell: (h) => (h.min !== null && h.max !== null ? `${temp(h.min)?.toFixed(0)}–${temp(h.max)?.toFixed(0)}` : "—") },
            ]}
          />
        }
      >
        {heater.length ? (
          <ResponsiveContainer width="100%" height="100%">
            <ComposedChart data={heaterData} margin={{ top: 16, right: 16, bottom: 4, left: 4 }}>
              <CartesianGrid strokeDasharray="3 3" />
              <XAxis dataKey="t" type="number" scale="time" domain={["dataMin", "dataMax"]} tickFormatter={day} minTickGap={48} />
              <YAxis domain={["auto", "auto"]} label={{ value: tUnit, angle: -90, position: "insideLeft" }} />
              <Tooltip labelFormatter={(t) => day(Number(t))} />
              <Legend />
              <Area dataKey="band" name="Procedure window" type="stepAfter" fill="#dcfce7" stroke={PASS} strokeDasharray="4 2" isAnimationActive={false} connectNulls />
              <Line dataKey="c" name={`Recorded heater temperature (${tUnit})`} stroke={BRAND} strokeWidth={0} dot={{ r: 4, fill: BRAND }} activeDot={{ r: 6 }} isAnimationActive={false} />
            </ComposedChart>
          </ResponsiveContainer>
        ) : (
          empty("heater temperatures")
        )}
      </Panel>
      <Panel
        id="cooling"
        title="Cooling time: recorded against required"
        summary={`${cooling.length} joints; ${coolingShort.length} cooled for less than their plan's minimum (below the diagonal)`}
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
            <ScatterChart margin={{ right: 16, bottom: 16 }}>
              <CartesianGrid strokeDasharray="3 3" />
              <XAxis type="number" dataKey="required" name="Required" unit=" s" domain={[0, coolingMax]} label={{ value: "required (s)", position: "insideBottom", offset: -8 }} />
              <YAxis type="number" dataKey="recorded" name="Recorded" unit=" s" domain={[0, coolingMax]} label={{ value: "recorded (s)", angle: -90, position: "insideLeft" }} />
              <Tooltip cursor={{ strokeDasharray: "3 3" }} />
              <Legend verticalAlign="top" />
              <ReferenceLine segment={[{ x: 0, y: 0 }, { x: coolingMax, y: coolingMax }]} stroke="#92400e" strokeDasharray="6 3" label={{ value: "recorded = required", position: "insideTopLeft" }} />
              <Scatter name="Long enough" data={coolingOk} fill={PASS} isAnimationActive={false} />
              <Scatter name="Too short" data={coolingShort} fill={FAIL} shape="diamond" isAnimationActive={false} />
            </ScatterChart>
          </ResponsiveContainer>
        ) : (
          empty("cooling times")
        )}
      </Panel>
    </div>
  );
}
