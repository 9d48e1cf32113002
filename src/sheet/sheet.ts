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

/** Separators spreadsheets save with: comma, semicolon (where the decimal mark is a comma), tab ("Unicode text"). */
const SEPARATORS = [',', ';', '\t'] as const;
const SEPARATOR_NAMES: Record<string, string> = { ',': 'commas', ';': 'semicolons', '\t': 'tabs' };

/**
 * The separator, from the header line: the one that splits it into the sheet's columns. A first
 * line "sep=;" (written by some spreadsheets) names it and is skipped. `from` is the header's line.
 */
function sheetSeparator(text: string): { separator: string; from: number } {
  const nl = text.indexOf('\n');
  const first = (nl === -1 ? text : text.slice(0, nl)).replace(/^\ufeff/, '');
  const hint = /^"?sep=(.)"?[,;\t]*$/i.exec(first.trim());
  if (hint) return { separator: hint[1]!, from: 2 };
  const names = (sep: string) => first.split(sep).map((c) => c.trim().replace(/^"(.*)"$/, '$1').trim().toLowerCase());
  for (const sep of SEPARATORS) {
    const cols = names(sep);
    if (cols.includes('passage_id') && cols.includes('themes')) return { separator: sep, from: 1 };
  }
  // None gives the columns: the most frequent one, so the column check can say what it found.
  const counts = SEPARATORS.map((sep) => first.split(sep).length);
  return { separator: SEPARATORS[counts.indexOf(Math.max(...counts))]!, from: 1 };
}

const HOW_TO_SAVE =
  'save the sheet from the spreadsheet as CSV (comma- or semicolon-separated) or as tab-separated text, with the header row trellis wrote';

/** Reads a coding sheet; a malformed file gives an error naming the line. */
export function parseSheet(text: string, file: string): ImportedRow[] {
  const { separator, from } = sheetSeparator(text);
  let records: { record: Record<string, string>; info: { lines: number; records: number } }[];
  try {
    records = parse(text, {
      bom: true,
      delimiter: separator,
      from_line: from,
      columns: (h: string[]) => h.map((c) => c.trim().toLowerCase()),
      info: true,
      skip_empty_lines: true,
      relax_column_count: false,
    });
  } catch (e) {
    const err = e as { message: string; lines?: number };
    throw new UserError(`not a readable coding sheet: ${err.message.replace(/^Invalid Record Length: /, '')}`, file, err.lines);
  }
  if (!records.length) throw new UserError('the coding sheet has no rows', file);
  const cols = Object.keys(records[0]!.record);
  for (const need of ['passage_id', 'themes']) {
    if (!cols.includes(need)) {
      const found = cols.map((c) => `"${c.length > 60 ? c.slice(0, 60) + '…' : c}"`).join(', ');
      throw new UserError(
        `the coding sheet has no "${need}" column: the header line, split at ${SEPARATOR_NAMES[separator] ?? `"${separator}"`}, gives ${found}; ${HOW_TO_SAVE}`,
        file,
        from,
      );
    }
  }
  const hasText = cols.includes('text');
  const hasNote = cols.includes('note');
  return records.map(({ record }, i) => {
    const themes = unguardCell(record.themes ?? '');
    const nothing = themes.trim().toLowerCase() === NOTHING_TO_CODE;
    return {
      row: i + from + 1,
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
