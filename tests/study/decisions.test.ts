// The decision log in process, without the command line: what still stands after undo, read through
// the one view (standing_decisions) that every query of standing decisions uses.
import { mkdtempSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { readTranscriptFile } from '../../src/ingest/read.js';
import type { DB } from '../../src/study/db.js';
import { createStudy } from '../../src/study/study.js';
import { allDecisions, effectiveDecisions, markNothingToCode, nothingToCode, nothingToCodeBy, undo } from '../../src/study/decisions.js';
import { importTranscripts } from '../../src/jobs/import.js';

async function studyWithPassages(): Promise<{ db: DB; ids: string[] }> {
  const dir = mkdtempSync(join(tmpdir(), 'trellis-decisions-'));
  const db = createStudy(dir).db;
  const file = join(dir, 'ward.txt');
  writeFileSync(
    file,
    [
      'Interviewer: How did the night handover go?',
      'Nurse: It ran late because the bleep kept going during the summary.',
      'Interviewer: And the drug chart?',
      'Nurse: Nobody had signed it, so I checked it twice before the round.',
      'Nurse: The porter came for the bed while we were still talking.',
    ].join('\n\n'),
  );
  // No onProgress: an import called without one used to spin forever (the count lived in its arguments).
  await importTranscripts(db, [{ file, ...(await readTranscriptFile(file)) }], { coder: 'tester' });
  const ids = (db.prepare("SELECT id FROM passages WHERE role = 'participant' ORDER BY ordinal").all() as { id: string }[]).map((r) => r.id);
  return { db, ids };
}

describe('standing decisions', () => {
  it('leaves out undo entries and what they undid, for every reader of the log', async () => {
    const { db, ids } = await studyWithPassages();
    expect(ids).toHaveLength(3);
    markNothingToCode(db, [ids[0]!, ids[1]!], 'ana');
    markNothingToCode(db, [ids[2]!], 'ben');
    const undid = undo(db, 'ana'); // ana's latest: the mark on the second passage
    expect(undid.action).toBe('undo');

    const all = allDecisions(db);
    expect(all.map((d) => [d.coder, d.action, d.passage_id])).toEqual([
      ['ana', 'nocode', ids[0]],
      ['ana', 'nocode', ids[1]],
      ['ben', 'nocode', ids[2]],
      ['ana', 'undo', ids[1]],
    ]);
    const standing = effectiveDecisions(db);
    expect(standing.map((d) => d.id)).toEqual([all[0]!.id, all[2]!.id]);
    expect(db.prepare('SELECT id FROM standing_decisions ORDER BY id').all()).toEqual(standing.map((d) => ({ id: d.id })));
    expect([...nothingToCode(db)].sort()).toEqual([ids[0], ids[2]].sort());
    expect(nothingToCodeBy(db, 'ana')).toEqual(new Map([[ids[0]!, all[0]!.id]]));

    // The undone mark can be made again; an undo of an undo is refused, the log unchanged.
    markNothingToCode(db, [ids[1]!], 'ana');
    expect(nothingToCodeBy(db, 'ana').size).toBe(2);
    expect(() => undo(db, 'ana', undid.id)).toThrow();
    expect(allDecisions(db)).toHaveLength(5);
    db.close();
  });
});
