import { describe, expect, it } from 'vitest';
import { firstFew, WARN_NAMES } from '../../src/cli/suggest.js';

// suggest's warnings name weak themes; a template of hundreds of themes would fill the terminal.
describe('the names in a warning', () => {
  const names = (n: number) => Array.from({ length: n }, (_, i) => `Theme ${i + 1}`);

  it('lists every name when there are few', () => {
    expect(firstFew(names(WARN_NAMES), 'few_examples')).toBe(names(WARN_NAMES).join('; '));
  });

  it('cuts a long list to the first few and says how many more, and where all of them are', () => {
    const text = firstFew(names(120), 'seed_only');
    expect(text.startsWith(names(WARN_NAMES).join('; ') + '; ')).toBe(true);
    expect(text).not.toContain(`Theme ${WARN_NAMES + 1};`);
    expect(text).toContain(`and ${120 - WARN_NAMES} more`);
    expect(text).toContain('"seed_only" in suggest --json');
  });
});
