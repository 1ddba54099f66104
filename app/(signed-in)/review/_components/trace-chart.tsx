"use client";
import useSWR from "swr";
import { CartesianGrid, ComposedChart, Legend, Line, ReferenceArea, ReferenceLine, ResponsiveContainer, Tooltip, XAxis, YAxis } from "recharts";
import type { ChartBand, ChartMarker, ChartPoint, ChartTimeZone } from "@/domain/pressure-trace/check";
import { toDisplay, unitLabel, type UnitSystem } from "@/domain/units/format";

type TraceData = { points: ChartPoint[]; windows: { bands: ChartBand[]; markers: ChartMarker[]; zones: ChartTimeZone[] } };

async function fetchTrace(url: string): Promise<TraceData> {
  const response = await fetch(url);
  if (!response.ok) throw new Error("The trace could not be loaded.");
  return (await response.json()) as TraceData;
}

/** Gauge pressure over time with the plan's pressure windows as bands and its time limits as lines. */
export function TraceChart({ jointId, traceId, unitSystem, label }: { jointId: number; traceId: number; unitSystem: UnitSystem; label: string }) {
  const { data, error } = useSWR<TraceData>(`/api/v1/review/joints/${jointId}/trace?t=${traceId}`, fetchTrace, { revalidateOnFocus: false });
  if (error) return <p role="alert">{error.message}</p>;
  if (!data) return <p role="status">Loading the trace…</p>;
  const p = (mpa: number) => toDisplay(mpa, "pressure", unitSystem);
  const hasTemperature = data.points.some((pt) => pt.c !== undefined);
  const points = data.points.map((pt) => ({ t: pt.t, p: p(pt.p), c: pt.c === undefined ? undefined : toDisplay(pt.c, "temperature", unitSystem) }));
  const pUnit = unitLabel("pressure", unitSystem);
  return (
    <figure className="flex flex-col gap-1">
      <div className="h-72 w-full" role="img" aria-label={`Pressure trace of ${label}: gauge pressure in ${pUnit} over time in seconds, with the plan's windows shaded`}>
        <ResponsiveContainer width="100%" height="100%">
          <ComposedChart data={points} margin={{ top: 8, right: 16, bottom: 16, left: 8 }}>
            <CartesianGrid strokeDasharray="3 3" />
            <XAxis dataKey="t" type="number" domain={["dataMin", "dataMax"]} label={{ value: "time (s)", position: "insideBottom", offset: -8 }} />
            <YAxis yAxisId="p" label={{ value: pUnit, angle: -90, position: "insideLeft" }} />
            {hasTemperature ? <YAxis yAxisId="c" orientation="right" label={{ value: unitLabel("temperature", unitSystem), angle: 90, position: "insideRight" }} /> : null}
            <Tooltip formatter={(v) => (typeof v === "number" ? v.toFixed(unitSystem === "us" ? 0 : 2) : String(v))} labelFormatter={(t) => `${Number(t).toFixed(1)} s`} />
            <Legend verticalAlign="top" />
            {data.windows.zones.map((z) => (
              <ReferenceArea key={z.key} yAxisId="p" x1={z.x1} x2={z.x2} fill="#fef3c7" fillOpacity={0.6} label={{ value: z.label, position: "insideTop" }} />
            ))}
            {data.windows.bands.map((b) => (
              <ReferenceArea key={b.key} yAxisId="p" x1={b.x1} x2={b.x2} y1={p(b.y1)} y2={p(b.y2)} fill="#dcfce7" fillOpacity={0.8} stroke="#166534" strokeDasharray="4 2" label={{ value: b.label, position: "insideTopLeft", fontSize: 11 }} />
            ))}
            {data.windows.markers.map((m) => (
              <ReferenceLine key={m.key} yAxisId="p" x={m.x} stroke="#92400e" strokeDasharray="6 3" label={{ value: m.label, position: "top", fontSize: 11 }} />
            ))}
            <Line yAxisId="p" dataKey="p" name={`Gauge pressure (${pUnit})`} stroke="#0b4f6c" dot={false} isAnimationActive={false} strokeWidth={2} />
            {hasTemperature ? <Line yAxisId="c" dataKey="c" name={`Heater (${unitLabel("temperature", unitSystem)})`} stroke="#b91c1c" dot={false} isAnimationActive={false} /> : null}
          </ComposedChart>
        </ResponsiveContainer>
      </div>
      <figcaption className="text-sm text-slate-700">Green bands: the plan&apos;s pressure windows over the phase they govern. Dashed lines: the plan&apos;s time limits measured from the phase start the trace shows.</figcaption>
    </figure>
  );
}
