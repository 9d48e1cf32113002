import type { Command } from 'commander';
import { UserError } from '../errors.js';
import { QUOTE_RULES } from '../report/quotes.js';
import { getPassage } from '../study/passages.js';
import { chooseQuote, clearQuoteChoice, listQuoteChoices } from '../study/quotes.js';
import { chosenQuotes } from '../jobs/report-data.js';
import { currentTemplate } from '../study/template.js';
import { findByPath, walk } from '../template/paths.js';
import { coderName, coderOf, studyCommand, withStudy, type StudyOpts } from './common.js';
import { plural, printJson, say } from './output.js';

type ThemeOpts = StudyOpts & { theme?: string; coder?: string };

function themeOf(db: Parameters<typeof currentTemplate>[0], path: string | undefined): { id: string; path: string } {
  if (path === undefined) throw new UserError('which theme? give --theme PATH');
  const t = currentTemplate(db);
  const node = findByPath(t, path);
  return { id: node.id, path: [...walk(t)].find((e) => e.node.id === node.id)!.path };
}

function clip(text: string, n = 90): string {
  const flat = text.replace(/\s+/g, ' ').trim();
  return flat.length > n ? flat.slice(0, n - 1).trimEnd() + '…' : flat;
}

export function registerQuote(program: Command): void {
  const quote = program
    .command('quote')
    .description("the quotes the report and codebook show: pin a passage to a theme's quotes, drop one, list them")
    .addHelpText(
      'after',
      `
${QUOTE_RULES}

A pin or a drop is kept in the study (with who made it and when) until it is cleared; a
passage that is no longer coded to the theme is not shown whatever its pin.

Examples:
  trellis quote list
  trellis quote pin t03-harbour-hca#12 --theme "Workload > Staffing levels"
  trellis quote drop t01-larch-staff-nurse#4 --theme Workload
  trellis quote clear t01-larch-staff-nurse#4 --theme Workload`,
    );

  for (const [name, choice, what] of [
    ['pin', 'pin', "show the passage among the theme's quotes, before the others"],
    ['drop', 'drop', "never show the passage among the theme's quotes"],
  ] as const) {
    studyCommand(quote, name, what)
      .argument('<passage>', 'the passage id (as in trellis suggest, the coding sheet or trellis quote list)')
      .option('--theme <path>', 'the theme (path or unique name)')
      .option('--coder <name>', "who chooses (default: $TRELLIS_CODER, else the study's coder)", coderName)
      .action(async (passage: string, opts: ThemeOpts) => {
        await withStudy(opts, ({ db }) => {
          const theme = themeOf(db, opts.theme);
          const c = chooseQuote(db, theme.id, passage, choice, coderOf(opts, db));
          if (opts.json) return printJson({ theme: theme.path, theme_id: c.themeId, passage_id: c.passageId, choice: c.choice, at: c.at, coder: c.coder });
          say(choice === 'pin' ? `Pinned ${passage} to the quotes of "${theme.path}".` : `Dropped ${passage} from the quotes of "${theme.path}".`);
        });
      });
  }

  studyCommand(quote, 'clear', 'withdraw a pin or a drop')
    .argument('<passage>', 'the passage id')
    .option('--theme <path>', 'the theme (path or unique name)')
    .action(async (passage: string, opts: ThemeOpts) => {
      await withStudy(opts, ({ db }) => {
        const theme = themeOf(db, opts.theme);
        clearQuoteChoice(db, theme.id, passage, theme.path);
        if (opts.json) return printJson({ theme: theme.path, passage_id: passage, cleared: true });
        say(`Cleared the choice on ${passage} for "${theme.path}".`);
      });
    });

  studyCommand(quote, 'list', "each theme's quotes as the report shows them (pinned ones marked), and the drops")
    .option('--theme <path>', 'only this theme')
    .option('--per-theme <n>', 'quotes per theme (the report shows 3, the codebook 2)', (v) => {
      const n = Number(v);
      if (!Number.isInteger(n) || n < 1) throw new UserError(`--per-theme must be a whole number of at least 1 (got "${v}")`);
      return n;
    }, 3)
    .action(async (opts: ThemeOpts & { perTheme: number }) => {
      await withStudy(opts, ({ db }) => {
        const list = quoteList(db, opts.theme === undefined ? null : themeOf(db, opts.theme).id, opts.perTheme);
        if (opts.json) printJson(quoteListJson(list));
        else printQuoteList(list);
      });
    });
}

/** What `quote list` shows: each theme's quotes as the report chooses them, and the choices kept. */
interface QuoteList {
  perTheme: number;
  themes: {
    theme: string;
    theme_id: string;
    number: string;
    quotes: { passage_id: string; transcript: string; speaker: string | null; pinned: boolean; text: string }[];
    dropped: string[];
    pinned_not_shown: string[];
  }[];
  /** The pins and drops on the themes listed. */
  kept: { theme_id: string; passage_id: string; choice: 'pin' | 'drop'; at: string; coder: string }[];
  /** Every pin and drop in the study. */
  allChoices: number;
}

function quoteList(db: Parameters<typeof currentTemplate>[0], only: string | null, perTheme: number): QuoteList {
  const chosen = chosenQuotes(db, perTheme);
  const choices = listQuoteChoices(db);
  const entries = [...walk(currentTemplate(db))].filter((e) => only === null || e.node.id === only);
  const themes = entries.map((e) => ({
    theme: e.path,
    theme_id: e.node.id,
    number: e.number,
    quotes: (chosen.get(e.node.id) ?? []).map((q) => {
      const p = getPassage(db, q.passageId)!;
      return { passage_id: q.passageId, transcript: p.transcript, speaker: p.speaker, pinned: q.pinned, text: p.text };
    }),
    dropped: choices.filter((c) => c.themeId === e.node.id && c.choice === 'drop').map((c) => c.passageId),
    pinned_not_shown: choices
      .filter((c) => c.themeId === e.node.id && c.choice === 'pin' && !(chosen.get(e.node.id) ?? []).some((q) => q.passageId === c.passageId))
      .map((c) => c.passageId),
  }));
  const kept = choices
    .filter((c) => only === null || c.themeId === only)
    .map((c) => ({ theme_id: c.themeId, passage_id: c.passageId, choice: c.choice, at: c.at, coder: c.coder }));
  return { perTheme, themes, kept, allChoices: choices.length };
}

/** docs/schema/quote-list.schema.json */
function quoteListJson(l: QuoteList) {
  return { per_theme: l.perTheme, rules: QUOTE_RULES, themes: l.themes, choices: l.kept };
}

function printQuoteList(l: QuoteList): void {
  const shown = l.themes.filter((t) => t.quotes.length || t.dropped.length || t.pinned_not_shown.length);
  if (!shown.length) return say('No quotes yet: no passage is coded to these themes.');
  for (const t of shown) {
    say(`\n${t.number} ${t.theme}`);
    for (const q of t.quotes) say(`  ${q.pinned ? 'pinned' : '      '}  ${q.passage_id}  (${[q.transcript, q.speaker].filter(Boolean).join(', ')})  "${clip(q.text)}"`);
    if (t.dropped.length) say(`  dropped: ${t.dropped.join(', ')}`);
    if (t.pinned_not_shown.length) say(`  pinned but no longer coded here: ${t.pinned_not_shown.join(', ')}`);
  }
  say(`\n${plural(l.allChoices, 'choice')} kept (pins and drops). ${QUOTE_RULES}`);
}
