/**
 * Parser for the outline a researcher writes in template.txt.
 *
 *   Workload [a priori]          # a theme; "[a priori]" marks an a priori theme
 *   Trust [integrative]          # "[integrative]": runs across the others (top level only)
 *     | definition: Talk about the amount of work.
 *     | seeds: rota, overtime
 *     Staffing levels            # a sub-theme: two more spaces per level
 *
 * Every problem is collected (not just the first) so the researcher can fix them all at once.
 */

import { UserError } from '../errors.js';
import { cleanName, nameKey, nameProblem } from './names.js';
import { countApriori, countThemes } from './number.js';
import type { Diagnostic, ParseResult, Template, ThemeNode } from './types.js';

const APRIORI = /(?:^|\s+)\[\s*a\s+priori\s*\]$/i;
/** trellis's own mark for an integrative theme; with [a priori], in either order. */
const INTEGRATIVE = /(?:^|\s+)\[\s*integrative\s*\]$/i;
const NOTE = /^\|\s*([A-Za-z][\w-]*)\s*:(.*)$/;
const KEYWORDS = ['definition', 'include', 'exclude', 'seeds'] as const;
type Keyword = (typeof KEYWORDS)[number];

export function diagnostic(file: string, line: number | undefined, message: string): Diagnostic {
  return { file, line, message, text: new UserError(message, file, line).describe() };
}

