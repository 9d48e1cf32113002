import type { ThemeInfo } from '../../src/suggest/types.js';

/** A theme as the model reads it (no definition or seeds unless given; its id as its name). */
export const theme = (id: string, parentId: string | null = null, extra: Partial<ThemeInfo> = {}): ThemeInfo => ({
  id,
  parentId,
  name: id,
  path: id,
  apriori: false,
  definition: '',
  seeds: [],
  nameTerms: [id.toLowerCase()],
  definitionTerms: [],
  ...extra,
});
