// Words for a Register view: what the filter and sort were, for the export's second sheet,
// the audit entry and the screen's summary line.
import { FINDING_PARAMETER_LABELS } from '@/domain/fusion/parameters';
import { OUTCOME_LABELS } from '@/domain/joints/outcomes';
import { REGISTER_SORT_LABELS, type RegisterFilter, type RegisterSort, type SortDirection } from '@/domain/register/filter';
import { REVIEW_STATE_LABELS } from '@/domain/joints/review-states';

/** Names of what the filter refers to by id (looked up by the caller). */
export interface FilterNames {
  job: string | null;
  fuser: string | null;
  machine: string | null;
}

export interface FilterLine {
  label: string;
  value: string;
}

/** The day fields' labels: local days of the organisation's zone, named ("Made on or after (local day, America/Chicago)"). */
export function dayFilterLabels(timeZone: string): { from: string; to: string } {
  return { from: `Made on or after (local day, ${timeZone})`, to: `Made on or before (local day, ${timeZone})` };
}

/** One line per filter field that is set, in the form's order; empty for the whole register. */
export function describeFilter(filter: RegisterFilter, names: FilterNames, timeZone: string): FilterLine[] {
  const lines: FilterLine[] = [];
  const idName = (id: number | undefined, name: string | null, what: string) => name ?? `${what} #${id}`;
  if (filter.job !== undefined) lines.push({ label: 'Job', value: idName(filter.job, names.job, 'job') });
  const days = dayFilterLabels(timeZone);
  if (filter.from !== undefined) lines.push({ label: days.from, value: filter.from });
  if (filter.to !== undefined) lines.push({ label: days.to, value: filter.to });
  if (filter.fuser !== undefined) lines.push({ label: 'Fuser', value: idName(filter.fuser, names.fuser, 'person') });
  if (filter.machine !== undefined) lines.push({ label: 'Fusion machine', value: idName(filter.machine, names.machine, 'machine') });
  if (filter.lot !== undefined) lines.push({ label: 'Lot', value: filter.lot });
  if (filter.outcome !== undefined) lines.push({ label: 'Outcome', value: OUTCOME_LABELS[filter.outcome] });
  if (filter.review !== undefined) lines.push({ label: 'Review state', value: REVIEW_STATE_LABELS[filter.review] });
  if (filter.finding !== undefined) lines.push({ label: 'Finding on', value: FINDING_PARAMETER_LABELS[filter.finding] });
  if (filter.q !== undefined) lines.push({ label: 'Search (joint, coil id or lot)', value: filter.q });
  return lines;
}

/** "Date made, newest first" and the like. */
export function describeSort(sort: RegisterSort, dir: SortDirection): string {
  const words: Record<RegisterSort, [string, string]> = {
    madeAt: ['oldest first', 'newest first'],
    number: ['ascending', 'descending'],
    pipeSize: ['smallest first', 'largest first'],
    heaterTemperature: ['lowest first (not recorded first)', 'highest first (not recorded last)'],
  };
  return `${REGISTER_SORT_LABELS[sort]}, ${words[sort][dir === 'asc' ? 0 : 1]}`;
}
