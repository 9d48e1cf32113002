import { studyPseudonymiser } from '../jobs/aliases.js';
import { importSheet } from '../jobs/sheet-import.js';
import type { Command } from 'commander';
import { decodeText } from '../ingest/decode.js';
import { readInputFile } from '../ingest/limits.js';
import { DATA_CAUTION } from '../report/cautions.js';
import { parseSheet, writeSheet } from '../sheet/sheet.js';
import { sheetRows } from '../study/sheet.js';
import { requireTranscripts } from '../study/transcripts.js';
import { checkOut, collect, forceOption, withStudy, writeOut, type OutputOpts, type StudyOpts, coderName } from './common.js';
import { plural, printJson, say, warn } from './output.js';

export function registerSheet(program: Command): void {
  const sheet = program
    .command('sheet')
    .description('coding sheets: export passages to a spreadsheet, code them, import the codes back')
    .addHelpText(
      'after',
      `
The "themes" column takes theme paths separated by ";" with levels separated by " > ",
e.g. "Workload > Staffing levels; Patient safety". A bare theme name is accepted where it
is unique in the template. Import is all or nothing: any unknown theme or passage stops it.`,
    );

  forceOption(sheet
    .command('export'))
    .description('write a coding sheet (CSV, UTF-8) with one row a passage')
    .requiredOption('--out <file>', 'the CSV file to write')
    .option('--transcript <name>', 'only these transcripts (repeatable)', collect)
    .option('--coder <name>', "fill the themes column with this coder's current codings", coderName)
    .option('--pseudonymise', 'the speaker column by alias (trellis alias); passage ids, transcript names and text stay as stored so the sheet reads back')
    .option('--study <dir>', 'the study folder', '.')
    .option('--json', 'machine-readable output on stdout')
    .addHelpText(
      'after',
      '\nExamples:\n  trellis sheet export --transcript t01 --transcript t02 --out batch1.csv\n  trellis sheet export --coder alex --out alex-codes.csv\n  trellis sheet export --pseudonymise --out second-coder.csv',
    )
    .action(async (opts: OutputOpts & { transcript?: string[]; coder?: string; pseudonymise?: boolean }) => {
      checkOut(opts);
      const rows = await withStudy(opts, ({ db }) => {
        requireTranscripts(db, opts.transcript);
        const rows = sheetRows(db, { transcripts: opts.transcript, coder: opts.coder });
        if (!opts.pseudonymise) return rows;
        const p = studyPseudonymiser(db);
        return rows.map((r) => ({ ...r, speaker: p.speaker(r.speaker || null) ?? '' }));
      });
      writeOut(opts, writeSheet(rows));
      if (opts.json) printJson({ out: opts.out, rows: rows.length });
      else say(`Wrote ${plural(rows.length, 'passage')} to ${opts.out}. Code the "themes" column, then: trellis sheet import ${opts.out} --coder NAME\n${DATA_CAUTION}`);
    });

  sheet
    .command('import <file>')
    .description("read a coded sheet's themes column: it becomes this coder's codings of those passages")
    .requiredOption('--coder <name>', 'who coded the sheet', coderName)
    .option('--study <dir>', 'the study folder', '.')
    .option('--json', 'machine-readable output on stdout')
    .addHelpText(
      'after',
      `
Themes cell: theme paths separated by ";", levels by " > ". Write "nothing to code" alone in the
cell for a passage you read and judged to need no theme: it is logged as a decision and counts
as reviewed for agreement. An empty cell means not coded (or not yet read).
The optional "note" column holds a memo on the passage: a new or changed note becomes a memo by
the coder (trellis memo list --passage ID); export with --coder writes each passage's latest.

Example:
  trellis sheet import batch1.csv --coder alex`,
    )
    .action(async (file: string, opts: StudyOpts & { coder: string }) => {
      const bytes = readInputFile(file);
      const decoded = decodeText(bytes, file);
      for (const w of decoded.warnings) warn(w);
      const rows = parseSheet(decoded.text, file);
      const report = await withStudy(opts, ({ db }) => importSheet(db, rows, file, opts.coder));
      if (opts.json) printJson(report);
      else
        say(
          `Imported ${plural(report.rows, 'row')} for ${opts.coder}: ${plural(report.coded, 'passage')} coded, ` +
            `${plural(report.added, 'coding')} added, ${report.removed} removed` +
            (report.nothing_to_code ? `; ${plural(report.nothing_to_code, 'passage')} marked nothing to code` : '') +
            (report.memos ? `; ${plural(report.memos, 'note')} kept as passage memos.` : '.'),
        );
    });
}
