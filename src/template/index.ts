/** The template: outline parsing and printing, paths, numbering, tree operations, revision diffs. */

export type { Change, Diagnostic, EditableField, ParseResult, Revised, Template, ThemeNode } from './types.js';
export { PATH_SEP, cleanName, nameKey, nameProblem } from './names.js';
export { OutlineError, parseOutline, parseOutlineOrThrow } from './parse.js';
export { printOutline } from './print.js';
export {
  ThemeLookupError,
  findByPath,
  locate,
  pathKey,
  pathOf,
  splitPathList,
  themeFinder,
  walk,
  type ThemeFinder,
  type WalkEntry,
} from './paths.js';
export { aprioriShare, countApriori, countThemes, numberThemes } from './number.js';
export { addTheme, mergeThemes, moveTheme, renameTheme, retireTheme, splitTheme, type NewThemeOptions } from './ops.js';
export { assignIds, editedFields } from './diff.js';
