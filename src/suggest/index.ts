export { ThemeSuggester, resolveOptions, type SuggesterState, type LayerState, type ResolvedOptions } from './suggester.js';
export { fitPlatt, calibrate, type Calibrator, type Platt } from './calibrate.js';
export { chooseThreshold, precisionRecallAt } from './thresholds.js';
export { buildTree, chooseThemes, rolledUpLabels } from './hierarchy.js';
export type * from './types.js';
