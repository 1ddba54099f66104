// The joint the browser tests type at the trench for the demo pipe (2" IPS SDR 11 coils on
// machine FM-201), in the demo fuser's US customary units, with the values worked from
// published texts rather than from Beadline's code:
// - heater 425 °F inside 400–450 °F // source: ASTM F2620 via the PPI "Melt Procedure" page (CONFIRMED)
// - fusion gauge = interfacial pressure × fusion area ÷ piston area + drag, 75 psi interfacial
//   (mid of 60–90 psi), OD 2.375 in, wall 0.216 in, FM-201's 1006.5 mm² piston area
//   // source: PPI generic butt-fusion procedure, gauge method (PPI TR-33, as reproduced in a pipe maker's manual §6.2.5)
// - bead 1/8 in over the 1/16 in minimum, changeover 6 s under 8 s, cooling 300 s over
//   11 min/in × 0.216 in ≈ 143 s // from memory, unconfirmed (ASTM F2620 tables)
import type { TypedJoint } from "./trench-page";

const OD_IN = 60.33 / 25.4; // 2" IPS outside diameter 2.375 in (ASTM D2513 / ASME B36.10 IPS), 60.33 mm on the demo coil label
const WALL_IN = 0.216; // 2" IPS DR 11 minimum wall, in (ASTM F2897-23a Table 6)
const PISTON_AREA_IN2 = 1006.5 / 25.4 ** 2; // FM-201's total effective piston area, demo data
export const DRAG_PSI = 10;

/** Gauge pressure (psi) that gives `ifpPsi` interfacial pressure on the demo pipe on FM-201 at DRAG_PSI drag. */
export function fusionGaugePsi(ifpPsi: number): number {
  return (ifpPsi * Math.PI * (OD_IN - WALL_IN) * WALL_IN) / PISTON_AREA_IN2 + DRAG_PSI;
}

/** A joint within limits on the demo pipe; each test names its coils, length laid and station. */
export function demoTypedJoint(place: Pick<TypedJoint, "coilA" | "coilB" | "laidA" | "station">): TypedJoint {
  return {
    ...place,
    drag: String(DRAG_PSI),
    heaterTemperature: "425",
    fusionGauge: String(Math.round(fusionGaugePsi(75))),
    bead: "0.125",
    heatSoak: "45",
    changeover: "6",
    cooling: "300",
    ambient: "50",
    shelter: "Windbreak",
  };
}
