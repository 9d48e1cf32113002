export { ThemeSuggester, resolveOptions, type SuggesterState, type LayerState, type ResolvedOptions } from './suggester.js';
export { fitPlatt, fitIsotonic, calibrate, type Calibrator, type Platt, type Isotonic } from './calibrate.js';
export { chooseThreshold, precisionRecallAt } from './thresholds.js';
export { buildTree, chooseThemes, rolledUpLabels } from './hierarchy.js';
export type * from './types.js';
