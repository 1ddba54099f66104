"use client";
import { useId } from "react";
import useSWR from "swr";
import { CartesianGrid, ComposedChart, Line, ReferenceArea, ReferenceLine, ResponsiveContainer, Tooltip, XAxis, YAxis } from "recharts";
import type { ChartBand, ChartMarker, ChartPoint, ChartTimeZone } from "@/domain/pressure-trace/check";
import { niceTicks, formatTick } from "@/domain/charts/ticks";
import { outsideCounts, spacedMarks, traceWindowStates, type WindowState } from "@/domain/charts/windows";
import { formatQuantity, toDisplay, unitLabel, type UnitSystem } from "@/domain/units/format";
import { bandLabel, CHART_COLOURS, ChartLegend, HatchPattern, PointMarker, verticalLabel } from "@/components/charts/chart-parts";

type TraceData = { points: ChartPoint[]; windows: { bands: ChartBand[]; markers: ChartMarker[]; zones: ChartTimeZone[] } };

async function fetchTrace(url: string): Promise<TraceData> {
  const response = await fetch(url);
  if (!response.ok) throw new Error("The trace could not be loaded.");
  return (await response.json()) as TraceData;
}

/** Band labels on the plot: short, the legend and the summary say the rest. */
const BAND_LABEL: Record<string, [string, string]> = { beadUp: ["Bead-up window", "Bead-up"], fusion: ["Fusion window", "Fusion"] };
const HEATER_DASH = "1 3";

/**
 * Gauge pressure over time with the plan's pressure windows as hatched bands, its time
 * windows shaded and its time limits as dashed lines; samples outside the pressure window
 * over their phase are hollow triangles. Axes carry round ticks in the viewer's units; the
 * key sits below the plot.
 */
