import { describe, expect, it, vi } from 'vitest';
import { main } from '../../src/cli/main.js';

// main() is the whole CLI: a mistake in a command's options must come back as exit status 1, not
// end the process from inside the argument parser (the warm test runner, and any program calling
// main(), would die with it).
describe('main() on a usage mistake', () => {
  it('returns 1 for a bad option of a command and 0 for its --help, without ending the process', async () => {
    const exit = vi.spyOn(process, 'exit').mockImplementation((() => {
      throw new Error('process.exit was called');
    }) as never);
    const err = vi.spyOn(process.stderr, 'write').mockImplementation(() => true);
    const out = vi.spyOn(process.stdout, 'write').mockImplementation(() => true);
    try {
      expect(await main(['node', 'trellis', 'add', 'a.txt', '--coder', ''])).toBe(1);
      expect(await main(['node', 'trellis', 'template', 'rename', 'A', 'B', '--coder', ' '])).toBe(1);
      expect(await main(['node', 'trellis', 'suggest', '--top', 'none'])).toBe(1);
      expect(await main(['node', 'trellis', 'suggest', '--help'])).toBe(0);
      expect(exit).not.toHaveBeenCalled();
      expect(err.mock.calls.map((c) => String(c[0])).join('')).toContain("the coder's name is empty");
    } finally {
      exit.mockRestore();
      err.mockRestore();
      out.mockRestore();
    }
  });
});
