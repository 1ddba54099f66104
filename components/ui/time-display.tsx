import { formatInstant, type InstantPrecision } from "./display-format";

/** An instant as a `<time>` element: machine-readable `dateTime`, the screen's text inside. */
export function TimeDisplay({ at, precision = "minute", withZone = false }: { at: Date | string | number; precision?: InstantPrecision; withZone?: boolean }) {
  const date = new Date(at);
  return <time dateTime={date.toISOString()}>{formatInstant(date, precision, withZone)}</time>;
}
