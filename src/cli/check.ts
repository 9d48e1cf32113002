import type { Command } from 'commander';
import { UserError } from '../errors.js';
import { checkStudy } from '../study/check.js';
import { studyCommand, type StudyOpts } from './common.js';
import { printJson, say } from './output.js';

export function registerCheck(program: Command): void {
  studyCommand(program, 'check', "check the study file for damage (SQLite's integrity check); changes nothing")
    .addHelpText(
      'after',
      `
Exit status 0 when the study is whole, 1 when something is wrong (what, is printed).
A damaged study.db is never repaired or replaced: restore it from your backup.

Examples:
  trellis check
  trellis check --study handover --json`,
    )
    .action((opts: StudyOpts) => {
      const r = checkStudy(opts.study);
      if (opts.json) printJson(r);
      else {
        for (const n of r.notes) say(`note: ${n}`);
        if (r.ok) say(`The study in ${r.study} is whole: the integrity check found no damage.`);
      }
      if (!r.ok) {
        throw new UserError(`the study is damaged:\n  ${r.problems.join('\n  ')}\nRestore study.db from a backup; nothing was changed`, r.study);
      }
    });
}