export function TraceChart({ jointId, traceId, unitSystem, label }: { jointId: number; traceId: number; unitSystem: UnitSystem; label: string }) {
  const patternId = `trace-window-${useId().replace(/[^a-zA-Z0-9_-]/g, "")}`;
  const { data, error } = useSWR<TraceData>(`/api/v1/review/joints/${jointId}/trace?t=${traceId}`, fetchTrace, { revalidateOnFocus: false });
  if (error) return <p role="alert">{error.message}</p>;
  if (!data) return <p role="status">Loading the trace…</p>;
  const { bands, markers, zones } = data.windows;
  const p = (mpa: number) => toDisplay(mpa, "pressure", unitSystem);
  const pUnit = unitLabel("pressure", unitSystem);
  const tUnit = unitLabel("temperature", unitSystem);
  const states: WindowState[] = traceWindowStates(data.points, bands);
  const hasTemperature = data.points.some((pt) => pt.c !== undefined);
  const points = data.points.map((pt, i) => ({ t: pt.t, p: p(pt.p), c: pt.c === undefined ? undefined : toDisplay(pt.c, "temperature", unitSystem), state: states[i] }));
  const outsideTotal = states.filter((s) => s === "outside").length;

  // Axes: round ticks covering the data and every window and line, in the units shown, so no band is cut off.
  const pressures = [...points.map((pt) => pt.p), ...bands.flatMap((b) => [p(b.y1), p(b.y2)]), 0];
  const yTicks = niceTicks(Math.min(...pressures), Math.max(...pressures), 6);
  const times = [...points.map((pt) => pt.t), ...bands.flatMap((b) => [b.x1, b.x2]), ...zones.flatMap((z) => [z.x1, z.x2]), ...markers.map((m) => m.x)];
  const xTicks = niceTicks(Math.min(...times), Math.max(...times), 6);
  // A run of samples outside the window would merge into one red bar: a triangle at most every 1/50 of the time axis.
  const marked = spacedMarks(points, states.map((st) => st === "outside"), (xTicks.max - xTicks.min) / 50);
  const temps = points.flatMap((pt) => (pt.c === undefined ? [] : [pt.c]));
  const cTicks = temps.length ? niceTicks(Math.min(...temps), Math.max(...temps), 6) : null;

  const pressureText = (mpa: number) => formatQuantity(mpa, "pressure", unitSystem);
  const counts = outsideCounts(data.points, bands);
  const bandSummary = bands
    .map((b) => {
      const c = counts.find((x) => x.key === b.key);
      return `${b.label} ${pressureText(b.y1)} to ${pressureText(b.y2)}: ${c?.outside ?? 0} of ${c?.inSpan ?? 0} samples outside`;
    })
    .join("; ");
  const summary = `Pressure trace of ${label}: gauge pressure in ${pUnit} over ${formatTick(xTicks.min, 0)} to ${formatTick(xTicks.max, 0)} seconds. ${bandSummary || "No pressure windows (no plan)"}.${
    markers.length ? ` Time limits: ${markers.map((m) => `${m.label} at ${Math.round(m.x)} s`).join(", ")}.` : ""
  }${zones.length ? ` ${zones.map((z) => `${z.label} ${Math.round(z.x1)} to ${Math.round(z.x2)} s`).join(", ")}.` : ""}`;

  return (
    <figure className="flex min-w-0 flex-col gap-2">
      <div className="h-72 w-full min-w-0 sm:h-80" role="img" aria-label={summary} data-chart="pressure-trace">
        <ResponsiveContainer width="100%" height="100%">
          <ComposedChart data={points} margin={{ top: 8, right: hasTemperature ? 4 : 12, bottom: 20, left: 4 }}>
            <HatchPattern id={patternId} />
            <CartesianGrid strokeDasharray="3 3" stroke="#cbd5e1" />
            <XAxis
              dataKey="t"
              type="number"
              domain={[xTicks.min, xTicks.max]}
              ticks={xTicks.ticks}
              interval={0}
              tickFormatter={(v: number) => formatTick(v, xTicks.decimals)}
              label={{ value: "time (s)", position: "insideBottom", offset: -14 }}
            />
            <YAxis
              yAxisId="p"
              type="number"
              domain={[yTicks.min, yTicks.max]}
              ticks={yTicks.ticks}
              interval={0}
              width={yTicks.decimals > 1 ? 52 : 44}
              tickFormatter={(v: number) => formatTick(v, yTicks.decimals)}
              label={{ value: pUnit, angle: -90, position: "insideLeft", offset: 6 }}
            />
            {cTicks ? (
              <YAxis
                yAxisId="c"
                orientation="right"
                type="number"
                domain={[cTicks.min, cTicks.max]}
                ticks={cTicks.ticks}
                interval={0}
                width={44}
                tickFormatter={(v: number) => formatTick(v, cTicks.decimals)}
                label={{ value: tUnit, angle: 90, position: "insideRight", offset: 6 }}
              />
            ) : null}
            <Tooltip
              formatter={(v) => (typeof v === "number" ? v.toFixed(unitSystem === "us" ? 0 : 2) : String(v))}
              labelFormatter={(t) => `${Number(t).toFixed(1)} s`}
            />
            {zones.map((z, i) => (
              <ReferenceArea
                key={z.key}
                yAxisId="p"
                x1={z.x1}
                x2={z.x2}
                fill="#fef3c7"
                fillOpacity={0.7}
                stroke={CHART_COLOURS.timeWindow}
                strokeDasharray="3 2"
                ifOverflow="extendDomain"
                label={{ content: verticalLabel(z.label, i % 2 === 0 ? "right" : "left", CHART_COLOURS.timeWindow) }}
              />
            ))}
            {bands.map((b) => (
              <ReferenceArea
                key={b.key}
                yAxisId="p"
                x1={b.x1}
                x2={b.x2}
                y1={p(b.y1)}
                y2={p(b.y2)}
                fill={`url(#${patternId})`}
                fillOpacity={1}
                stroke={CHART_COLOURS.window}
                strokeWidth={1.5}
                ifOverflow="extendDomain"
                label={{ content: bandLabel(...(BAND_LABEL[b.key] ?? [b.label, b.label])) }}
              />
            ))}
            {markers.map((m, i) => (
              <ReferenceLine
                key={m.key}
                yAxisId="p"
                x={m.x}
                stroke={CHART_COLOURS.limit}
                strokeWidth={1.5}
                strokeDasharray="6 3"
                ifOverflow="extendDomain"
                label={{ content: verticalLabel(m.label, i % 2 === 0 ? "left" : "right") }}
              />
            ))}
            <Line
              yAxisId="p"
              dataKey="p"
              name={`Gauge pressure (${pUnit})`}
              stroke={CHART_COLOURS.line}
              strokeWidth={2}
              isAnimationActive={false}
              dot={(props) => {
                return marked[props.index] ? <PointMarker key={`o-${props.index}`} cx={Number(props.cx)} cy={Number(props.cy)} state="outside" size={4} /> : <g key={`n-${props.index}`} />;
              }}
              activeDot={{ r: 4 }}
            />
            {hasTemperature ? <Line yAxisId="c" dataKey="c" name={`Heater (${tUnit})`} stroke={CHART_COLOURS.heater} strokeWidth={2} strokeDasharray={HEATER_DASH} dot={false} isAnimationActive={false} /> : null}
          </ComposedChart>
        </ResponsiveContainer>
      </div>
      <ChartLegend
        label="Key to the pressure trace"
        items={[
          { key: "pressure", swatch: { kind: "line", colour: CHART_COLOURS.line }, text: `Gauge pressure (${pUnit})` },
          ...(hasTemperature ? [{ key: "heater", swatch: { kind: "line" as const, colour: CHART_COLOURS.heater, dash: HEATER_DASH }, text: `Heater temperature (${tUnit}, right axis)` }] : []),
          ...(bands.length ? [{ key: "band", swatch: { kind: "band" as const, colour: CHART_COLOURS.window, patternId }, text: "Pressure window of the plan, over the phase it governs" }] : []),
          ...(bands.length
            ? [{ key: "outside", swatch: { kind: "point" as const, state: "outside" as const }, text: outsideTotal ? `Sample outside its pressure window (${outsideTotal})` : "Sample outside its pressure window (none)" }]
            : []),
          ...(zones.length ? [{ key: "zone", swatch: { kind: "time-window" as const, colour: CHART_COLOURS.timeWindow }, text: "Time window of the plan" }] : []),
          ...(markers.length ? [{ key: "limit", swatch: { kind: "line" as const, colour: CHART_COLOURS.limit, dashed: true }, text: "Time limit, from the start of its phase" }] : []),
        ]}
      />
      <figcaption className="text-sm text-slate-700">
        Points are marked against the window as drawn; the verdict on the joint is the check below, which allows for the gauge&apos;s resolution.
      </figcaption>
    </figure>
  );
}
