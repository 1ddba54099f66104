// Parts the Review trace chart and the Insights charts share: point markers that differ by
// shape (filled circle inside the window, hollow triangle outside, small square where no
// window applies), a hatched window fill that survives printing in black and white, labels
// with a white halo that stay readable over hatching and lines, and a legend drawn outside
// the plot as an HTML list that wraps on a phone.
import type { ReactNode } from "react";
import type { WindowState } from "@/domain/charts/windows";

export const CHART_COLOURS = {
  line: "#0b4f6c",
  inside: "#166534",
  outside: "#8b1c1c",
  none: "#475569",
  window: "#166534",
  timeWindow: "#92400e",
  limit: "#92400e",
  heater: "#6b21a8",
} as const;

const OUTSIDE_STROKE = 2;

/** A point marker centred on (cx, cy), its shape telling inside from outside; `data-point` names the state for tests. */
export function PointMarker({ cx, cy, state, size = 5 }: { cx: number; cy: number; state: WindowState; size?: number }) {
  if (!Number.isFinite(cx) || !Number.isFinite(cy)) return <g />;
  if (state === "outside") {
    const s = size + 2;
    // Hollow triangle, point up, with a white fill so it reads over the line and the hatching.
    const d = `M${cx},${cy - s} L${cx + s},${cy + s * 0.8} L${cx - s},${cy + s * 0.8} Z`;
    return <path data-point="outside" d={d} fill="#ffffff" stroke={CHART_COLOURS.outside} strokeWidth={OUTSIDE_STROKE} />;
  }
  if (state === "inside") return <circle data-point="inside" cx={cx} cy={cy} r={size - 1} fill={CHART_COLOURS.inside} stroke="#ffffff" strokeWidth={1} />;
  return <rect data-point="none" x={cx - (size - 1)} y={cy - (size - 1)} width={(size - 1) * 2} height={(size - 1) * 2} fill={CHART_COLOURS.none} />;
}

/** The diagonal hatch a window band is filled with (put once inside the chart's SVG). */
export function HatchPattern({ id, colour = CHART_COLOURS.window }: { id: string; colour?: string }) {
  return (
    <defs>
      <pattern id={id} width={8} height={8} patternUnits="userSpaceOnUse" patternTransform="rotate(45)">
        <rect width={8} height={8} fill={colour} fillOpacity={0.12} />
        <line x1={0} y1={0} x2={0} y2={8} stroke={colour} strokeWidth={2} strokeOpacity={0.55} />
      </pattern>
    </defs>
  );
}

/** The top-left corner of the box recharts hands a label (cartesian: x, y; anything else: 0, 0). */
function corner(viewBox: unknown): { x: number; y: number } {
  const box = (viewBox ?? {}) as { x?: unknown; y?: unknown };
  return { x: typeof box.x === "number" ? box.x : 0, y: typeof box.y === "number" ? box.y : 0 };
}

/** Text with a white halo (drawn under the glyphs), readable over hatching, grid and lines. */
function HaloText({ x, y, children, anchor = "start", rotate = false, colour = "#0f172a" }: { x: number; y: number; children: ReactNode; anchor?: "start" | "end" | "middle"; rotate?: boolean; colour?: string }) {
  return (
    <text
      x={rotate ? 0 : x}
      y={rotate ? 0 : y}
      transform={rotate ? `translate(${x},${y}) rotate(-90)` : undefined}
      textAnchor={anchor}
      fontSize={12}
      fontWeight={600}
      fill={colour}
      stroke="#ffffff"
      strokeWidth={4}
      strokeLinejoin="round"
      paintOrder="stroke"
    >
      {children}
    </text>
  );
}

/** Rough width of a label at 12 px semibold (about 7 px a character), to decide whether it fits. */
const textWidth = (text: string) => text.length * 7;

/**
 * Label inside a band (recharts passes the band's box as `viewBox`): across its top-left
 * corner when it fits, else `short` reading upwards inside a narrow band, else none (the
 * key below the chart and its summary still name it).
 */
