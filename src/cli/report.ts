import type { Command } from 'commander';
import { resolve } from 'node:path';
import { UserError } from '../errors.js';
import { reportCautions } from '../report/cautions.js';
import { renderCodebook, renderReport, type CodebookFormat } from '../report/index.js';
import { reportData } from '../study/report-data.js';
import { checkOut, forceOption, studyCommand, withStudy, writeOut, type OutputOpts } from './common.js';
import { printJson, say } from './output.js';

export function registerReport(program: Command): void {
  forceOption(studyCommand(program, 'report', 'write the study report: one self-contained HTML file with charts, opens offline'))
    .requiredOption('--out <file>', 'the HTML file to write')
    .option('--title <text>', 'the report title (default: from the study folder name)')
    .addHelpText(
      'after',
      `
The report holds the template with counts and its revision history, a theme x transcript heat
map, acceptance per theme and over time, the calibration chart, template growth by transcript, the
unclaimed share and clusters, the agreement table, and representative quotes per theme. It
contains passages of your transcripts: store and share it as you would the transcripts.

Examples:
  trellis report --out handover-report.html
  trellis report --out report.html --title "Handover study, interim"`,
    )
    .action(async (opts: OutputOpts & { title?: string }) => {
      checkOut(opts);
      const html = await withStudy(opts, (db) => renderReport(reportData(db, { studyDir: opts.study, title: opts.title, quotes: 3, cautions: reportCautions })));
      writeOut(opts, html);
      if (opts.json) printJson({ out: resolve(opts.out), bytes: Buffer.byteLength(html) });
      else say(`Wrote the report to ${resolve(opts.out)} (open it in any browser; it needs no network).`);
    });

  forceOption(studyCommand(program, 'codebook', 'write the codebook: the numbered template with definitions, notes, counts and example quotes'))
    .requiredOption('--out <file>', 'the file to write')
    .option('--format <format>', 'md, html or csv', 'md')
    .addHelpText('after', '\nExamples:\n  trellis codebook --out codebook.md\n  trellis codebook --format csv --out codebook.csv')
    .action(async (opts: OutputOpts & { format: string }) => {
      if (!['md', 'html', 'csv'].includes(opts.format)) throw new UserError(`--format is md, html or csv (got "${opts.format}")`);
      checkOut(opts);
      const text = await withStudy(opts, (db) => renderCodebook(reportData(db, { studyDir: opts.study, quotes: 2, cautions: reportCautions }), opts.format as CodebookFormat));
      writeOut(opts, text);
      if (opts.json) printJson({ out: resolve(opts.out), format: opts.format });
      else say(`Wrote the codebook to ${resolve(opts.out)}.`);
    });
}
