// Dates shown the same on server and client (no locale or time-zone drift between them).
export function formatInstant(iso: string): string {
  return `${iso.slice(0, 10)} ${iso.slice(11, 16)} UTC`;
}
