/**
 * Safety cautions shown where the work is described. Beadline records and checks; it does
 * not replace the operator's qualified procedure, local codes or the qualified person.
 */
export const CAUTIONS = {
  heater: "Heater plates run near 200–230 °C (400–450 °F) and burn: keep the plate in its stand, clean it only as the tool maker says (never with solvents).",
  pinch: "Keep hands out of the carriage, clamps and facer while they move or close.",
  coil: "Coiled pipe stores energy: restrain the free end before cutting bands and stand clear of its path while uncoiling or re-rounding.",
  static: "Static on PE gas pipe can ignite escaping gas: wet and ground the pipe as your procedure requires before cutting or squeezing off.",
  procedure: "Follow your operator's qualified written procedure, local codes and licensed practice; Beadline records and checks, it does not replace them.",
} as const;

export type CautionKind = keyof typeof CAUTIONS;

export function Cautions({ kinds = ["heater", "pinch", "coil", "static", "procedure"], title = "Safety" }: { kinds?: CautionKind[]; title?: string }) {
  return (
    <aside aria-label={title} className="rounded-md border-2 border-caution bg-caution-light p-3 text-sm text-caution">
      <h2 className="mb-1 font-bold">{title}</h2>
      <ul className="list-disc space-y-1 pl-5">
        {kinds.map((k) => (
          <li key={k}>{CAUTIONS[k]}</li>
        ))}
      </ul>
    </aside>
  );
}
