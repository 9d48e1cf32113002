import { parse } from 'csv-parse/sync';
import { stringify } from 'csv-stringify/sync';
import { UserError } from '../errors.js';
import { splitPathList } from '../template/paths.js';

/** The coding sheet: one row a passage, opened in a spreadsheet, coded, and imported back. */
export const SHEET_COLUMNS = ['passage_id', 'transcript', 'speaker', 'role', 'time', 'text', 'themes', 'note'] as const;

export interface SheetRow {
  passage_id: string;
  transcript: string;
  speaker: string;
  role: string;
  time: string;
  text: string;
  /** Theme paths, levels joined by " > ". */
  themes: string[];
  /** The coder's latest memo on the passage ('' when none): the note column. */
  note: string;
}

/**
 * Written in the themes cell, alone, for a passage the coder read and judged to need no theme
 * ("reviewed, nothing to code"); an empty cell means the passage was not coded (or not yet read).
 */
export const NOTHING_TO_CODE = 'nothing to code';

/** A parsed row of an imported sheet; `row` is the spreadsheet row number (the header is row 1). */
export interface ImportedRow {
  row: number;
  passageId: string;
  /** null when the sheet has no text column (the text check is then skipped). */
  text: string | null;
  themes: string[];
  /** The themes cell says NOTHING_TO_CODE. */
  nothing: boolean;
  /** The note cell; null when the sheet has no note column. */
  note: string | null;
}

// A cell starting with one of these is read as a formula by spreadsheet programs; a leading
// apostrophe keeps it text (common practice), and is removed again on import.
const FORMULA_START = /^[=+\-@\t\r]/;

function cell(v: string): string {
  return FORMULA_START.test(v) ? `'${v}` : v;
}

function uncell(v: string): string {
  return v.startsWith("'") && FORMULA_START.test(v.slice(1)) ? v.slice(1) : v;
}

/** CSV text: UTF-8 with BOM (so spreadsheet programs detect the encoding), CRLF, quoted where needed. */
export function writeSheet(rows: SheetRow[]): string {
  const body = stringify(
    rows.map((r) => [r.passage_id, r.transcript, cell(r.speaker), r.role, r.time, cell(r.text), r.themes.join('; '), cell(r.note)]),
    { header: true, columns: [...SHEET_COLUMNS], record_delimiter: '\r\n', quoted_match: /[\n",;]/ },
  );
  return '\ufeff' + body;
}

/** Reads a coding sheet; a malformed file gives an error naming the line. */
export function parseSheet(text: string, file: string): ImportedRow[] {
  let records: { record: Record<string, string>; info: { lines: number; records: number } }[];
  try {
    records = parse(text, { bom: true, columns: (h: string[]) => h.map((c) => c.trim().toLowerCase()), info: true, skip_empty_lines: true, relax_column_count: false });
  } catch (e) {
    const err = e as { message: string; lines?: number };
    throw new UserError(`not a readable coding sheet: ${err.message.replace(/^Invalid Record Length: /, '')}`, file, err.lines);
  }
  if (!records.length) throw new UserError('the coding sheet has no rows', file);
  const cols = Object.keys(records[0]!.record);
  for (const need of ['passage_id', 'themes']) {
    if (!cols.includes(need)) throw new UserError(`the coding sheet has no "${need}" column (found: ${cols.join(', ')})`, file, 1);
  }
  const hasText = cols.includes('text');
  const hasNote = cols.includes('note');
  return records.map(({ record }, i) => {
    const nothing = (record.themes ?? '').trim().toLowerCase() === NOTHING_TO_CODE;
    return {
      row: i + 2,
      passageId: (record.passage_id ?? '').trim(),
      text: hasText ? uncell(record.text ?? '') : null,
      themes: nothing ? [] : [...new Set(splitPathList(record.themes ?? ''))],
      nothing,
      note: hasNote ? uncell(record.note ?? '').trim() : null,
    };
  });
}

/** Seconds as h:mm:ss for the sheet's time column. */
export function clock(seconds: number | null): string {
  if (seconds === null || seconds === undefined) return '';
  const s = Math.floor(seconds);
  const h = Math.floor(s / 3600);
  const m = Math.floor((s % 3600) / 60);
  return `${h}:${String(m).padStart(2, '0')}:${String(s % 60).padStart(2, '0')}`;
}
