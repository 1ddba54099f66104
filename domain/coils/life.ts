// Coil life: the rules a coil follows from receipt to used up — the length left after each
// pull at the trench (never negative), the warning when the next run is longer than what
// is left, the verdict of the receipt inspection, where an ASTM F2897 code disagrees with
// the fields typed from the print line, and the status moves (helper rules of
// domain/coils, plus what each move needs: a crew for the trailer, a job for use).
// Lengths in m, kept to the centimetre like the database (DECIMAL(9,2)).

import { DomainError } from '@/domain/errors';
import { coilMoveProblem } from '@/domain/coils/planning';
import { COIL_STATUSES, type CoilStatus } from '@/domain/coils/statuses';
import { findPipeSize, type PipeSeries } from '@/domain/pipe/catalogue';
import { MATERIAL_CODES, TABLE_6_SIZE_FACTORS, parseTraceCode, sizeFactorFor, type TraceCodeValue } from '@/domain/trace-code/trace-code';
import { formatQuantity, type UnitSystem } from '@/domain/units/format';

export { COIL_STATUSES, COIL_STATUS_LABELS, type CoilStatus } from '@/domain/coils/statuses';

/** Metres → whole centimetres (the stored resolution), so comparisons never drift. */
export function toCentimetres(m: number): number {
  return Math.round(m * 100);
}

export type PullPlan =
  | { ok: true; remainingM: number; status: CoilStatus; isUsedUp: boolean }
  | { ok: false; reason: 'not-a-number' | 'not-positive' | 'too-long' | 'quarantined' | 'used-up'; message: string };

/**
 * What a pull of `pullM` metres does to a coil: the length left (to the cm, never below 0)
 * and the status after it (in use; used up when nothing is left). Refused, with a message
 * naming the coil: a pull that is not a positive number, a pull longer than what is left
 * ("LV-C0001 has only 12.00 m left; the pull of 20.00 m is longer"), a quarantined or used-up
 * coil. Pulls from a coil in the yard or on a trailer are accepted (the pipe was laid; the
 * record must say so) and put it in use. Our rule (common practice, no published source).
 */
export function planPull(
  coil: { coilCode: string; status: CoilStatus; remainingM: number; statusReason?: string | null },
  pullM: number,
  system: UnitSystem = 'si',
): PullPlan {
  // Centimetres in SI (the stored resolution), tenths of a foot in US units.
  const show = (m: number) => formatQuantity(m, 'length-m', system, { decimals: system === 'si' ? 2 : 1 });
  if (typeof pullM !== 'number' || !Number.isFinite(pullM)) {
    return { ok: false, reason: 'not-a-number', message: `The length pulled from ${coil.coilCode} must be a number` };
  }
  const pullCm = toCentimetres(pullM);
  if (pullCm <= 0) {
    return { ok: false, reason: 'not-positive', message: `The length pulled from ${coil.coilCode} must be more than 0 (got ${show(pullM)})` };
  }
  if (coil.status === 'quarantined') {
    return {
      ok: false,
      reason: 'quarantined',
      message: `${coil.coilCode} is quarantined${coil.statusReason ? ` (${coil.statusReason})` : ''}; pipe from it must not be laid`,
    };
  }
  const leftCm = Math.max(0, toCentimetres(coil.remainingM));
  if (coil.status === 'used-up' || leftCm === 0) {
    return { ok: false, reason: 'used-up', message: `${coil.coilCode} is used up; nothing is left to pull` };
  }
  if (pullCm > leftCm) {
    return { ok: false, reason: 'too-long', message: `${coil.coilCode} has only ${show(leftCm / 100)} left; the pull of ${show(pullCm / 100)} is longer` };
  }
  const afterCm = leftCm - pullCm;
  return { ok: true, remainingM: afterCm / 100, status: afterCm === 0 ? 'used-up' : 'in-use', isUsedUp: afterCm === 0 };
}

