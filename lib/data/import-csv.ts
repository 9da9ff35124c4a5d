// CSV writing for every download the staff pages offer (import error reports, the yearly
// summary, the audit log). Pure.

/**
 * A cell a spreadsheet would run as a formula (=, +, -, @, or a tab/carriage return that some
 * programs strip before looking) gets a leading apostrophe, so an opened export shows the text
 * and never executes it (OWASP, "CSV Injection"). Plain negative numbers are kept as numbers:
 * they cannot carry a formula.
 */
export function neutralizeFormula(value: string): string {
  if (value === "") return value;
  if (/^-?\d+(\.\d+)?$/.test(value)) return value;
  return /^[=+\-@\t\r]/.test(value) ? `'${value}` : value;
}

function cellOf(value: unknown): string {
  if (value === null || value === undefined) return "";
  if (value instanceof Date) return value.toISOString();
  if (typeof value === "boolean") return value ? "yes" : "no";
  if (typeof value === "object") return JSON.stringify(value);
  if (typeof value === "number" || typeof value === "bigint") return value.toString();
  return typeof value === "string" ? value : "";
}

/** One CSV field: formula-neutralised, quoted when it holds a comma, quote or line break (RFC 4180). */
export function csvField(value: unknown): string {
  const text = neutralizeFormula(cellOf(value));
  return /[",\r\n]/.test(text) ? `"${text.replace(/"/g, '""')}"` : text;
}

export function csvLine(values: readonly unknown[]): string {
  return values.map(csvField).join(",");
}

/**
 * A whole CSV document with CRLF line ends and a UTF-8 byte-order mark, so spreadsheet programs
 * open accented names correctly.
 */
export function toCsv(header: readonly string[], rows: readonly (readonly unknown[])[]): string {
  return `\uFEFF${[csvLine(header), ...rows.map(csvLine)].join("\r\n")}\r\n`;
}

/** A download answer for CSV text. */
export function csvResponse(text: string, fileName: string): Response {
  const safe = fileName.replace(/[^A-Za-z0-9._-]+/g, "-");
  return new Response(text, {
    headers: {
      "content-type": "text/csv; charset=utf-8",
      "content-disposition": `attachment; filename="${safe}"`,
      "cache-control": "private, no-store",
      "x-content-type-options": "nosniff",
    },
  });
}
