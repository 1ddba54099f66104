// A job's run drawn as a straight line with the lot's joints on it (no map tiles): by
// station, else by coordinates, else by joint number. Out-of-limits joints are drawn as
// squares and named in the text list, so colour is never the only cue; a cut-out joint (no
// longer in the ground) is an open square.
import { layoutRun, type SchematicJoint } from "@/domain/coils/schematic";
import { formatQuantity, type UnitSystem } from "@/domain/units/format";

const BASIS_TEXT = { station: "placed by station", coordinates: "placed by latitude/longitude along the run", "joint-number": "placed by joint number (no stations or coordinates recorded)" } as const;

export function RunSchematic({ jobCode, jobName, joints, unitSystem }: { jobCode: string; jobName: string; joints: (SchematicJoint & { outOfLimits: boolean; isCutOut: boolean })[]; unitSystem: UnitSystem }) {
  const run = layoutRun(joints);
  const width = 800;
  const left = 40;
  const right = 40;
  const lineY = 60;
  const usable = width - left - right;
  const byId = new Map(joints.map((j) => [j.id, j]));
  // Joint numbers alternate above and below the line; a number is skipped when it would
  // crowd the previous one on its side (all joints stay in the table below).
  const lastX = [-Infinity, -Infinity];
  const labelRow = new Map<number, 0 | 1>();
  for (const p of [...run.points].sort((a, b) => a.t - b.t)) {
    const x = left + p.t * usable;
    const row = x - lastX[0]! >= 22 ? 0 : x - lastX[1]! >= 22 ? 1 : null;
    if (row !== null) {
      lastX[row] = x;
      labelRow.set(p.id, row);
    }
  }
  const titleId = `run-${jobCode.replace(/[^A-Za-z0-9]/g, "")}`;
  return (
    <figure className="flex flex-col gap-1">
      <svg viewBox={`0 0 ${width} 110`} className="w-full max-w-4xl rounded border border-slate-300 bg-white" role="img" aria-labelledby={titleId}>
        <title id={titleId}>{`${jobCode}: ${run.points.length} joints of the lot, ${BASIS_TEXT[run.basis]}`}</title>
        <line x1={left} y1={lineY} x2={width - right} y2={lineY} stroke="#0b4f6c" strokeWidth={4} />
        <text x={left} y={lineY + 44} fontSize={12} fill="#111827">
          start
        </text>
        <text x={width - right} y={lineY + 44} fontSize={12} textAnchor="end" fill="#111827">
          {run.lengthM != null ? formatQuantity(run.lengthM, "length-m", unitSystem) : "end"}
        </text>
        {run.points.map((p) => {
          const x = left + p.t * usable;
          const joint = byId.get(p.id)!;
          const row = labelRow.get(p.id);
          return (
            <g key={p.id}>
              {joint.isCutOut ? (
                <rect x={x - 6} y={lineY - 6} width={12} height={12} fill="#ffffff" stroke="#b91c1c" strokeWidth={2} />
              ) : joint.outOfLimits ? <rect x={x - 6} y={lineY - 6} width={12} height={12} fill="#b91c1c" /> : <circle cx={x} cy={lineY} r={6} fill="#166534" />}
              {row !== undefined ? (
                <text x={x} y={row === 0 ? lineY - 14 : lineY + 24} fontSize={11} textAnchor="middle" fill="#111827">
                  {p.jointNo}
                </text>
              ) : null}
            </g>
          );
        })}
      </svg>
      <figcaption className="text-sm text-slate-700">
        {jobCode} — {jobName}: joints {BASIS_TEXT[run.basis]}; circles within limits, squares out of limits
        {joints.some((j) => j.isCutOut) ? ", open squares cut out (no longer in the ground)" : ""}.
      </figcaption>
    </figure>
  );
}
