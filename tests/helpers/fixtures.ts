/** Reads the ingest fixtures. */
import { readFileSync } from 'node:fs';
import { dirname, join } from 'node:path';
import { fileURLToPath } from 'node:url';

export const FIXTURES = join(dirname(fileURLToPath(import.meta.url)), '..', 'fixtures', 'ingest');

export function fixture(name: string): Buffer {
  return readFileSync(join(FIXTURES, name));
}

export function fixturePath(name: string): string {
  return join(FIXTURES, name);
}
