import type { Command } from 'commander';
import { resolve } from 'node:path';
import { DEFAULT_SETTINGS } from '../study/db.js';
import { createStudy } from '../study/study.js';
import { coderName, positiveInt } from './common.js';
import { printJson, say } from './output.js';

export function registerInit(program: Command): void {
  program
    .command('init [dir]')
    .description('create a study: study.db and a starter template.txt in DIR (default: this folder)')
    .option('--window <words>', 'longest passage in words before a turn is split at sentences', positiveInt('--window'), DEFAULT_SETTINGS.window)
    .option('--coder <name>', 'your name as the audit trail should record it (remembered for this study)', coderName)
    .option('--json', 'machine-readable output on stdout')
    .addHelpText('after', '\nExamples:\n  trellis init handover-study --coder priya\n  trellis init --window 80')
    .action((dir: string | undefined, opts: { window: number; coder?: string; json?: boolean }) => {
      const root = resolve(dir ?? '.');
      createStudy(root, { window: opts.window }, opts.coder).close();
      if (opts.json) printJson({ study: root, window: opts.window });
      else {
        say(`Created a study in ${root}`);
        say('Next: write your template in template.txt, then "trellis template set template.txt", and "trellis add FILE...".');
        say('The study stays on this disk; trellis never sends anything over a network.');
      }
    });
}
