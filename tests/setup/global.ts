// Once per `npm test`: one parent folder for every temporary study (removed at the end, so runs leave
// nothing in /tmp), and the coded demo study built once, which command-line tests copy instead of
// rebuilding it (init, template, import and coding sheet cost seconds each time).
import { mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import type { TestProject } from 'vitest/node';
import { buildCodedDemo } from '../cli/demo-fixture.js';

declare module 'vitest' {
  export interface ProvidedContext {
    tmpRoot: string;
    codedDemo: string;
  }
}

export default function setup(project: TestProject): () => void {
  const root = mkdtempSync(join(tmpdir(), 'trellis-tests-'));
  project.provide('tmpRoot', root);
  project.provide('codedDemo', buildCodedDemo(mkdtempSync(join(root, 'demo-'))));
  return () => rmSync(root, { recursive: true, force: true });
}
