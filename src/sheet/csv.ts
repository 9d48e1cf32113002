import { stringify } from 'csv-stringify/sync';

/**
 * Every CSV trellis writes goes through here. Cells are untrusted text (survey answers come from
 * respondents): one starting with = + - @, a tab or a carriage return would be read as a formula
 * by spreadsheet programs, so it gets a leading apostrophe (common practice), which `unguardCell`
 * removes again on import.
 */
const FORMULA_START = /^[=+\-@\t\r]/;

export function guardCell(v: unknown): unknown {
  return typeof v === 'string' && FORMULA_START.test(v) ? `'${v}` : v;
}

export function unguardCell(v: string): string {
  return v.startsWith("'") && FORMULA_START.test(v.slice(1)) ? v.slice(1) : v;
}

/**
 * CSV text from rows of cells (arrays) or records (objects keyed by `columns`): UTF-8 with BOM so
 * spreadsheet programs detect the encoding, CRLF, quoted where needed, every string cell guarded.
 * A `caution` becomes a first line starting with "#" (read such files with comment lines skipped:
 * pandas `comment="#"`, R `comment.char = "#"`, csv-parse `comment: '#'`).
 */
export function writeCsv(columns: readonly string[], rows: readonly (readonly unknown[] | object)[], caution?: string): string {
  const cells = rows.map((r) => (Array.isArray(r) ? r : columns.map((c) => (r as Record<string, unknown>)[c])).map(guardCell));
  // A cell starting with "#" is quoted, so that readers told to skip "#" comment lines keep its row.
  const body = stringify(cells, { header: true, columns: columns.map((c) => String(guardCell(c))), record_delimiter: '\r\n', quoted_match: [/[\n",;]/, /^#/] });
  return '\ufeff' + (caution ? `# ${caution.replace(/[\r\n]+/g, ' ')}\r\n` : '') + body;
}
