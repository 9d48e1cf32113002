/**
 * The researcher's comments in an outline, carried through the rewrites trellis makes (rename,
 * move, merge, split, retire, add, promote): a comment line belongs to the theme line below it,
 * an end-of-line comment to its own line; comments above the first theme and below the last stay
 * at the top and the bottom.
 */
import { walk } from './paths.js';
import type { Template } from './types.js';

export interface OutlineComments {
  header: string[];
  /** Comment lines above a theme, by theme id, without their indentation. */
  before: Map<string, string[]>;
  /** An end-of-line comment ("# ..."), by theme id. */
  inline: Map<string, string>;
  footer: string[];
}

const NONE = (): OutlineComments => ({ header: [], before: new Map(), inline: new Map(), footer: [] });

/**
 * The comments of `text`, keyed by the ids of `template`, the tree that `text` was parsed into
 * (or printed from): its themes in document order are the text's theme lines in order. When the
 * two do not line up (the file was edited since), no comments are carried.
 */
export function collectComments(text: string, template: Template): OutlineComments {
  const ids = [...walk(template)].map((e) => e.node.id);
  const out = NONE();
  let pending: string[] = [];
  let k = 0;
  for (const raw of text.replace(/^\uFEFF/, '').split(/\r?\n/)) {
    const body = raw.trim();
    if (body.startsWith('#')) pending.push(body);
    else if (body === '' || body.startsWith('|')) continue;
    else {
      const id = ids[k++];
      if (id === undefined) return NONE();
      if (pending.length && k === 1) out.header.push(...pending);
      else if (pending.length) out.before.set(id, pending);
      pending = [];
      const end = /\s(#.*)$/.exec(body.replace(/\\#/g, '\u0000'));
      if (end) out.inline.set(id, end[1]!.replace(/\u0000/g, '\\#'));
    }
  }
  if (k !== ids.length) return NONE();
  out.footer = pending;
  return out;
}
