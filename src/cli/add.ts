import type { Command } from 'commander';
import { statSync } from 'node:fs';
import { DEFAULT_MAX_MB } from '../ingest/limits.js';
import { readTranscriptFile } from '../ingest/read.js';
import { warmUp } from '../text/pool.js';
import { studyCoder } from '../study/db.js';
import { importTranscripts, type ImportItem } from '../jobs/import.js';
import { coderName, collect, positiveInt, studyCommand, UNNAMED, withStudy, type StudyOpts } from './common.js';
import { plural, printJson, say, table, warn } from './output.js';
import { looksLikeName } from '../report/pseudonyms.js';
import { listAliases } from '../study/aliases.js';
import { progressBar } from './progress.js';
import { addJson } from './add-json.js';

interface AddOpts extends StudyOpts {
  replace?: boolean;
  interviewer?: string[];
  coder?: string;
  maxSize: number;
  idColumn?: string;
  textColumn?: string;
  questionColumn?: string;
}

export function registerAdd(program: Command): void {
  studyCommand(program, 'add', 'import transcripts (.txt .md .docx .vtt .srt .csv); all files go in, or none')
    .argument('<files...>', 'transcript files')
    .option('--replace', 'replace a transcript of the same name whose file has changed; its codings follow their text')
    .option('--interviewer <name>', 'a speaker label that is the interviewer (repeatable)', collect)
    .option('--coder <name>', "who wrote the inline {theme: ...} codes in these files (default: the study's coder)", coderName)
    .option('--max-size <MB>', `largest file (or expanded .docx) to read, in megabytes`, positiveInt('--max-size'), DEFAULT_MAX_MB)
    .option('--id-column <name>', 'survey .csv: the respondent id column')
    .option('--text-column <name>', 'survey .csv: the answer text column')
    .option('--question-column <name>', 'survey .csv: the question column')
    .addHelpText(
      'after',
      `
Speakers: "Name:" at the start of a line or cue, **Name:** in Markdown, <v Name> in WebVTT.
Interviewer, Int, I, Q, Moderator, Facilitator and Researcher are taken as the interviewer;
everyone else as a participant (override with --interviewer). A plain text file with no
speaker labels is split on blank lines, each paragraph a participant passage.

With --replace (say, after de-identifying a coded transcript), each coding moves to the new
passage with the same text, or else to the one that shares most of its words if that holds at
least half of them; codings that fit nowhere are listed and kept apart, never dropped.

Examples:
  trellis add interviews/*.txt interviews/*.docx
  trellis add t03-harbour-hca.md --replace
  trellis add focus-group.vtt --interviewer Asha
  trellis add survey.csv --id-column resp --text-column q3_answer`,
    )
    .action(async (files: string[], opts: AddOpts) => {
      // Large imports: start the analysis threads while the files are being read.
      if (files.reduce((n, f) => n + sizeOf(f), 0) > 1_000_000) warmUp();
      const items: ImportItem[] = [];
      const readBar = progressBar(files.length, 'reading  ');
      for (const [i, file] of files.entries()) {
        const { transcripts, hash } = await readTranscriptFile(file, {
          maxMb: opts.maxSize,
          idColumn: opts.idColumn,
          textColumn: opts.textColumn,
          questionColumn: opts.questionColumn,
        });
        items.push({ file, hash, transcripts });
        readBar.tick(i + 1);
      }
      readBar.stop();
      const total = items.reduce((n, it) => n + it.transcripts.length, 0);
      const bar = progressBar(total, 'importing');
      const { report, aliased } = await withStudy(opts, async ({ db }) => ({
        report: await importTranscripts(db, items, {
          replace: opts.replace,
          interviewers: opts.interviewer,
          coder: opts.coder?.trim() || process.env.TRELLIS_CODER?.trim() || studyCoder(db) || UNNAMED,
          onProgress: (done) => bar.tick(done),
        }),
        aliased: new Set(listAliases(db).filter((a) => a.kind === 'speaker').map((a) => a.name)),
      }));
      bar.stop();
      // Speaker labels that look like personal names and have no alias yet, in order of appearance.
      const names = [...new Set(items.flatMap((it) => it.transcripts.flatMap((t) => t.turns.map((u) => u.speaker))))].filter(
        (s): s is string => looksLikeName(s) && !aliased.has(s!),
      );
      if (opts.json) return printJson(addJson(report, names));
      for (const w of report.warnings) warn(w);
      if (names.length) {
        const shown = names.slice(0, 8).map((n) => `"${n}"`).join(', ') + (names.length > 8 ? `, and ${names.length - 8} more` : '');
        warn(`${plural(names.length, 'speaker label')} look${names.length === 1 ? 's' : ''} like personal names: ${shown}. Give each an alias before outputs leave the team (trellis alias NAME P01; trellis alias list --all), and use --pseudonymise.`);
      }
      if (report.added.length) {
        say(
          table(
            ['transcript', 'file', 'passages', 'participant', 'interviewer', 'words'],
            report.added.map((a) => [a.name + (a.replaced ? ' (replaced)' : ''), a.file, a.passages, a.participant, a.interviewer, a.words]),
          ),
        );
      }
      for (const u of report.unchanged) say(`${u.file}: "${u.name}" is already in the study, unchanged; nothing to do`);
      say(`Added ${plural(report.added.length, 'transcript')} (${plural(report.words, 'word')}).`);
      if (report.inlineCodings) say(`Recorded ${plural(report.inlineCodings, 'inline coding')}.`);
      if (report.keptCodings || report.movedCodings || report.unplaced.length) {
        say(
          `Replacing: ${plural(report.keptCodings, 'coding')} kept on passages of the same text, ${report.movedCodings} moved to the passage ` +
            `that shares most of their words; ${report.unplaced.length} could not be placed.`,
        );
      }
      if (report.unplaced.length) {
        say('These codings are kept apart (not dropped); re-code their passages where they now fall:');
        say(table(['transcript', 'old passage', 'theme', 'coder'], report.unplaced.map((u) => [u.transcript, u.passage_id, u.theme, u.coder])));
      }
    });
}

function sizeOf(file: string): number {
  try {
    return statSync(file).size;
  } catch {
    return 0; // the reader reports a missing file properly
  }
}