/**
 * Coil length left after pulling pipe off it, m: planPull's length (to the centimetre) for
 * a coil in use, as a number. Refuses, with a message in the user's units, a pull that is
 * not a number, is zero or negative, or is longer than what is left. Throws DomainError.
 */
export function coilLengthAfterPull(input: { remainingM: number; pullM: number }, system: UnitSystem = 'si'): number {
  const m = (value: number) => formatQuantity(value, 'length-m', system);
  if (typeof input.remainingM !== 'number' || !Number.isFinite(input.remainingM) || input.remainingM < 0) {
    throw new DomainError('invalid-input', `Length left on the coil must be a number of 0 or more (got ${String(input.remainingM)})`);
  }
  const plan = planPull({ coilCode: 'the coil', status: 'in-use', remainingM: input.remainingM }, input.pullM, system);
  if (plan.ok) return plan.remainingM;
  switch (plan.reason) {
    case 'not-a-number':
      throw new DomainError('invalid-input', 'The length pulled must be a number');
    case 'not-positive':
      throw new DomainError('invalid-input', `The length pulled must be more than 0 (got ${m(input.pullM)})`);
    default:
      throw new DomainError('invalid-input', `Cannot pull ${m(input.pullM)}: only ${m(input.remainingM)} is left on the coil`);
  }
}

/**
 * Warning for the coil page and the trench: the next run is longer than what is left on
 * the coil, so a coil-to-coil joint (or another coil) will be needed. null when it fits
 * or no run length is given. Our rule (common practice, no published source).
 */
export function nextRunWarning(coil: { coilCode: string; remainingM: number }, nextRunM: number | null | undefined, system: UnitSystem = 'si'): string | null {
  if (nextRunM == null || !Number.isFinite(nextRunM) || nextRunM <= 0) return null;
  const leftCm = Math.max(0, toCentimetres(coil.remainingM));
  const runCm = toCentimetres(nextRunM);
  if (runCm <= leftCm) return null;
  const show = (m: number) => formatQuantity(m, 'length-m', system);
  return `The next run of ${show(runCm / 100)} is longer than the ${show(leftCm / 100)} left on ${coil.coilCode}: ${show((runCm - leftCm) / 100)} must come from another coil, with a joint between them`;
}

export type DamageKind = 'gouge' | 'kink' | 'flattening';
export const DAMAGE_KINDS: readonly DamageKind[] = ['gouge', 'kink', 'flattening'];
export const DAMAGE_LABELS: Readonly<Record<DamageKind, string>> = {
  gouge: 'Gouges or scratches',
  kink: 'Kinks or buckles',
  flattening: 'Flattening',
};

/**
 * Default operator's limit for a gouge, % of the minimum wall: damage deeper than 10 % of
 * the wall is cut out. From memory, unconfirmed (a common operator and pipe-maker rule);
 * the clerk can enter the operator's own limit on the receipt form.
 */
export const DEFAULT_GOUGE_LIMIT_PCT = 10;
/**
 * Default ovality limit for coiled pipe at the end, %: about 5 % (ASTM D2513 coiled-pipe
 * clause as recalled for ≤ 3" IPS; FROM MEMORY, UNCONFIRMED).
 */
export const DEFAULT_OVALITY_LIMIT_PCT = 5;

export interface ReceiptInspectionInput {
  outsideDiameterMm: number;
  sdr: number;
  damageKinds: readonly DamageKind[];
  /** Deepest gouge measured, mm; null when none was measured. */
  gougeDepthMm: number | null;
  gougeLimitPct: number;
  ovalityPct: number | null;
  ovalityLimitPct: number;
  endCapsInPlace: boolean;
}

/**
 * Receipt inspection verdict. Fails (the coil is quarantined) when: a gouge is deeper than
 * the limit (% of the minimum wall OD/SDR, ASTM D3035), or gouges are reported
 * without a depth; a kink or flattening is reported; the ovality at the end is above the
 * limit (ovality = (d_max − d_min)/d_n × 100 %, ISO 11922-1); the end caps are missing
 * (the bore may be contaminated). Each reason is a plain sentence.
 */
