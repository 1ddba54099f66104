// SI <-> US customary conversion factors and converters for the quantities Beadline
// records. Canonical units inside the domain: mm, m, mm², MPa, °C, s.
// Sources: NIST SP 811 (2008) Appendix B — the inch (25.4 mm) and foot (0.3048 m) are
// exact by definition; 1 lbf = 4.4482216152605 N exactly, so
// 1 psi = 4.4482216152605 N / 645.16 mm² = 0.006894757293168361 MPa.

/** Millimetres in one inch (exact, NIST SP 811). */
export const MM_PER_IN = 25.4;
/** Metres in one foot (exact, NIST SP 811). */
export const M_PER_FT = 0.3048;
/** Square millimetres in one square inch (25.4², exact). */
export const MM2_PER_IN2 = MM_PER_IN * MM_PER_IN;
/** Newtons in one pound-force (exact, NIST SP 811). */
export const N_PER_LBF = 4.4482216152605;
/** MPa in one psi (lbf/in² → N/mm²), derived from the exact factors above. */
export const MPA_PER_PSI = N_PER_LBF / MM2_PER_IN2;

/** Length: inches → millimetres (exact factor). */
export function inToMm(inches: number): number {
  return inches * MM_PER_IN;
}

/** Length: millimetres → inches (exact factor). */
export function mmToIn(mm: number): number {
  return mm / MM_PER_IN;
}

/** Length: feet → metres (exact factor). */
export function ftToM(feet: number): number {
  return feet * M_PER_FT;
}

/** Length: metres → feet (exact factor). */
export function mToFt(m: number): number {
  return m / M_PER_FT;
}

/** Pressure: psi → MPa (1 psi = 0.006894757… MPa). */
export function psiToMpa(psi: number): number {
  return psi * MPA_PER_PSI;
}

/** Pressure: MPa → psi. */
export function mpaToPsi(mpa: number): number {
  return mpa / MPA_PER_PSI;
}

/** Temperature: °C → °F (°F = °C × 9/5 + 32). */
export function cToF(celsius: number): number {
  return (celsius * 9) / 5 + 32;
}

/** Temperature: °F → °C (°C = (°F − 32) × 5/9). */
export function fToC(fahrenheit: number): number {
  return ((fahrenheit - 32) * 5) / 9;
}

/** Area: in² → mm² (exact factor 645.16). */
export function in2ToMm2(squareInches: number): number {
  return squareInches * MM2_PER_IN2;
}

/** Area: mm² → in². */
export function mm2ToIn2(squareMm: number): number {
  return squareMm / MM2_PER_IN2;
}

/** Time: minutes → seconds. */
export function minToS(minutes: number): number {
  return minutes * 60;
}
