/**
 * CSV writing (RFC 4180 quoting) with spreadsheet formula-injection escaping: a text cell that a
 * spreadsheet would evaluate — one starting with =, +, -, @, tab or carriage return — is prefixed
 * with a single quote, as the OWASP "CSV Injection" page recommends. Numbers are written as numbers
 * (a negative phase angle stays -12.5); only strings are escaped.
 */
export type CsvCell = string | number | boolean | null | undefined;

const FORMULA_START = /^[=+\-@\t\r]/;

export function escapeCsvCell(cell: CsvCell): string {
  if (cell === null || cell === undefined) return "";
  if (typeof cell === "number") return Number.isFinite(cell) ? String(cell) : "";
  if (typeof cell === "boolean") return cell ? "true" : "false";
  const text = FORMULA_START.test(cell) ? `'${cell}` : cell;
  return /[",\r\n]/.test(text) ? `"${text.replace(/"/g, '""')}"` : text;
}

export function toCsv(header: readonly string[], rows: ReadonlyArray<readonly CsvCell[]>): string {
  const lines = [header.map(escapeCsvCell).join(",")];
  for (const row of rows) lines.push(row.map(escapeCsvCell).join(","));
  return `${lines.join("\r\n")}\r\n`;
}
