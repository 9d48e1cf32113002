import Database from 'better-sqlite3';
import { mkdirSync, readFileSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { freshStudy, trellis } from './run.js';

describe('revision history', () => {
  it('records and shows the outline file by name only, never the folders it sat in', () => {
    const dir = freshStudy();
    const folder = join(dir, 'home', 'maya', 'private-notes');
    mkdirSync(folder, { recursive: true });
    writeFileSync(join(folder, 'outline v2.txt'), 'Workload\nBreaks\n');
    expect(trellis(['template', 'set', join(folder, 'outline v2.txt')], dir).status).toBe(0);
    const db = new Database(join(dir, 'study.db'));
    const stored = (db.prepare('SELECT action FROM revisions').all() as { action: string }[]).map((r) => r.action);
    expect(stored).toEqual(['set outline v2.txt']);
    // A revision recorded by an older version, with the whole path, is shown by its name too.
    db.prepare("UPDATE revisions SET action = 'set /home/maya/private-notes/old.txt' WHERE rev = 1").run();
    db.close();
    const hist = JSON.parse(trellis(['template', 'history', '--json'], dir).stdout).revisions;
    expect(hist[0].action).toBe('set old.txt');
    expect(trellis(['template', 'history'], dir).stdout).not.toMatch(/private-notes|maya/);
    expect(trellis(['report', '--out', 'r.html'], dir).status).toBe(0);
    const html = readFileSync(join(dir, 'r.html'), 'utf8');
    expect(html).toContain('set old.txt');
    expect(html).not.toMatch(/private-notes/);
  });
});
