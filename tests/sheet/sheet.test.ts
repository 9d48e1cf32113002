import { describe, expect, test } from 'vitest';
import { decodeText } from '../../src/ingest/decode.js';
import { parseSheet, writeSheet, type SheetRow } from '../../src/sheet/sheet.js';
import { refusal } from '../helpers/refusal.js';

const ROWS: SheetRow[] = [
  { passage_id: 't01-mina:3', transcript: 't01-mina', speaker: 'Mina', role: 'participant', time: '0:01:05', text: 'Bed four; stable, "for now".', themes: ['Workload > Staffing levels', 'Patient safety'], note: 'asked twice' },
  { passage_id: 't01-mina:4', transcript: 't01-mina', speaker: 'Omar', role: 'participant', time: '', text: '=1+1 on the board', themes: [], note: '' },
];

const WANT = [
  { row: 2, passageId: 't01-mina:3', text: 'Bed four; stable, "for now".', themes: ['Workload > Staffing levels', 'Patient safety'], nothing: false, note: 'asked twice' },
  { row: 3, passageId: 't01-mina:4', text: '=1+1 on the board', themes: [], nothing: false, note: '' },
];

/** The sheet as a spreadsheet saves it with another separator: every cell quoted where needed. */
function saveWith(sep: string, rows: SheetRow[] = ROWS): string {
  const cell = (v: string) => (/["\n\r;,\t]/.test(v) || v.startsWith('=') ? `"${v.replace(/"/g, '""')}"` : v);
  const head = ['passage_id', 'transcript', 'speaker', 'role', 'time', 'text', 'themes', 'note'];
  return [head.join(sep), ...rows.map((r) => [r.passage_id, r.transcript, r.speaker, r.role, r.time, r.text, r.themes.join('; '), r.note].map(cell).join(sep))].join('\r\n') + '\r\n';
}

describe('parseSheet', () => {
  test('reads the sheet as written (commas), formula guard stripped', () => {
    expect(parseSheet(decodeText(Buffer.from(writeSheet(ROWS)), 's.csv').text, 's.csv')).toEqual(WANT);
  });

  test('a sheet saved with semicolons (where the decimal mark is a comma) is read the same', () => {
    expect(parseSheet(saveWith(';'), 'semi.csv')).toEqual(WANT);
  });

  test('UTF-16 tab-separated text ("Unicode text") is read the same', () => {
    const bytes = Buffer.from('\ufeff' + saveWith('\t'), 'utf16le');
    const decoded = decodeText(bytes, 'sheet.txt');
    expect(decoded.encoding).toBe('utf-16le');
    expect(parseSheet(decoded.text, 'sheet.txt')).toEqual(WANT);
  });

  test('a "sep=;" first line names the separator and rows are counted after it', () => {
    const rows = parseSheet('sep=;\r\n' + saveWith(';'), 'hint.csv');
    expect(rows.map((r) => r.row)).toEqual([3, 4]);
    expect(rows.map((r) => r.themes)).toEqual(WANT.map((r) => r.themes));
  });

  test('another separator is refused, saying what the header line gave and how to save the sheet', () => {
    const e = refusal(() => parseSheet('passage_id|themes\nt01-mina:3|Workload\n', 'pipe.csv'));
    expect(e.describe()).toBe(
      'pipe.csv:1: the coding sheet has no "passage_id" column: the header line, split at commas, gives "passage_id|themes"; ' +
        'save the sheet from the spreadsheet as CSV (comma- or semicolon-separated) or as tab-separated text, with the header row trellis wrote',
    );
    const semi = refusal(() => parseSheet('passage_id;text\nt01-mina:3;x\n', 'nothemes.csv'));
    expect(semi.message).toContain('the coding sheet has no "themes" column: the header line, split at semicolons, gives "passage_id", "text"');
  });
});