/** Cut an end-of-line comment: a "#" preceded by whitespace. "\#" writes a literal "#". */
export function stripComment(content: string): string {
  const m = /\s#/.exec(content);
  const kept = m ? content.slice(0, m.index) : content;
  return kept.replace(/\\#/g, '#').trimEnd();
}

export function parseOutline(text: string, file: string): ParseResult {
  const errors: Diagnostic[] = [];
  const warnings: Diagnostic[] = [];
  const err = (line: number, message: string) => errors.push(diagnostic(file, line, message));

  const roots: ThemeNode[] = [];
  // The chain of open parents, with the depth each was written at (two spaces = one level).
  const stack: { node: ThemeNode; written: number }[] = [];
  // Sibling names seen so far, per parent (null = top level), with the line of first use.
  const seen = new Map<ThemeNode | null, Map<string, number>>();
  let last: { node: ThemeNode; depth: number } | null = null; // the latest theme line, for notes

  const lines = text.replace(/^\uFEFF/, '').split(/\r?\n/);
  for (let i = 0; i < lines.length; i++) {
    const lineNo = i + 1;
    const raw = lines[i]!;
    const trimmed = raw.trim();
    if (trimmed === '' || trimmed.startsWith('#')) continue;

    // Indentation: spaces only, two per level.
    const indent = /^[ \t]*/.exec(raw)![0];
    let depth: number;
    let indentOk = true;
    if (indent.includes('\t')) {
      err(lineNo, 'tab in the indentation; indent with two spaces per level');
      depth = Math.floor(indent.replace(/\t/g, '  ').length / 2);
      indentOk = false;
    } else {
      if (indent.length % 2 !== 0) {
        err(lineNo, `indentation of ${indent.length} spaces is not a multiple of two; nest themes by two spaces per level`);
        indentOk = false;
      }
      depth = Math.floor(indent.length / 2);
    }

    // Never empty: the line has a first character that is neither space nor "#".
    const content = stripComment(raw.slice(indent.length));

    if (content.startsWith('|')) {
      if (!last) {
        err(lineNo, 'note line with no theme above it; a note follows the theme it describes');
        continue;
      }
      if (indentOk && depth !== last.depth + 1) {
        err(
          lineNo,
          `note line for "${last.node.name}" (line ${last.node.line}) must be indented one level deeper than it, ` +
            `with ${(last.depth + 1) * 2} spaces`,
        );
        continue;
      }
      const m = NOTE.exec(content);
      if (!m) {
        err(lineNo, 'note line needs a keyword and a colon, such as "| definition: ..."');
        continue;
      }
      const keyword = m[1]!.toLowerCase();
      if (!(KEYWORDS as readonly string[]).includes(keyword)) {
        err(lineNo, `unknown note keyword "${m[1]}"; use ${KEYWORDS.join(', ')}`);
        continue;
      }
      addNote(last.node, keyword as Keyword, m[2]!.trim());
      continue;
    }

    // A theme line. Its parent is the nearest theme above written with less indentation; a
    // line indented too far is still taken as a sub-theme, so its own sub-themes are not blamed.
    while (stack.length > 0 && stack[stack.length - 1]!.written >= depth) stack.pop();
    const above = stack[stack.length - 1];
    if (!last && depth > 0) {
      err(lineNo, 'the first theme is indented; top-level themes start at the beginning of the line');
    } else if (above && depth > above.written + 1) {
      err(
        lineNo,
        `indented ${depth - above.written} levels deeper than the theme "${above.node.name}" on line ${above.node.line}; ` +
          'a sub-theme goes one level (two spaces) deeper',
      );
    }

    let rest = content;
    let apriori = false;
    let integrative = false;
    for (;;) {
      const am = APRIORI.exec(rest);
      if (am && !apriori) {
        apriori = true;
        rest = rest.slice(0, am.index);
        continue;
      }
      const im = INTEGRATIVE.exec(rest);
      if (im && !integrative) {
        integrative = true;
        rest = rest.slice(0, im.index);
        continue;
      }
      break;
    }
    if (integrative && depth > 0) {
      err(lineNo, 'an integrative theme runs across the other themes, so it is written at the top level (not indented); its sub-themes go under it');
    }
    const name = cleanName(rest);
    const problem = nameProblem(name);
    if (problem) err(lineNo, problem);

    const parent = above ? above.node : null;
    if (name !== '') {
      let names = seen.get(parent);
      if (!names) seen.set(parent, (names = new Map()));
      const first = names.get(nameKey(name));
      if (first !== undefined) {
        const where = parent ? `under "${parent.name}"` : 'at the top level';
        err(lineNo, `duplicate theme "${name}" ${where} (first on line ${first}); sibling names must differ, ignoring case`);
      } else {
        names.set(nameKey(name), lineNo);
      }
    }

    const node: ThemeNode = {
      id: '',
      name,
      apriori,
      ...(integrative ? { integrative: true } : {}),
      definition: '',
      include: '',
      exclude: '',
      seeds: [],
      children: [],
      line: lineNo,
    };
    (parent ? parent.children : roots).push(node);
    stack.push({ node, written: depth });
    last = { node, depth };
  }

  const template: Template = { roots };
  const share = { total: countThemes(template), apriori: countApriori(template) };
  if (share.total === 0) {
    warnings.push(diagnostic(file, undefined, 'the outline has no themes'));
  } else if (share.apriori * 2 > share.total) {
    warnings.push(
      diagnostic(
        file,
        undefined,
        `${share.apriori} of ${share.total} themes are a priori; common practice: a priori themes are few and ` +
          'tentative; the template grows mainly from the data',
      ),
    );
  }
  return { template, errors, warnings };
}

function addNote(node: ThemeNode, keyword: Keyword, value: string): void {
  if (value === '') return; // an empty placeholder note says nothing
  if (keyword === 'seeds') {
    for (const seed of value.split(',')) {
      const s = seed.trim();
      if (s !== '' && !node.seeds.some((x) => x.toLowerCase() === s.toLowerCase())) node.seeds.push(s);
    }
    return;
  }
  // Repeated lines continue the same text, so long definitions can wrap.
  node[keyword] = node[keyword] === '' ? value : `${node[keyword]} ${value}`;
}

/** All problems of one outline, as one UserError; `problems` keeps them apart for the CLI. */
export class OutlineError extends UserError {
  constructor(readonly problems: Diagnostic[]) {
    super(
      problems.length === 1
        ? problems[0]!.message
        : `${problems.length} problems in the outline:\n${problems.map((p) => `  ${p.text}`).join('\n')}`,
      problems[0]?.file,
      problems[0]?.line,
    );
    this.name = 'OutlineError';
  }
}

/** parseOutline, throwing an OutlineError when there is any error; warnings are returned. */
export function parseOutlineOrThrow(text: string, file: string): { template: Template; warnings: Diagnostic[] } {
  const { template, errors, warnings } = parseOutline(text, file);
  if (errors.length > 0) throw new OutlineError(errors);
  return { template, warnings };
}
