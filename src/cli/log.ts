import type { Command } from 'commander';
import { UserError } from '../errors.js';
import { DATA_CAUTION } from '../report/cautions.js';
import { writeCsv } from '../sheet/csv.js';
import { decisionLog, logColumns } from '../study/decisions.js';
import { currentTemplate } from '../study/template.js';
import { checkOut, forceOption, studyCommand, withStudy, writeOut, type StudyOpts } from './common.js';
import { describeDecision } from './decide.js';
import { plain, printJson, say } from './output.js';

export function registerLog(program: Command): void {
  forceOption(studyCommand(program, 'log', 'the decision log: every accept, reject, re-code, defer and undo (the audit trail)'))
    .option('--format <format>', 'text, csv or json', 'text')
    .option('--out <file>', 'write to this file instead of the screen')
    .addHelpText('after', '\nExamples:\n  trellis log\n  trellis log --format csv --out decisions.csv')
    .action(async (opts: StudyOpts & { format: string; out?: string; force?: boolean }) => {
      if (!['text', 'csv', 'json'].includes(opts.format)) throw new UserError(`--format is text, csv or json (got "${opts.format}")`);
      const out = opts.out ? { ...opts, out: opts.out } : null;
      if (out) checkOut(out);
      await withStudy(opts, ({ db }) => {
        const t = currentTemplate(db);
        const rows = decisionLog(db);
        const format = opts.json ? 'json' : opts.format;
        let text: string;
        if (format === 'json') text = JSON.stringify({ decisions: rows }, null, 2) + '\n';
        else if (format === 'csv') text = writeCsv(logColumns(rows), rows, DATA_CAUTION);
        else text = rows.map((d) => `${d.at.slice(0, 16).replace('T', ' ')}  ${d.coder.padEnd(10)} ${describeDecision(d, t)}${d.bulk ? ' (bulk)' : ''}${d.note ? `  — ${d.note}` : ''}`).join('\n') + '\n';
        if (out) {
          writeOut(out, text);
          if (!opts.json) say(`Wrote ${rows.length} decisions to ${opts.out}.`);
        } else if (format === 'json') printJson({ decisions: rows });
        else process.stdout.write(rows.length ? plain(text) : 'No decisions yet.\n');
      });
    });
}