export function judgeReceiptInspection(input: ReceiptInspectionInput): { passed: boolean; reasons: string[] } {
  const reasons: string[] = [];
  const wallMm = input.outsideDiameterMm / input.sdr;
  const limitMm = (wallMm * input.gougeLimitPct) / 100;
  if (input.gougeDepthMm != null && input.gougeDepthMm > 0) {
    if (toHundredths(input.gougeDepthMm) > toHundredths(limitMm)) {
      reasons.push(`Gouge ${input.gougeDepthMm.toFixed(2)} mm deep is deeper than the limit of ${limitMm.toFixed(2)} mm (${input.gougeLimitPct} % of the ${wallMm.toFixed(2)} mm minimum wall)`);
    }
  } else if (input.damageKinds.includes('gouge')) {
    reasons.push('Gouges reported without a measured depth: measure the deepest one before the coil is released');
  }
  if (input.damageKinds.includes('kink')) reasons.push('Kinked or buckled pipe');
  if (input.damageKinds.includes('flattening')) reasons.push('Flattened pipe');
  if (input.ovalityPct != null && input.ovalityPct > input.ovalityLimitPct) {
    reasons.push(`Ovality at the end ${input.ovalityPct} % is above the ${input.ovalityLimitPct} % limit`);
  }
  if (!input.endCapsInPlace) reasons.push('End caps missing: the bore may be contaminated');
  return { passed: reasons.length === 0, reasons };
}

function toHundredths(mm: number): number {
  return Math.round(mm * 100);
}

/** Fields the receipt form fills from a traceability code (form field names). */
export interface FieldsFromTraceCode {
  manufacturerCode: string;
  lot: string;
  productionDate: string;
  material: string;
  series?: PipeSeries;
  nominalSize?: string;
  sdr?: number;
  outsideDiameterMm?: number;
}

/** Table 6 entry of a size factor, or undefined (e.g. "000": no factor found). */
function sizeFromFactor(factor: number) {
  return TABLE_6_SIZE_FACTORS.find((row) => row.factor === factor);
}

/**
 * The receipt fields an F2897 code encodes: manufacturer id, lot (7 digits), production
 * date, material (Table 4) and, for an in-line component with a Table 6 factor (C1 = C2),
 * the series, nominal size, SDR and OD. CTS tubing is sold by wall, so its SDR is
 * OD / wall rounded to 0.01. Source: ASTM F2897-23a Tables 1, 4, 6 and §5.7.
 */
export function fieldsFromTraceCode(value: TraceCodeValue): FieldsFromTraceCode {
  const fields: FieldsFromTraceCode = {
    manufacturerCode: value.manufacturer,
    lot: value.lot,
    productionDate: value.productionDate,
    material: value.material,
  };
  const factors = value.sizeFactors;
  if (factors && factors[0] === factors[1]) {
    const row = sizeFromFactor(factors[1]);
    if (row) {
      const size = findPipeSize(row.series, row.nominal);
      fields.series = row.series;
      fields.nominalSize = row.nominal;
      fields.outsideDiameterMm = size.outsideDiameterMm;
      fields.sdr = row.sdr ?? Math.round(((size.outsideDiameterIn ?? 0) / row.wallIn) * 100) / 100;
    }
  }
  return fields;
}

/** The receipt form fields a traceability code can fill (form field names). */
export type CodeFilledField = 'manufacturerCode' | 'manufacturer' | 'lot' | 'productionDate' | 'material' | 'series' | 'nominalSize' | 'sdr';

/** What the code gave each field it filled, as the form holds it (text). */
export type CodeFill = Partial<Record<CodeFilledField, string>>;

