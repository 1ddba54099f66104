// Parser of Beadline's own pressure-trace CSV: a header line
// `seconds,gauge_pressure_mpa[,heater_temperature_c]` (or `gauge_pressure_psi`), then one
// sample per line. psi is converted to MPa (NIST SP 811 factor, see units/conversions.ts).

import { psiToMpa } from '@/domain/units/conversions';

export interface PressureSample {
  /** Time from the start of the record, s. */
  seconds: number;
  /** Gauge pressure of the carriage cylinders, MPa. */
  gaugePressureMpa: number;
  /** Heater surface temperature, °C, when the file has that column. */
  heaterTemperatureC?: number;
}

export interface TraceLineError {
  /** 1-based line number in the file. */
  line: number;
  message: string;
}

export type ParsePressureTraceResult =
  | { ok: true; samples: PressureSample[]; pressureUnit: 'mpa' | 'psi' }
  | { ok: false; errors: TraceLineError[] };

/** Stop listing after this many errors; a wholly wrong file would otherwise list thousands. */
export const MAX_TRACE_ERRORS = 20;

const NUMBER = /^[-+]?(\d+(\.\d*)?|\.\d+)([eE][-+]?\d+)?$/;

/**
 * Parse trace CSV text. Accepts a UTF-8 BOM, CRLF or LF, blank lines and lines starting
 * with '#' (comments). Header names are case-insensitive; columns in the order above.
 * Each sample line must have the header's number of fields, numeric values, time ≥ 0
 * and strictly increasing, pressure ≥ 0 (gauge). A gap in time (a missing sample) is
 * allowed. Returns every error (up to 20) with its line number.
 */
export function parsePressureTraceCsv(text: string): ParsePressureTraceResult {
  const lines = text.replace(/^\uFEFF/, '').split(/\r\n|\n|\r/);
  const errors: TraceLineError[] = [];
  let headerLine = -1;
  for (let i = 0; i < lines.length; i += 1) {
    const trimmed = (lines[i] as string).trim();
    if (trimmed !== '' && !trimmed.startsWith('#')) {
      headerLine = i;
      break;
    }
  }
  if (headerLine < 0) return { ok: false, errors: [{ line: 1, message: 'The file is empty; expected a header line "seconds,gauge_pressure_mpa"' }] };

  const header = (lines[headerLine] as string).split(',').map((name) => name.trim().toLowerCase());
  const headerProblem = (): string | null => {
    if (header.length < 2 || header.length > 3) return `Expected 2 or 3 columns in the header, found ${header.length}`;
    if (header[0] !== 'seconds') return `The first column must be "seconds", not "${header[0]}"`;
    if (header[1] !== 'gauge_pressure_mpa' && header[1] !== 'gauge_pressure_psi') {
      return `The second column must be "gauge_pressure_mpa" or "gauge_pressure_psi", not "${header[1]}"`;
    }
    if (header.length === 3 && header[2] !== 'heater_temperature_c') return `The third column must be "heater_temperature_c", not "${header[2]}"`;
    return null;
  };
  const problem = headerProblem();
  if (problem) return { ok: false, errors: [{ line: headerLine + 1, message: problem }] };
  const pressureUnit = header[1] === 'gauge_pressure_psi' ? 'psi' : 'mpa';
  const hasTemperature = header.length === 3;

  const samples: PressureSample[] = [];
  let previous: { seconds: number; line: number } | null = null;
  for (let i = headerLine + 1; i < lines.length && errors.length < MAX_TRACE_ERRORS; i += 1) {
    const trimmed = (lines[i] as string).trim();
    if (trimmed === '' || trimmed.startsWith('#')) continue;
    const line = i + 1;
    const fields = trimmed.split(',').map((field) => field.trim());
    if (fields.length !== header.length) {
      errors.push({ line, message: `Expected ${header.length} values (${header.join(', ')}), found ${fields.length}` });
      continue;
    }
    const bad = fields.findIndex((field) => !NUMBER.test(field));
    if (bad >= 0) {
      errors.push({ line, message: fields[bad] === '' ? `The ${header[bad]} value is empty` : `"${fields[bad]}" in ${header[bad]} is not a number` });
      continue;
    }
    const [seconds, pressure, temperature] = fields.map(Number) as [number, number, number | undefined];
    if (seconds < 0) {
      errors.push({ line, message: `Time ${seconds} s is negative` });
      continue;
    }
    if (previous && seconds <= previous.seconds) {
      errors.push({ line, message: `Time ${seconds} s is not after ${previous.seconds} s on line ${previous.line}; times must increase` });
      continue;
    }
    if (pressure < 0) {
      errors.push({ line, message: `Gauge pressure ${pressure} is negative` });
      continue;
    }
    previous = { seconds, line };
    const sample: PressureSample = { seconds, gaugePressureMpa: pressureUnit === 'psi' ? psiToMpa(pressure) : pressure };
    if (hasTemperature && temperature !== undefined) sample.heaterTemperatureC = temperature;
    samples.push(sample);
  }
  if (errors.length === 0 && samples.length === 0) {
    errors.push({ line: headerLine + 1, message: 'The file has a header but no samples' });
  }
  return errors.length > 0 ? { ok: false, errors } : { ok: true, samples, pressureUnit };
}

/** Samples → CSV text in this format (MPa or psi), e.g. for fixtures and downloads. */
export function pressureTraceToCsv(samples: readonly PressureSample[], unit: 'mpa' | 'psi' = 'mpa'): string {
  const hasTemperature = samples.some((sample) => sample.heaterTemperatureC !== undefined);
  const header = ['seconds', unit === 'psi' ? 'gauge_pressure_psi' : 'gauge_pressure_mpa', ...(hasTemperature ? ['heater_temperature_c'] : [])];
  const rows = samples.map((sample) => {
    const pressure = unit === 'psi' ? sample.gaugePressureMpa / psiToMpa(1) : sample.gaugePressureMpa;
    const values = [round(sample.seconds, 3), round(pressure, unit === 'psi' ? 2 : 4)];
    if (hasTemperature) values.push(round(sample.heaterTemperatureC ?? Number.NaN, 1));
    return values.join(',');
  });
  return `${header.join(',')}\n${rows.join('\n')}\n`;
}

function round(value: number, decimals: number): string {
  return Number.isFinite(value) ? String(Math.round(value * 10 ** decimals) / 10 ** decimals) : '';
}