export function bandLabel(text: string, short: string = text) {
  function BandLabel({ viewBox }: { viewBox?: unknown }) {
    const { x, y } = corner(viewBox);
    const box = (viewBox ?? {}) as { width?: unknown; height?: unknown };
    const width = typeof box.width === "number" ? Math.abs(box.width) : 0;
    const height = typeof box.height === "number" ? Math.abs(box.height) : 0;
    if (width >= textWidth(text) + 8 && height >= 18) return <HaloText x={x + 4} y={y + 14}>{text}</HaloText>;
    if (width >= 16 && height >= textWidth(short) + 8) {
      return (
        <HaloText x={x + width / 2 + 5} y={y + 4} anchor="end" rotate>
          {short}
        </HaloText>
      );
    }
    return <g />;
  }
  return BandLabel;
}

/**
 * Label along a vertical line or the left edge of a time window, reading upwards from the
 * plot's top; `side` puts it left or right of the line so neighbouring lines' labels part.
 */
export function verticalLabel(text: string, side: "left" | "right", colour: string = CHART_COLOURS.limit) {
  function VerticalLabel({ viewBox }: { viewBox?: unknown }) {
    const { x, y } = corner(viewBox);
    return (
      <HaloText x={side === "left" ? x - 4 : x + 14} y={y + 4} anchor="end" rotate colour={colour}>
        {text}
      </HaloText>
    );
  }
  return VerticalLabel;
}

/** What one legend entry shows before its words. */
export type LegendSwatch =
  | { kind: "line"; colour: string; dashed?: boolean; dash?: string }
  | { kind: "band"; colour: string; patternId: string }
  | { kind: "time-window"; colour: string }
  | { kind: "point"; state: WindowState }
  | { kind: "bar"; colour: string };

function Swatch({ swatch }: { swatch: LegendSwatch }) {
  const box = { width: 28, height: 16, viewBox: "0 0 28 16", "aria-hidden": true, className: "shrink-0" } as const;
  switch (swatch.kind) {
    case "line":
      return (
        <svg {...box}>
          <line x1={1} y1={8} x2={27} y2={8} stroke={swatch.colour} strokeWidth={swatch.dashed || swatch.dash ? 2 : 3} strokeDasharray={swatch.dash ?? (swatch.dashed ? "6 3" : undefined)} />
        </svg>
      );
    case "band":
      return (
        <svg {...box}>
          <HatchPattern id={`${swatch.patternId}-key`} colour={swatch.colour} />
          <rect x={1} y={2} width={26} height={12} fill={`url(#${swatch.patternId}-key)`} stroke={swatch.colour} strokeWidth={1.5} />
        </svg>
      );
    case "time-window":
      return (
        <svg {...box}>
          <rect x={1} y={2} width={26} height={12} fill="#fef3c7" stroke={swatch.colour} strokeWidth={1.5} strokeDasharray="3 2" />
        </svg>
      );
    case "point":
      return (
        <svg {...box}>
          <PointMarker cx={14} cy={8} state={swatch.state} />
        </svg>
      );
    case "bar":
      return (
        <svg {...box}>
          <rect x={6} y={2} width={16} height={12} fill={swatch.colour} />
        </svg>
      );
  }
}

/** The chart's key, below the plot so it covers nothing; wraps on a narrow screen. */
export function ChartLegend({ items, label = "Key" }: { items: { key: string; swatch: LegendSwatch; text: ReactNode }[]; label?: string }) {
  return (
    <ul aria-label={label} className="flex flex-wrap gap-x-4 gap-y-1 text-sm text-slate-800">
      {items.map((item) => (
        <li key={item.key} className="flex min-w-0 items-center gap-1.5">
          <Swatch swatch={item.swatch} />
          <span className="min-w-0">{item.text}</span>
        </li>
      ))}
    </ul>
  );
}
