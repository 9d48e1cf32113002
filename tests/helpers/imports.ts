import { readdirSync, readFileSync } from 'node:fs';
import { dirname, join, relative, resolve } from 'node:path';

/** The source tree the layering tests read. */
export const src = resolve(import.meta.dirname, '../../src');

export interface Import {
  /** The imported file as a path under src/ without extension (e.g. "math/sparse"). */
  path: string;
  /** `import type` / `export type`, or every name in its braces marked `type`: gone after compiling. */
  typeOnly: boolean;
}

export interface SourceFile {
  /** Path under src/ with extension (e.g. "study/db.ts"). */
  file: string;
  text: string;
  imports: Import[];
}

function files(dir: string): string[] {
  return readdirSync(dir, { withFileTypes: true }).flatMap((e) => (e.isDirectory() ? files(join(dir, e.name)) : e.name.endsWith('.ts') ? [join(dir, e.name)] : []));
}

/** Each relative import of a source file: static imports and re-exports, side-effect imports, dynamic import(). */
export function importsOf(file: string, text: string): Import[] {
  const at = (spec: string) => relative(src, resolve(dirname(file), spec)).replace(/\.js$/, '');
  const out: Import[] = [];
  // The clause before `from`: a default name, braces, or `* as name` (never another statement).
  const statement = /\b(?:import|export)\s+(type\s+)?((?:[\w$]+\s*,\s*)?(?:\{[^}]*\}|\*(?:\s+as\s+[\w$]+)?|[\w$]+))\s*from\s*'(\.{1,2}\/[^']+)'/g;
  for (const m of text.matchAll(statement)) {
    const names = /^\{([^}]*)\}$/.exec(m[2]!.trim())?.[1];
    const allTypes = names !== undefined && names.split(',').map((n) => n.trim()).filter(Boolean).every((n) => n.startsWith('type '));
    out.push({ path: at(m[3]!), typeOnly: Boolean(m[1]) || allTypes });
  }
  for (const m of text.matchAll(/\bimport\s*(?:\(\s*)?'(\.{1,2}\/[^']+)'/g)) out.push({ path: at(m[1]!), typeOnly: false });
  return out;
}

/** Every .ts file under src/, with its text and relative imports. */
export function sourceFiles(): SourceFile[] {
  return files(src).map((f) => {
    const text = readFileSync(f, 'utf8');
    return { file: relative(src, f), text, imports: importsOf(f, text) };
  });
}
