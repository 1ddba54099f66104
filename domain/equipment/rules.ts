// Equipment rules: whether a machine or heater plate may be used,
// and the heater-plate surface-temperature check (pass/fail against a procedure's heater
// window, next check due). Pure: dates are ISO 'YYYY-MM-DD', `on` is passed in.
//
// Sources: the heater face must be checked with a pyrometer or other surface thermometer
// before the first joint of the day and periodically (PPI "Melt Procedure" page,
// ASTM F2620, CONFIRMED); the gauge-pressure method needs the machine's total
// effective piston area (PPI TR-33 gauge method, CONFIRMED-2nd), so a machine without it
// cannot be planned for.

import { addDays, formatDayMonth } from '@/domain/dates/civil';

/**
 * A machine is usable for a joint when it is active and its total effective piston area
 * (mm²) is known and positive: without it no gauge pressure can be planned.
 */
export function isMachineUsable(machine: { isActive: boolean; pistonAreaMm2: number | null }): boolean {
  return machine.isActive && machine.pistonAreaMm2 !== null && Number.isFinite(machine.pistonAreaMm2) && machine.pistonAreaMm2 > 0;
}

/** Reasons a machine cannot be used, in words (empty when usable). */
export function machineProblems(machine: { assetTag: string; isActive: boolean; pistonAreaMm2: number | null }): string[] {
  const problems: string[] = [];
  if (!machine.isActive) problems.push(`Machine ${machine.assetTag} is retired (inactive).`);
  if (machine.pistonAreaMm2 === null || !(machine.pistonAreaMm2 > 0)) {
    problems.push(`Machine ${machine.assetTag} has no total effective piston area on record, so no gauge pressure can be planned; an admin must enter it from the machine's data plate.`);
  }
  return problems;
}

export interface HeaterReadings {
  /** Surface temperatures at several points of face A, °C. */
  faceA: number[];
  /** Surface temperatures at several points of face B, °C. */
  faceB: number[];
}

export interface HeaterWindow {
  minC: number;
  maxC: number;
}

export interface HeaterCheckJudgement {
  passed: boolean;
  lowestC: number;
  highestC: number;
  /** One plain-language line per reading outside the window. */
  misses: string[];
}

/**
 * Judge a surface-temperature check: it passes when every reading on both faces lies
 * inside the procedure's heater window (inclusive at both ends). Readings in °C; the
 * comparison uses the readings as typed (no rounding), so 232.3 °C fails a 232.2 °C top.
 */
export function judgeHeaterCheck(readings: HeaterReadings, window: HeaterWindow): HeaterCheckJudgement {
  const all = [...readings.faceA, ...readings.faceB];
  if (all.length === 0) throw new Error('A heater check needs at least one reading');
  const misses: string[] = [];
  const note = (face: 'A' | 'B', values: number[]) =>
    values.forEach((value, i) => {
      if (value < window.minC) misses.push(`Face ${face} point ${i + 1}: ${value} °C is below the window's ${round1(window.minC)} °C`);
      else if (value > window.maxC) misses.push(`Face ${face} point ${i + 1}: ${value} °C is above the window's ${round1(window.maxC)} °C`);
    });
  note('A', readings.faceA);
  note('B', readings.faceB);
  return { passed: misses.length === 0, lowestC: Math.min(...all), highestC: Math.max(...all), misses };
}

function round1(value: number): number {
  return Math.round(value * 10) / 10;
}

/** The next check is due `intervalDays` after the day of this check (1 = the next day). */
export function heaterNextDueOn(checkedOn: string, intervalDays: number): string {
  if (!Number.isInteger(intervalDays) || intervalDays < 1) throw new Error('Check interval must be a whole number of days, 1 or more');
  return addDays(checkedOn, intervalDays);
}

export interface HeaterState {
  isActive: boolean;
  /** The latest check, or null when the plate has never been checked. */
  lastCheck: { passed: boolean; nextDueOn: string } | null;
}

/** Overdue: never checked, or `on` is on or after the next-due day (the check is due that morning). */
export function isHeaterCheckOverdue(heater: HeaterState, on: string): boolean {
  return heater.lastCheck === null || on >= heater.lastCheck.nextDueOn;
}

/** Flagged: the latest check was outside the window; only a passing check clears it. */
export function isHeaterFlagged(heater: HeaterState): boolean {
  return heater.lastCheck !== null && !heater.lastCheck.passed;
}

/** Reasons a heater plate cannot be used on `on` (empty when usable). */
export function heaterProblems(heater: HeaterState & { assetTag: string }, on: string): string[] {
  const problems: string[] = [];
  if (!heater.isActive) problems.push(`Heater plate ${heater.assetTag} is retired (inactive).`);
  if (isHeaterFlagged(heater)) problems.push(`Heater plate ${heater.assetTag} failed its last surface-temperature check; it stays flagged until a check passes.`);
  else if (heater.lastCheck === null) problems.push(`Heater plate ${heater.assetTag} has no surface-temperature check on record.`);
  else if (isHeaterCheckOverdue(heater, on)) problems.push(`Heater plate ${heater.assetTag} is due a surface-temperature check (due ${heater.lastCheck.nextDueOn}).`);
  return problems;
}

/**
 * A heater plate's check state in words for a short line on the phone, judged on `on`
 * by the same rule as the block (isHeaterCheckOverdue): "check overdue since 30 Nov",
 * "check due 3 Dec", "last check failed", "never checked".
 */
export function heaterCheckPhrase(heater: HeaterState, on: string): string {
  if (heater.lastCheck === null) return 'never checked';
  if (!heater.lastCheck.passed) return 'last check failed';
  if (isHeaterCheckOverdue(heater, on)) return `check overdue since ${formatDayMonth(heater.lastCheck.nextDueOn)}`;
  return `check due ${formatDayMonth(heater.lastCheck.nextDueOn)}`;
}