const SIZE_GROUP: readonly CodeFilledField[] = ['series', 'nominalSize', 'sdr'];

export interface CodeRefill {
  /** Values to put in the form: the new code's values, and '' or the form's default for fields it no longer gives. */
  set: CodeFill;
  /** Fields the new code filled or changed, in form order. */
  filled: CodeFilledField[];
  /** Fields the previous code filled that the new code does not give: emptied (or back to the form's default). */
  cleared: CodeFilledField[];
  /** Fields typed by hand that differ from the new code: kept, and flagged by traceCodeDisagreements. */
  kept: CodeFilledField[];
  /** What the code has now filled: pass it back as `previousFill` on the next change of code. */
  fill: CodeFill;
}

/**
 * What a (changed) traceability code does to the receipt form. A field is the code's to
 * (re)fill when it is empty or still holds what the previous code put there; a field typed
 * by hand is kept (and shown as a disagreement, so it is saved only with a reason). Series,
 * nominal size and SDR move together: the code fills them when SDR is empty or all three
 * still hold the previous code's values. A field the previous code filled that the new code
 * does not give is emptied (back to `defaults`), so no value of an old code stays behind.
 * Our rule (common practice, no published source); which fields a code gives: fieldsFromTraceCode.
 */
export function refillFromTraceCode(input: { current: CodeFill; previousFill: CodeFill; next: CodeFill; defaults?: CodeFill }): CodeRefill {
  const { current, previousFill, next } = input;
  const defaults = input.defaults ?? {};
  const text = (value: string | undefined) => (value ?? '').trim();
  const isCodes = (field: CodeFilledField) => !text(current[field]) || (previousFill[field] !== undefined && text(current[field]) === text(previousFill[field]));
  const result: CodeRefill = { set: {}, filled: [], cleared: [], kept: [], fill: {} };
  const order: CodeFilledField[] = ['manufacturerCode', 'manufacturer', 'lot', 'productionDate', 'material', 'series', 'nominalSize', 'sdr'];
  const sizeIsCodes = !text(current.sdr) || SIZE_GROUP.every((field) => previousFill[field] !== undefined && text(current[field]) === text(previousFill[field]));
  for (const field of order) {
    const mine = SIZE_GROUP.includes(field) ? sizeIsCodes : isCodes(field);
    const value = next[field];
    if (value !== undefined) {
      if (mine) {
        result.fill[field] = value;
        if (text(current[field]) !== text(value)) {
          result.set[field] = value;
          result.filled.push(field);
        }
      } else if (text(current[field]) !== text(value)) {
        result.kept.push(field);
      }
    } else if (previousFill[field] !== undefined && mine && text(current[field]) === text(previousFill[field])) {
      result.set[field] = defaults[field] ?? '';
      result.cleared.push(field);
    }
  }
  return result;
}

/** The code's fields as the form holds them (text), with the pipe maker's name when it is known by its id. */
export function codeFillFrom(fields: FieldsFromTraceCode, manufacturerName?: string | null): CodeFill {
  const fill: CodeFill = { manufacturerCode: fields.manufacturerCode, lot: fields.lot, productionDate: fields.productionDate, material: fields.material };
  if (manufacturerName) fill.manufacturer = manufacturerName;
  if (fields.series && fields.nominalSize) {
    fill.series = fields.series;
    fill.nominalSize = fields.nominalSize;
    if (fields.sdr !== undefined) fill.sdr = String(fields.sdr);
  }
  return fill;
}

/** How a coil answered a search by lot: its typed lot, the lot its F2897 code carries, or both. */
export type LotMatch = 'typed-lot' | 'code-lot' | 'both';

export const LOT_MATCH_LABELS: Readonly<Record<LotMatch, string>> = {
  'typed-lot': 'Typed lot',
  'code-lot': 'Lot in its traceability code',
  both: 'Typed lot and the lot in its code',
};

