// CSV cells (RFC 4180), shared by the Register export's worker thread and the lot-trace
// export. Plain JavaScript so the worker (loaded as a file at run time, outside the
// bundle) and the bundled server code import the same rules.

/**
 * RFC 4180 field: quoted when it holds a comma, quote, line break or edge spaces.
 * @param {string} value
 * @returns {string}
 */
export function csvField(value) {
  return /[",\r\n]|^\s|\s$/.test(value) ? `"${value.replace(/"/g, '""')}"` : value;
}

/**
 * A text cell that a spreadsheet would read as a formula (=, +, -, @, tab, CR) gets a
 * leading apostrophe (OWASP "CSV injection" advice); numbers stay numbers.
 * @param {string} value
 * @returns {string}
 */
function safeText(value) {
  return /^[=+\-@\t\r]/.test(value) ? `'${value}` : value;
}

/**
 * @param {string | number | Date | null | undefined} value
 * @returns {string}
 */
export function csvCell(value) {
  if (value === null || value === undefined) return "";
  if (value instanceof Date) return value.toISOString();
  if (typeof value === "number") return Number.isFinite(value) ? String(value) : "";
  return csvField(safeText(value));
}
