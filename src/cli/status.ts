import type { Command } from 'commander';
import { walk } from '../template/paths.js';
import { studyStatus, type ThemeCount } from '../jobs/status.js';
import { currentTemplate } from '../study/template.js';
import { studyCommand, withStudy, type StudyOpts } from './common.js';
import { printJson, say, table } from './output.js';
import { statusJson } from './status-json.js';

/** What a researcher should make of a theme's suggestions. */
function strengthText(s: ThemeCount['strength']): string {
  switch (s) {
    case 'checked':
      return 'confidence checked on its codings';
    case 'few examples':
      return 'few examples: confidence not yet trustworthy';
    case 'name and seeds only':
      return 'from its name and seeds only';
    case 'not suggested':
      return 'not suggested';
  }
}

export function registerStatus(program: Command): void {
  studyCommand(program, 'status', 'where the study stands: transcripts, passages, coding progress, template')
    .addHelpText('after', '\nExamples:\n  trellis status\n  trellis status --study handover --json')
    .action(async (opts: StudyOpts) => {
      await withStudy(opts, ({ db }) => {
        const s = studyStatus(db);
        const t = currentTemplate(db);
        const names = new Map([...walk(t)].map((e) => [e.node.id, { path: e.path, number: e.number, depth: e.depth }]));
        if (opts.json) {
          return printJson(statusJson(s, names));
        }
        const pct = s.passages.participant ? Math.round((100 * s.coded) / s.passages.participant) : 0;
        say(`Transcripts: ${s.transcripts}`);
        say(`Passages:    ${s.passages.total} (${s.passages.participant} participant, ${s.passages.interviewer} interviewer)`);
        say(`Coded:       ${s.coded} of ${s.passages.participant} participant passages (${pct}%); ${s.uncoded} uncoded`);
        say(`Template:    ${s.revision === null ? 'none yet' : `revision ${s.revision}, ${s.themes} themes`}`);
        if (s.perTranscript.length) {
          say('');
          say(table(['transcript', 'passages', 'participant', 'coded'], s.perTranscript.map((r) => [r.name, r.passages, r.participant ?? 0, r.coded])));
        }
        if (s.perTheme.length) {
          say('');
          say(
            table(
              ['theme', 'passages', 'with sub-themes', 'transcripts', 'suggestions'],
              s.perTheme.map((c) => {
                const n = names.get(c.id)!;
                return [`${'  '.repeat(n.depth)}${n.number} ${n.path.split(' > ').pop()}`, c.direct, c.total, c.transcripts, strengthText(c.strength)];
              }),
            ),
          );
        }
        if (s.perCoder.length) {
          say('');
          say(table(['coder', 'codings', 'passages'], s.perCoder.map((c) => [c.coder, c.codings, c.passages])));
        }
      });
    });
}