/**
 * Whether a coil carries the searched lot in its typed lot field, in its F2897 code (positions
 * 3–6, compared as numbers of 7 digits with leading zeros), or both; null when neither. The
 * typed lot is compared as written (trimmed, letters in any case).
 * Source: ASTM F2897-23a Table 1 (lot, 7 digits in 4 base-62 characters).
 */
export function lotMatch(coil: { lot: string; traceCode: string | null }, searchedLot: string): LotMatch | null {
  const wanted = searchedLot.trim();
  if (!wanted) return null;
  const typed = coil.lot.trim().toLowerCase() === wanted.toLowerCase();
  const parsed = coil.traceCode ? parseTraceCode(coil.traceCode) : null;
  const inCode = Boolean(parsed?.ok && /^\d{1,7}$/.test(wanted) && parsed.value.lot === wanted.padStart(7, '0'));
  return typed && inCode ? 'both' : typed ? 'typed-lot' : inCode ? 'code-lot' : null;
}

export interface TypedCoilFields {
  manufacturerCode?: string | null;
  lot?: string | null;
  productionDate?: string | null;
  material?: string | null;
  series?: PipeSeries | null;
  nominalSize?: string | null;
  sdr?: number | null;
}

export type TraceCodeFlag = { field: string; message: string };

/**
 * Where an F2897 code disagrees with the fields typed from the print line. Each flag names
 * the form field and says both values. Empty typed fields are not flagged (the code fills
 * them). A code that does not parse is one flag on `traceCode`. The component type must be
 * pipe (Table 5 codes 10–13); a coil should carry 12 (coiled pipe).
 * Source: ASTM F2897-23a Tables 1, 4, 5, 6.
 */
export function traceCodeDisagreements(code: string, typed: TypedCoilFields): TraceCodeFlag[] {
  const parsed = parseTraceCode(code);
  if (!parsed.ok) return [{ field: 'traceCode', message: parsed.error }];
  const value = parsed.value;
  const flags: TraceCodeFlag[] = [];
  const given = (text: string | null | undefined) => (text ?? '').trim();
  if (given(typed.manufacturerCode) && given(typed.manufacturerCode) !== value.manufacturer) {
    flags.push({ field: 'manufacturerCode', message: `The code names manufacturer "${value.manufacturer}", the form says "${given(typed.manufacturerCode)}"` });
  }
  const lot = given(typed.lot);
  if (lot) {
    const same = /^\d{1,7}$/.test(lot) && lot.padStart(7, '0') === value.lot;
    if (!same) flags.push({ field: 'lot', message: `The code carries lot ${value.lot}, the form says ${lot}` });
  }
  if (given(typed.productionDate) && given(typed.productionDate) !== value.productionDate) {
    flags.push({ field: 'productionDate', message: `The code says it was made on ${value.productionDate}, the form says ${given(typed.productionDate)}` });
  }
  if (given(typed.material) && normaliseMaterial(given(typed.material)) !== normaliseMaterial(value.material)) {
    flags.push({ field: 'material', message: `The code says ${value.material} (Table 4 "${value.materialCode}"), the form says ${given(typed.material)}` });
  }
  if (!['10', '11', '12', '13'].includes(value.componentType)) {
    flags.push({ field: 'traceCode', message: `The code's component type "${value.componentType}" is not pipe (coiled pipe is 12)` });
  }
  if (typed.series && typed.nominalSize && typed.sdr && value.sizeFactors) {
    const series = typed.series;
    const expected = series === 'metric' ? null : sizeFactorFor({ series, nominal: safeNominal(series, typed.nominalSize), sdr: typed.sdr });
    const [c1, c2] = value.sizeFactors;
    if (expected === null) {
      flags.push({ field: 'nominalSize', message: `The code's size factor ${c2} cannot be checked against ${typed.nominalSize} ${series.toUpperCase()} SDR ${typed.sdr} (not in our Table 6 selection)` });
    } else if (c1 !== expected || c2 !== expected) {
      const row = sizeFromFactor(c2);
      const says = row ? `${row.nominal}" ${row.series.toUpperCase()}${row.sdr ? ` SDR ${row.sdr}` : ` ${row.wallIn} in wall`}` : `size factor ${c2}`;
      flags.push({ field: 'nominalSize', message: `The code says ${says}, the form says ${typed.nominalSize}" ${series.toUpperCase()} SDR ${typed.sdr}` });
    }
  }
  return flags;
}

