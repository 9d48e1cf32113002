export { ThemeSuggester, resolveOptions, type SuggesterState, type ResolvedOptions } from './suggester.js';
export { chooseThreshold, precisionRecallAt } from './thresholds.js';
export { buildTree, chooseThemes, rolledUpLabels } from './hierarchy.js';
export type * from './types.js';
