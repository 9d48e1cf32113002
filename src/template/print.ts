/** Printer for the outline format; parseOutline(printOutline(t)) gives back t (ids and lines aside). */

import type { OutlineComments } from './comments.js';
import { walk } from './paths.js';
import type { Template, ThemeNode } from './types.js';

const WIDTH = 88; // wrap long notes here; repeated note lines are joined again by the parser
const MIN_TEXT = 30;

/** A "#" at the start or after whitespace would begin a comment; "\#" keeps it literal. */
function escape(text: string): string {
  return text.replace(/(^|\s)#/g, '$1\\#');
}

/** The outline text; with `comments`, the researcher's comments go back where they belong. */
export function printOutline(template: Template, comments?: OutlineComments): string {
  const out: string[] = [...(comments?.header ?? [])];
  const placed = new Set<string>();
  for (const { node, depth } of walk(template)) {
    const indent = '  '.repeat(depth);
    for (const c of comments?.before.get(node.id) ?? []) out.push(indent + c);
    const inline = comments?.inline.get(node.id);
    out.push(`${indent}${escape(node.name)}${node.integrative ? ' [integrative]' : ''}${node.apriori ? ' [a priori]' : ''}${inline ? `  ${inline}` : ''}`);
    out.push(...noteLines(node, `${indent}  `));
    placed.add(node.id);
  }
  // A retired or merged theme's comments are kept, at the end.
  const orphans = [...(comments?.before ?? [])].filter(([id]) => !placed.has(id)).flatMap(([, cs]) => cs);
  for (const [id, c] of comments?.inline ?? []) if (!placed.has(id)) orphans.push(c);
  if (orphans.length) out.push('# Comments kept from themes no longer in the template:', ...orphans);
  out.push(...(comments?.footer ?? []));
  return out.length > 0 ? `${out.join('\n')}\n` : '';
}

function noteLines(node: ThemeNode, indent: string): string[] {
  const lines: string[] = [];
  for (const key of ['definition', 'include', 'exclude'] as const) {
    if (node[key] === '') continue;
    const prefix = `${indent}| ${key}: `;
    // Break only at single spaces between words, so joining with one space restores the text.
    const words = escape(node[key]).split(/(?<=\S) (?=\S)/);
    for (const chunk of fill(words, ' ', Math.max(MIN_TEXT, WIDTH - prefix.length))) lines.push(prefix + chunk);
  }
  if (node.seeds.length > 0) {
    const prefix = `${indent}| seeds: `;
    const seeds = node.seeds.map(escape);
    for (const chunk of fill(seeds, ', ', Math.max(MIN_TEXT, WIDTH - prefix.length))) lines.push(prefix + chunk);
  }
  return lines;
}

/** Greedy line filling; a piece longer than the width gets a line of its own. */
function fill(pieces: string[], sep: string, width: number): string[] {
  const lines: string[] = [];
  let current = '';
  for (const p of pieces) {
    if (current === '') current = p;
    else if (current.length + sep.length + p.length <= width) current += sep + p;
    else {
      lines.push(current);
      current = p;
    }
  }
  if (current !== '') lines.push(current);
  return lines;
}
