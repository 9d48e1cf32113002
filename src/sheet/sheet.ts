import { parse } from 'csv-parse/sync';
import { UserError } from '../errors.js';
import { unguardCell, writeCsv } from './csv.js';
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

/** CSV text: UTF-8 with BOM (so spreadsheet programs detect the encoding), CRLF, quoted where needed. */
export function writeSheet(rows: SheetRow[]): string {
  return writeCsv(SHEET_COLUMNS, rows.map((r) => [r.passage_id, r.transcript, r.speaker, r.role, r.time, r.text, r.themes.join('; '), r.note]));
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
    const themes = unguardCell(record.themes ?? '');
    const nothing = themes.trim().toLowerCase() === NOTHING_TO_CODE;
    return {
      row: i + 2,
      passageId: unguardCell((record.passage_id ?? '').trim()),
      text: hasText ? unguardCell(record.text ?? '') : null,
      themes: nothing ? [] : [...new Set(splitPathList(themes))],
      nothing,
      note: hasNote ? unguardCell(record.note ?? '').trim() : null,
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
