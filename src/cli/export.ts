import type { Command } from 'commander';
import { UserError } from '../errors.js';
import { DATA_CAUTION } from '../report/cautions.js';
import { writeCsv } from '../sheet/csv.js';
import { studyPseudonymiser } from '../jobs/aliases.js';
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
    .option('--pseudonymise', 'name speakers and transcripts by their aliases (trellis alias), in passage ids too')
    .addHelpText(
      'after',
      `
codings   every current coding: passage, transcript, speaker, time, theme path, coder, origin
matrix    passages coded per theme (rows, rolled up over sub-themes) and transcript (columns)
log       the decision log (the audit trail)
template  the current template as an outline that "trellis template set" reads back

--pseudonymise (codings, log, matrix; the template holds no such names) names speakers and transcripts by their aliases, with codes for those without one
(see trellis alias --help); speaker names inside the text and notes are replaced where they match
a speaker label. The study keeps the real names.

Examples:
  trellis export codings --out codings.csv
  trellis export codings --format json --out codings.json
  trellis export matrix --out matrix.csv
  trellis export template --out template-rev7.txt
  trellis export codings --pseudonymise --out codings-shared.csv`,
    )
    .action(async (what: string, opts: OutputOpts & { format: string; pseudonymise?: boolean }) => {
      if (!WHAT.includes(what)) throw new UserError(`export what? one of ${WHAT.join(', ')} (got "${what}")`);
      if (!['csv', 'json'].includes(opts.format)) throw new UserError(`--format is csv or json (got "${opts.format}")`);
      checkOut(opts);
      const text = await withStudy(opts, ({ db }) => {
        const p = opts.pseudonymise ? studyPseudonymiser(db) : null;
        const caution = p ? `${DATA_CAUTION} ${p.note}` : DATA_CAUTION;
        const head = (rows: object) => ({ caution, ...(p ? { pseudonymised: true } : {}), ...rows });
        switch (what) {
          case 'codings': {
            const rows = codingsForExport(db).map((r) =>
              p ? { ...r, passage_id: p.passage(r.passage_id), transcript: p.transcript(r.transcript), speaker: p.speaker(r.speaker) ?? '', text: p.text(r.text) } : r,
            );
            return opts.format === 'json' ? JSON.stringify(head({ codings: rows }), null, 2) + '\n' : writeCsv(CODING_COLUMNS, rows, caution);
          }
          case 'matrix': {
            const m = themeMatrix(db);
            return writeCsv(['number', 'theme', ...m.transcripts.map((t) => (p ? p.transcript(t) : t))], m.rows.map((r) => [r.number, r.theme, ...r.counts]), caution);
          }
          case 'log': {
            const rows = decisionLog(db).map((d) =>
              p ? { ...d, passage_id: d.passage_id && p.passage(d.passage_id), transcript: d.transcript && p.transcript(d.transcript), note: d.note && p.text(d.note) } : d,
            );
            return opts.format === 'json' ? JSON.stringify(head({ decisions: rows }), null, 2) + '\n' : writeCsv(logColumns(rows), rows, caution);
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
