import type { Command } from 'commander';
import { getPassage, passageCount, passageTokens } from '../study/passages.js';
import { suggest } from '../jobs/suggest.js';
import { requireTranscripts } from '../study/transcripts.js';
import type { DB } from '../study/db.js';
import { clock } from '../sheet/sheet.js';
import { collect, positiveInt, probability, studyCommand, withStudy, type StudyOpts } from './common.js';
import { markTerms, wrap } from './marks.js';
import { plural, printJson, printJsonStream, say, table, warn } from './output.js';
import { withStepBar } from './progress.js';
import { markedTerms, reasonText, type Snippets } from './reasons.js';
import { passageJson, passageJsonText } from './suggest-json.js';

interface SuggestOpts extends StudyOpts {
  transcript?: string[];
  top?: number;
  targetPrecision: number;
  all?: boolean;
}

function snippetCache(db: DB): Snippets {
  const cache = new Map<string, { transcript: string; text: string } | undefined>();
  return {
    get(id) {
      if (!cache.has(id)) {
        const p = getPassage(db, id);
        cache.set(id, p ? { transcript: p.transcript, text: p.text } : undefined);
      }
      return cache.get(id);
    },
  };
}

/** Names cut to the first few on a large template, where the full list would fill the terminal. */
export const WARN_NAMES = 8;

export function firstFew(names: string[], jsonKey: string): string {
  if (names.length <= WARN_NAMES) return names.join('; ');
  return `${names.slice(0, WARN_NAMES).join('; ')}; and ${names.length - WARN_NAMES} more (all of them: "trellis profile", or "${jsonKey}" in suggest --json)`;
}

export function registerSuggest(program: Command): void {
  studyCommand(program, 'suggest', 'suggest candidate themes, with confidence and reasons, for the uncoded passages')
    .option('--transcript <name>', 'only these transcripts (repeatable)', collect)
    .option('--top <k>', 'the K best candidates per passage, whatever the threshold', positiveInt('--top'))
    .option('--target-precision <p>', "the precision each theme's threshold aims at on the coded batch", probability('--target-precision'), 0.7)
    .option('--all', 'also suggest for passages that are already coded (to check the profiles)')
    .addHelpText(
      'after',
      `
trellis learns a profile for every theme from its first coded passage on (a theme with none
is matched on its name, definition and seed terms, and says so), and turns the evidence into
confidences with one calibration shared by all themes, fitted by leaving out one coded
transcript at a time: the estimated chance that the coder would give this very theme (a parent
only where coders give the parent itself). A candidate is above threshold when its confidence
reaches the threshold at which the left-out transcripts' suggestions were right at least
--target-precision of the time; a passage may have several. Themes with too few coded passages
for their confidence to be checked are named in a warning. A passage with no candidate above
threshold is unclaimed. Suggestions are aids: nothing is coded until a researcher decides.

Examples:
  trellis suggest --transcript t05-ward9-fy2
  trellis suggest --top 3 --json > suggestions.json`,
    )
    .action(async (opts: SuggestOpts) => {
      await withStudy(opts, ({ db }) => {
        requireTranscripts(db, opts.transcript);
        if (!opts.json) process.stderr.write('Fitting theme profiles and scoring passages...\n');
        // One bar over fitting, scoring and storing, by their shares of a 10,000-passage run
        // (about 1.7 s, 0.4 s and 0.5 s); only for studies large enough to wait on.
        const run = withStepBar('suggesting', { fit: [0, 0.65], score: [0.65, 0.8], store: [0.8, 1] }, passageCount(db) >= 2000, (step) =>
          suggest(db, { transcripts: opts.transcript, top: opts.top, targetPrecision: opts.targetPrecision, includeCoded: opts.all, progress: step }),
        );
        const snippets = snippetCache(db);
        const path = (id: string) => run.paths.get(id) ?? id;
        // Say what is weak, naming the themes: their confidence cannot be checked yet.
        const few = run.reports.filter((r) => r.tooFew);
        const seedOnly = run.reports.filter((r) => r.seedOnly);
        const list = (rs: typeof few) => rs.map((r) => `${r.path} (${plural(r.exemplars, 'coded passage')}${r.transcripts ? ` in ${plural(r.transcripts, 'transcript')}` : ''})`);
        if (few.length) {
          warn(`${plural(few.length, 'theme')} with too few coded examples for their confidence to be trusted: ${firstFew(list(few), 'few_examples')}. Code more passages of them, or read their confidences as rough.`);
        }
        if (seedOnly.length) warn(`${plural(seedOnly.length, 'theme')} suggested from name, definition and seed terms only (no coded passage): ${firstFew(seedOnly.map((r) => r.path), 'seed_only')}.`);
        if (opts.json) {
          const head = {
            run_id: run.runId,
            revision: run.rev,
            fingerprint: run.fingerprint,
            few_examples: few.map((r) => ({ theme: r.path, coded_passages: r.exemplars, transcripts: r.transcripts })),
            seed_only: seedOnly.map((r) => r.path),
          };
          // Bulk runs stream compact JSON; a few passages are indented for reading.
          if (run.passages.length > 200) return printJsonStream(head, 'passages', run.passages, passageJsonText(path, snippets));
          return printJson({ ...head, passages: run.passages.map(passageJson(path, snippets)) });
        }
        const tokens = passageTokens(db, run.passages.map((p) => p.passageId));
        for (const p of run.passages) {
          const info = getPassage(db, p.passageId)!;
          const tk = tokens.get(p.passageId)!;
          const marks = new Set(p.candidates.flatMap((c) => markedTerms(c.reasons)));
          say(`${p.passageId}  ${info.speaker ?? 'participant'}${info.start !== null ? ` (${clock(info.start)})` : ''}${p.unclaimed ? '  — unclaimed' : ''}`);
          say(wrap(markTerms(tk.text, tk.lemmas, tk.spans, marks), 96, '  '));
          say(
            table(
              ['id', 'confidence', 'theme', 'why'],
              p.candidates.map((c) => [
                `#${c.suggestionId}`,
                `${c.confidence.toFixed(2)}${c.aboveThreshold ? ' *' : '  '}`,
                path(c.themeId),
                c.reasons.length ? clip(reasonText(c.reasons[0]!, snippets), 90) : '',
              ]),
            )
              .split('\n')
              .map((l) => '  ' + l)
              .join('\n'),
          );
          say('');
        }
        const claimed = run.passages.filter((p) => !p.unclaimed);
        const perTheme = new Map<string, number>();
        for (const p of claimed) for (const c of p.candidates) if (c.chosen) perTheme.set(c.themeId, (perTheme.get(c.themeId) ?? 0) + 1);
        say(`Run ${run.runId} (template revision ${run.rev}, model ${run.fingerprint.slice(0, 12)}): ${plural(run.passages.length, 'passage')}, ` +
          `${claimed.length} with a theme above threshold (*), ${run.passages.length - claimed.length} unclaimed.`);
        if (perTheme.size) {
          say(table(['theme', 'passages'], [...perTheme].sort((a, b) => b[1] - a[1]).map(([id, n]) => [path(id), n])));
        }
        say('Decide with: trellis decide ID accept|reject|defer [--theme PATH] --coder NAME');
      });
    });
}

const clip = (s: string, n: number) => (s.length > n ? s.slice(0, n - 1) + '…' : s);
