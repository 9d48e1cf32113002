/** Theme-name rules shared by the outline parser and the tree operations. */

import { UserError } from '../errors.js';
import type { ThemeNode } from './types.js';

/** Between the levels of a theme path. */
export const PATH_SEP = ' > ';

/** Tidy a name as typed: Unicode NFC, trimmed, inner runs of whitespace made one space. */
export function cleanName(name: string): string {
  return name.normalize('NFC').replace(/\s+/g, ' ').trim();
}

/** Key for comparing names: sibling names must differ ignoring case. */
export function nameKey(name: string): string {
  return cleanName(name).toLowerCase();
}

const APRIORI_END = /\[\s*a\s+priori\s*\]$/i;

/**
 * Why a (cleaned) name cannot be used, or null when it can. The forbidden characters are the
 * separators of theme paths (" > " between levels, ";" between paths in a coding sheet) and the
 * marks of the outline format, so that every name survives printing and parsing again.
 */
/** Longest theme name accepted: a name is a label; detail belongs in the definition. */
export const MAX_NAME = 200;

/** Characters that show nothing: format controls, separators, fillers that render blank. */
const INVISIBLE = /^[\p{Cf}\p{Z}\p{Cc}\u115f\u1160\u3164\uffa0\u2800]*$/u;

export function nameProblem(name: string): string | null {
  if (name === '') return 'empty theme name';
  if (INVISIBLE.test(name)) return 'theme name has no visible characters';
  if (/\p{Cc}/u.test(name)) return `theme name "${name.replace(/\p{Cc}/gu, '?')}" contains control characters`;
  if ([...name].length > MAX_NAME) {
    return `theme name "${[...name].slice(0, 40).join('')}…" is ${[...name].length} characters long; keep it to ${MAX_NAME} (put detail in its definition)`;
  }
  if (/\s>\s/.test(name)) {
    return `theme name "${name}" contains " > ", which separates the levels of a theme path`;
  }
  if (name.includes(';')) {
    return `theme name "${name}" contains ";", which separates theme paths in a coding sheet`;
  }
  if (name.startsWith('|')) return `theme name "${name}" starts with "|", which marks a note line`;
  if (APRIORI_END.test(name)) {
    return `theme name "${name}" ends with "[a priori]"; mark the theme as a priori instead`;
  }
  return null;
}

/** Clean a name, or throw a UserError saying why `action` (e.g. 'cannot rename "X"') failed. */
export function checkName(name: string, action: string): string {
  const clean = cleanName(name);
  const problem = nameProblem(clean);
  if (problem) throw new UserError(`${action}: ${problem}`);
  return clean;
}

/** The sibling (other than those in `except`) whose name equals `name` ignoring case. */
export function findClash(
  siblings: readonly ThemeNode[],
  name: string,
  except: readonly ThemeNode[] = [],
): ThemeNode | undefined {
  const key = nameKey(name);
  return siblings.find((s) => !except.includes(s) && nameKey(s.name) === key);
}

/** 'under "Workload"' or 'at the top level', for messages. */
export function placeLabel(parentPath: string | null): string {
  return parentPath === null ? 'at the top level' : `under "${parentPath}"`;
}
