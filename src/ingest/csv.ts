/**
 * Survey answers in CSV: one answer a row. Each respondent becomes one transcript whose turns are
 * its answers in file order; its source is those answers joined by blank lines.
 */
import { parse } from 'csv-parse/sync';
import { UserError } from '../errors.js';
import { transcriptName } from './names.js';
import type { Transcript, Turn } from './types.js';

export interface CsvColumns {
  idColumn?: string;
  textColumn?: string;
  questionColumn?: string;
}

const ID_NAMES = ['respondent_id', 'respondent', 'id', 'participant', 'participant_id'];
const TEXT_NAMES = ['answer', 'response', 'text', 'comment'];
const QUESTION_NAMES = ['question', 'item', 'prompt'];

interface Row {
  record: string[];
  line: number;
}

export function parseCsv(text: string, file: string, cols: CsvColumns = {}, warnings: string[] = []): Transcript[] {
  const rows = parseRows(text, file);
  const header = rows.shift()!.record.map((h) => h.trim());
  const idIdx = pick(header, cols.idColumn, ID_NAMES, 'respondent id', file);
  const textIdx = pick(header, cols.textColumn, TEXT_NAMES, 'answer text', file);
  const qIdx = cols.questionColumn !== undefined ? pick(header, cols.questionColumn, [], 'question', file) : guess(header, QUESTION_NAMES);

  const byRespondent = new Map<string, { source: string; turns: Turn[] }>();
  for (const { record, line } of rows) {
    const answer = (record[textIdx] ?? '').trim();
    const id = (record[idIdx] ?? '').trim();
    if (id === '') {
      if (answer === '') continue;
      throw new UserError(`this answer has no respondent id (column "${header[idIdx]}")`, file, line);
    }
    // Respondents keep the order of their first row, even when that answer is empty.
    let r = byRespondent.get(id);
    if (!r) byRespondent.set(id, (r = { source: '', turns: [] }));
    if (answer === '') continue;
    if (r.source !== '') r.source += '\n\n';
    const turn: Turn = { speaker: id, text: answer, start: null, end: null, offset: r.source.length, length: answer.length, codes: [] };
    const q = qIdx === -1 ? '' : (record[qIdx] ?? '').trim();
    if (q !== '') turn.question = q;
    r.source += answer;
    r.turns.push(turn);
  }
  if (![...byRespondent.values()].some((r) => r.turns.length > 0)) throw new UserError(`no answers found in column "${header[textIdx]}"`, file);

  const silent = [...byRespondent.values()].filter((r) => r.turns.length === 0).length;
  if (silent > 0) warnings.push(`${file}: ${silent} respondent(s) with no answer were skipped`);
  const used = new Set<string>();
  const out: Transcript[] = [];
  for (const [id, r] of byRespondent) {
    if (r.turns.length === 0) continue;
    let name = transcriptName(file, id);
    // Ids that differ only in characters the name cannot hold ("a b", "a_b") still get distinct names.
    for (let k = 2; used.has(name); k++) name = `${transcriptName(file, id)}-${k}`;
    used.add(name);
    out.push({ name, format: 'csv', source: r.source, turns: r.turns, labelled: true, warnings: out.length === 0 ? warnings : [] });
  }
  return out;
}

function parseRows(text: string, file: string): Row[] {
  let lastLine = 0;
  let width = 0;
  let rows: { record: string[]; info: { lines: number } }[];
  try {
    rows = parse(text, {
      bom: true,
      relax_column_count: false,
      skip_empty_lines: true,
      delimiter: guessDelimiter(text),
      info: true,
      on_record: (rec, ctx) => {
        if (lastLine === 0) width = (rec as unknown as { record: string[] }).record.length;
        lastLine = ctx.lines;
        return rec;
      },
    }) as unknown as { record: string[]; info: { lines: number } }[];
  } catch (e) {
    throw csvError(e, file, lastLine, width);
  }
  if (rows.length === 0) throw new UserError('the file is empty', file);
  return rows.map((r, k) => ({ record: r.record, line: k === 0 ? 1 : r.info.lines }));
}

function csvError(e: unknown, file: string, lastLine: number, width: number): UserError {
  const err = e as { code?: string; lines?: number; message?: string; record?: unknown[] };
  switch (err.code) {
    case 'CSV_QUOTE_NOT_CLOSED':
      // csv-parse reports the end of the file; the quote opened on the row after the last good one.
      return new UserError('a quoted field starting on this line is never closed: a closing " is missing', file, lastLine + 1);
    case 'CSV_RECORD_INCONSISTENT_FIELDS_LENGTH':
      return new UserError(
        `this row has ${err.record?.length ?? '?'} fields but the header has ${width}; an answer holding a comma must be quoted`,
        file,
        err.lines,
      );
    case 'CSV_INVALID_CLOSING_QUOTE':
    case 'INVALID_OPENING_QUOTE':
      return new UserError('a " inside a field must be doubled ("") and the field quoted', file, err.lines);
    default:
      return new UserError(`cannot read as CSV: ${err.message ?? String(e)}`, file, err.lines);
  }
}

/** Comma, semicolon (common in European spreadsheet exports) or tab: whichever the header uses most. */
function guessDelimiter(text: string): string {
  const nl = text.indexOf('\n');
  const head = (nl === -1 ? text : text.slice(0, nl)).replace(/"[^"]*"/g, '');
  let best = ',';
  let bestCount = 0;
  for (const d of [',', ';', '\t']) {
    const n = head.split(d).length - 1;
    if (n > bestCount) {
      best = d;
      bestCount = n;
    }
  }
  return best;
}

function norm(h: string): string {
  return h.trim().toLowerCase().replace(/[\s-]+/g, '_');
}

function guess(header: string[], names: string[]): number {
  const normed = header.map(norm);
  for (const n of names) {
    const k = normed.indexOf(n);
    if (k !== -1) return k;
  }
  return -1;
}

/** The named column (exact, then ignoring case) or the first guess; an error lists the columns. */
function pick(header: string[], named: string | undefined, names: string[], what: string, file: string): number {
  const found = header.map((h) => `"${h}"`).join(', ');
  if (named !== undefined) {
    let k = header.indexOf(named.trim());
    if (k === -1) k = header.map(norm).indexOf(norm(named));
    if (k === -1) throw new UserError(`no column "${named}" for the ${what}; columns found: ${found}`, file, 1);
    return k;
  }
  const k = guess(header, names);
  if (k === -1) {
    throw new UserError(`no ${what} column (looked for ${names.join(', ')}); columns found: ${found}`, file, 1);
  }
  return k;
}
