// The reading resolution of a fusion machine's instruments, copied into the plan so the
// joint check knows how finely a pressure or a temperature could be read. A reading
// passes a limit when it is within half a resolution step of it: an instrument that reads
// in steps of r shows the limit for any true value within ±r/2 of it (the usual
// half-a-division reading uncertainty of a graduated or digital instrument), so the
// reading cannot tell such a value from the limit. Further out, it is over.

/** Resolution (smallest step read) of the machine's gauge and of the heater thermometer. */
export interface InstrumentResolution {
  /** Hydraulic gauge, MPa; null = not known (no tolerance). */
  gaugeResolutionMpa: number | null;
  /** Heater thermometer or pyrometer, °C; null = not known (no tolerance). */
  thermometerResolutionC: number | null;
}

/**
 * Defaults for a machine without its own (common practice, not from a standard): a
 * gauge read to 0.05 MPa (half a bar, about 7 psi — a minor division of a 0–250 bar /
 * 0–3000 psi fusion-machine gauge) and a digital surface thermometer reading whole °C.
 */
export const DEFAULT_INSTRUMENT_RESOLUTION: InstrumentResolution = { gaugeResolutionMpa: 0.05, thermometerResolutionC: 1 };

/** The plan with the machine's instrument resolution attached (plan values untouched). */
export function withInstrument<P extends object>(plan: P, machine: Partial<InstrumentResolution>): P & { instrument: InstrumentResolution } {
  return { ...plan, instrument: { gaugeResolutionMpa: machine.gaugeResolutionMpa ?? null, thermometerResolutionC: machine.thermometerResolutionC ?? null } };
}

/** Half a step of the resolution: how far past a limit a reading may sit and still pass; 0 when unknown. */
export function readingTolerance(resolution: number | null | undefined): number {
  return typeof resolution === 'number' && Number.isFinite(resolution) && resolution > 0 ? resolution / 2 : 0;
}
