import type { Command } from 'commander';
import { writeFileSync } from 'node:fs';
import { resolve } from 'node:path';
import { UserError } from '../errors.js';
import { renderCodebook, renderReport, type CodebookFormat } from '../report/index.js';
import { reportData } from '../study/report-data.js';
import { studyCommand, withStudy, type StudyOpts } from './common.js';
import { REPORT_CAUTIONS } from './main.js';
import { printJson, say } from './output.js';

export function registerReport(program: Command): void {
  studyCommand(program, 'report', 'write the study report: one self-contained HTML file with charts, opens offline')
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
    .action(async (opts: StudyOpts & { out: string; title?: string }) => {
      const html = await withStudy(opts, (db) => renderReport(reportData(db, { studyDir: opts.study, title: opts.title, quotes: 3, cautions: REPORT_CAUTIONS })));
      writeFileSync(opts.out, html);
      if (opts.json) printJson({ out: resolve(opts.out), bytes: Buffer.byteLength(html) });
      else say(`Wrote the report to ${resolve(opts.out)} (open it in any browser; it needs no network).`);
    });

  studyCommand(program, 'codebook', 'write the codebook: the numbered template with definitions, notes, counts and example quotes')
    .requiredOption('--out <file>', 'the file to write')
    .option('--format <format>', 'md, html or csv', 'md')
    .addHelpText('after', '\nExamples:\n  trellis codebook --out codebook.md\n  trellis codebook --format csv --out codebook.csv')
    .action(async (opts: StudyOpts & { out: string; format: string }) => {
      if (!['md', 'html', 'csv'].includes(opts.format)) throw new UserError(`--format is md, html or csv (got "${opts.format}")`);
      const text = await withStudy(opts, (db) => renderCodebook(reportData(db, { studyDir: opts.study, quotes: 2, cautions: REPORT_CAUTIONS }), opts.format as CodebookFormat));
      writeFileSync(opts.out, text);
      if (opts.json) printJson({ out: resolve(opts.out), format: opts.format });
      else say(`Wrote the codebook to ${resolve(opts.out)}.`);
    });
}