function normaliseMaterial(text: string): string {
  return text.replace(/\s+/g, ' ').trim().toUpperCase();
}

function safeNominal(series: PipeSeries, nominal: string): string {
  try {
    return findPipeSize(series, nominal).nominal;
  } catch {
    return nominal;
  }
}

/** Material designations a coil may carry, for the receipt picker (F2897 Table 4, PE rows). */
export const PE_MATERIALS: readonly string[] = Object.values(MATERIAL_CODES).filter((name) => /^PE\d/.test(name));

export type StatusMoveInput = {
  from: CoilStatus;
  to: CoilStatus;
  reason?: string | null;
  crewId?: number | null;
  jobId?: number | null;
};

/**
 * Why a status move is refused, with the form field to show it on, or null when allowed.
 * The moves themselves are domain/coils' rules (quarantine from any state with a reason;
 * a reason to leave quarantine); on top: a coil goes on a trailer with a crew, and into use
 * with a job. Our rules (common practice, no published source).
 */
export function statusMoveProblem(input: StatusMoveInput): { field: string; message: string } | null {
  const problem = coilMoveProblem(input.from, input.to, input.reason ?? undefined);
  if (problem) return { field: /^Say why/.test(problem) ? 'reason' : 'to', message: problem };
  if (input.to === 'on-trailer' && !input.crewId) return { field: 'crewId', message: 'Choose the crew whose trailer the coil goes on' };
  if (input.to === 'in-use' && !input.jobId) return { field: 'jobId', message: 'Choose the job the coil is used on' };
  return null;
}

/** Status a coil may move to from `from` (for the picker); quarantine is always offered. */
export function statusMovesFrom(from: CoilStatus): CoilStatus[] {
  return COIL_STATUSES.filter((to) => coilMoveProblem(from, to, 'x') === null);
}

/**
 * The next coil id after `last` ("LV-C0012" → "LV-C0013", keeping the width); `prefix`
 * + 0001 when there is none yet.
 */
export function nextCoilCode(last: string | null, prefix = 'C-'): string {
  if (!last) return `${prefix}0001`;
  const match = /^(.*?)(\d+)$/.exec(last);
  if (!match) return `${last}-0001`;
  const digits = match[2] as string;
  return `${match[1]}${String(Number(digits) + 1).padStart(digits.length, '0')}`;
}

export type ScannedCoilText =
  | { kind: 'coil-code'; code: string }
  | { kind: 'trace-code'; code: string; value: TraceCodeValue }
  | { kind: 'empty' };

/**
 * What a scanned or typed text names: a URL ending in /coils/<code> (our label's QR) →
 * that coil id; a 16-character text that parses as an F2897 code → the code (several
 * coils of one lot can share it); anything else → a coil id as typed.
 */
export function readScannedCoilText(text: string): ScannedCoilText {
  const trimmed = (text ?? '').trim();
  if (!trimmed) return { kind: 'empty' };
  const url = /\/coils\/([^/?#\s]+)\/?(?:[?#].*)?$/.exec(trimmed);
  if (url) {
    let code = url[1] as string;
    try {
      code = decodeURIComponent(code);
    } catch {
      // keep the raw segment
    }
    return { kind: 'coil-code', code };
  }
  const parsed = parseTraceCode(trimmed);
  if (parsed.ok) return { kind: 'trace-code', code: trimmed, value: parsed.value };
  return { kind: 'coil-code', code: trimmed };
}
