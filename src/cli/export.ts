import type { Command } from 'commander';
import { UserError } from '../errors.js';
import { DATA_CAUTION } from '../report/cautions.js';
import { writeCsv } from '../sheet/csv.js';
import { decisionLog, logColumns } from '../study/decisions.js';
import { CODING_COLUMNS, codingsForExport, themeMatrix } from '../study/export.js';
import { currentRevision } from '../study/template.js';
import { collectComments } from '../template/comments.js';
import { printOutline } from '../template/print.js';
import { checkOut, forceOption, studyCommand, withStudy, writeOut, type OutputOpts } from './common.js';
import { say } from './output.js';

const WHAT = ['codings', 'matrix', 'log', 'template'];

export function registerExport(program: Command): void {
  forceOption(studyCommand(program, 'export', 'export codings, the theme x transcript matrix, the decision log or the template'))
    .argument('<what>', WHAT.join(', '))
    .requiredOption('--out <file>', 'the file to write')
    .option('--format <format>', 'csv or json (codings, log); the matrix is CSV, the template an outline', 'csv')
    .addHelpText(
      'after',
      `
codings   every current coding: passage, transcript, speaker, time, theme path, coder, origin
matrix    passages coded per theme (rows, rolled up over sub-themes) and transcript (columns)
log       the decision log (the audit trail)
template  the current template as an outline that "trellis template set" reads back

Examples:
  trellis export codings --out codings.csv
  trellis export codings --format json --out codings.json
  trellis export matrix --out matrix.csv
  trellis export template --out template-rev7.txt`,
    )
    .action(async (what: string, opts: OutputOpts & { format: string }) => {
      if (!WHAT.includes(what)) throw new UserError(`export what? one of ${WHAT.join(', ')} (got "${what}")`);
      if (!['csv', 'json'].includes(opts.format)) throw new UserError(`--format is csv or json (got "${opts.format}")`);
      checkOut(opts);
      const text = await withStudy(opts, (db) => {
        switch (what) {
          case 'codings': {
            const rows = codingsForExport(db);
            return opts.format === 'json' ? JSON.stringify({ caution: DATA_CAUTION, codings: rows }, null, 2) + '\n' : writeCsv(CODING_COLUMNS, rows, DATA_CAUTION);
          }
          case 'matrix': {
            const m = themeMatrix(db);
            return writeCsv(['number', 'theme', ...m.transcripts], m.rows.map((r) => [r.number, r.theme, ...r.counts]), DATA_CAUTION);
          }
          case 'log': {
            const rows = decisionLog(db);
            return opts.format === 'json' ? JSON.stringify({ caution: DATA_CAUTION, decisions: rows }, null, 2) + '\n' : writeCsv(logColumns(rows), rows, DATA_CAUTION);
          }
          default: {
            const rev = currentRevision(db);
            return rev ? printOutline(rev.template, collectComments(rev.outline, rev.template)) : '';
          }
        }
      });
      writeOut(opts, text);
      if (opts.json) process.stdout.write(JSON.stringify({ out: opts.out, what }) + '\n');
      else say(`Wrote ${what} to ${opts.out}.${what === 'template' ? '' : `\n${DATA_CAUTION}`}`);
    });
}
