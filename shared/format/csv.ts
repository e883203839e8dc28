/**
 * Every CSV file Shockwright writes (section coordinates, result per facet, studies, loads) is
 * built from these cells, so it is safe to open in a spreadsheet:
 *
 * - [CSV1] Every text cell is quoted (`"…"`, inner quotes doubled): a comma, quote or line break
 *   a person typed cannot split a cell or start a new row.
 * - [CSV2] A text cell that a spreadsheet would run as a formula — starting with `=`, `+`, `-`,
 *   `@`, tab or carriage return, also after leading spaces — is neutralised with a leading
 *   apostrophe (`'=HYPERLINK(…)` shows as text).
 * - [CSV3] Numbers stay numbers: a finite number is written bare (`-0.123`, `1e-7`), never
 *   quoted or prefixed; only text is neutralised. A non-finite number is written as text.
 * - [CSV4] Text a person typed (a title, a study name) appears in a `#` note line only in its own
 *   quoted cell after the fixed label, flattened to one line, so a reader that skips `#` lines
 *   (`parseCoordinates`) still skips the whole note.
 */

export type CsvCell = number | boolean | string | null | undefined;

/** What a spreadsheet reads as the start of a formula (or a hidden one, after a tab or CR). */
const FORMULA_START = /^[\s]*[=+\-@]|^[\t\r]/;

/** A text cell: always quoted [CSV1], neutralised when it could run as a formula [CSV2]. */
export function csvText(text: string): string {
  const safe = FORMULA_START.test(text) ? `'${text}` : text;
  return `"${safe.replace(/"/g, '""')}"`;
}

/** A number cell: bare when finite [CSV3]; empty for null. */
export function csvNumber(value: number | null | undefined): string {
  if (value === null || value === undefined) return '';
  return Number.isFinite(value) ? String(value) : csvText(String(value));
}

/** Any cell: numbers bare, booleans as `true`/`false`, text quoted and neutralised, null empty. */
export function csvCell(value: CsvCell): string {
  if (typeof value === 'number') return csvNumber(value);
  if (typeof value === 'boolean') return String(value);
  if (value === null || value === undefined) return '';
  return csvText(value);
}

/** One row of cells. */
export function csvRow(cells: readonly CsvCell[]): string {
  return cells.map(csvCell).join(',');
}

/** A header row of our own fixed column names (letters, digits and underscores only). */
export function csvHeader(columns: readonly string[]): string {
  for (const c of columns) if (!/^[A-Za-z][A-Za-z0-9_]*$/.test(c)) throw new Error(`CSV column name ${JSON.stringify(c)} is not a plain name`);
  return columns.join(',');
}

/**
 * A `#` note line. `label` is our own fixed text; `values` (a title, a study name, a revision)
 * each go in a cell of their own after it, text quoted and flattened to one line [CSV4].
 */
export function csvNote(label: string, ...values: CsvCell[]): string {
  const flat = values.map((v) => (typeof v === 'string' ? v.replace(/[\r\n]+/g, ' ') : v));
  return [`# ${label}`, ...flat.map(csvCell)].join(',');
}
